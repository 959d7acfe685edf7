package report_test

import (
	"bytes"
	"testing"

	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/report/schema"
)

// TestSchemasUpToDate fails when the checked-in schemas differ from the Go
// types: run 'go generate ./montecarlo/report'.
func TestSchemasUpToDate(t *testing.T) {
	got, err := report.GenerateSchemas("./")
	if err != nil {
		t.Fatal(err)
	}
	for name, b := range got {
		want, err := schema.Get(name)
		if err != nil || !bytes.Equal(b, want) {
			t.Errorf("schema %s is out of date: run 'go generate ./montecarlo/report'", name)
		}
	}
}
