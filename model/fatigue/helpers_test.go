package fatigue

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// near fails the test when got is not within rel (relative) of want.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: got %.8g, want %.8g (±%.2g %%)", what, got, want, 100*rel)
	}
}

// wantRangeError fails unless err is a *RangeError for param whose message
// contains every fragment.
func wantRangeError(t *testing.T, what string, err error, param string, fragments ...string) {
	t.Helper()
	var re *RangeError
	if !errors.As(err, &re) {
		t.Errorf("%s: got error %v, want a *RangeError for %s", what, err, param)
		return
	}
	if re.Param != param {
		t.Errorf("%s: error names %q, want %q (%v)", what, re.Param, param, err)
	}
	for _, f := range fragments {
		if !strings.Contains(err.Error(), f) {
			t.Errorf("%s: error %q does not contain %q", what, err, f)
		}
	}
}
