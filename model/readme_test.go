package model_test

import (
	"os"
	"strings"
	"testing"

	"boltrisk/model"
)

// TestREADMEModeTable checks that the README's mode table ("### Failure
// modes") has one row per mode of the model's table, in order, with the
// same key, formula and source.
func TestREADMEModeTable(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(data)
	i := strings.Index(text, "### Failure modes")
	if i < 0 {
		t.Fatal("README has no Failure modes section")
	}
	var rows [][]string
	for _, line := range strings.Split(text[i:], "\n") {
		if strings.HasPrefix(line, "| `") {
			cells := strings.Split(strings.Trim(line, "|"), " | ")
			for k := range cells {
				cells[k] = strings.TrimSpace(cells[k])
			}
			rows = append(rows, cells)
		} else if len(rows) > 0 && !strings.HasPrefix(line, "|") {
			break
		}
	}
	if len(rows) != int(model.NumModes) {
		t.Fatalf("README mode table has %d rows, the model %d", len(rows), model.NumModes)
	}
	for m := range model.NumModes {
		info := m.Info()
		want := []string{"`" + info.Key + "`", info.Formula, info.Source}
		if len(rows[m]) != 3 || rows[m][0] != want[0] || rows[m][1] != want[1] || rows[m][2] != want[2] {
			t.Errorf("README row %d:\n got %q\nwant %q", m+1, rows[m], want)
		}
	}
}
