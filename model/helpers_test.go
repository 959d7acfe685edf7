package model_test

import (
	"boltrisk/model"
	"boltrisk/model/jointtest"

	"math"
	"testing"
)

// near fails the test when got is not within rel (relative) of want.
func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: got %.6g, want %.6g (±%.2g %%)", what, got, want, 100*rel)
	}
}

// r1 is reference case R1 of the speed benchmark (jointtest.R1).
func r1() model.Inputs { return jointtest.R1() }

// Unit factors of the tests: 1 ksi = 6.894757 MPa, 1 kip = 4448.2216 N
// (NIST SP 811).
const (
	ksi = 6.894757
	kip = 4448.2216152605
)
