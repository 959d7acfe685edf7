package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"boltrisk/montecarlo/report"
)

// provenance are the fields of a merged document that describe how it ran
// rather than what it found (README "Running on a cluster").
var provenance = []string{"tool_version", "workers"}

func stripProvenance(t *testing.T, b string) map[string]any {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal([]byte(b), &m); err != nil {
		t.Fatal(err)
	}
	for _, k := range provenance {
		delete(m, k)
	}
	return m
}

// runParts runs every part of args split into n in dir and returns the
// part files.
func runParts(t *testing.T, dir string, n int, args ...string) []string {
	t.Helper()
	var files []string
	for k := 1; k <= n; k++ {
		f := filepath.Join(dir, fmt.Sprintf("part-%d-of-%d.json", k, n))
		a := append(append([]string{}, args...), "--part", fmt.Sprintf("%d/%d", k, n), "--part-file", f, "--quiet")
		if code, _, errs := runCLI(a...); code != 0 {
			t.Fatalf("part %d/%d: exit %d: %s", k, n, code, errs)
		}
		files = append(files, f)
	}
	return files
}

// TestMergeContract: the merged JSON equals the one-machine JSON byte for
// byte (same workers, so that even the provenance fields agree), for N = 1,
// 3, 7, for an example and a scenario file, and the text and CSV too.
func TestMergeContract(t *testing.T) {
	file := filepath.Join("..", "..", "testdata", "examples", "bracket-shear.yaml")
	for _, tc := range []struct {
		n    int
		args []string
		one  []string // flags of the one-machine run only
	}{
		{1, []string{"simulate", "--example", "cover-flange", "--samples", "60000", "--seed", "5"}, nil},
		{3, []string{"simulate", "--example", "cover-flange", "--samples", "100000", "--seed", "5"}, nil},
		{7, []string{"simulate", file, "--samples", "150001", "--seed", "9", "--method", "crude"}, nil},
		{3, []string{"simulate", "--example", "cover-flange", "--samples", "50000", "--seed", "2", "--method", "auto", "--modes", "fatigue,separation"}, nil},
		{3, []string{"sweep", "--example", "cover-flange", "--vary", "torque=40..70N*m", "--steps", "4", "--samples", "70000"}, nil},
		{7, []string{"sweep", file, "--vary", "load=0.5..2", "--steps", "3", "--samples", "120000", "--method", "auto"}, nil},
		{3, []string{"simulate", "--example", "cover-flange", "--samples", "6000", "--seed", "4", "--method", "importance"}, []string{"--fixed-samples"}},
		{7, []string{"simulate", file, "--samples", "3001", "--method", "importance"}, []string{"--fixed-samples"}},
		{3, []string{"simulate", "--example", "service-life", "--samples", "40000", "--method", "crude"}, nil},
	} {
		t.Run(fmt.Sprintf("%d parts %s", tc.n, tc.args[1]), func(t *testing.T) {
			if testing.Short() && tc.n != 3 {
				t.Skip("-short: the 3-part cases only")
			}
			dir := t.TempDir()
			one := append(append(append([]string{}, tc.args...), tc.one...), "--workers", "2", "--quiet")
			code, want, errs := runCLI(append(one, "--json")...)
			if code != 0 {
				t.Fatalf("one machine: exit %d: %s", code, errs)
			}
			files := runParts(t, dir, tc.n, append(tc.args, "--workers", "1")...)
			code, got, errs := runCLI(append([]string{"merge", "--json", "--quiet", "--workers", "2"}, files...)...)
			if code != 0 {
				t.Fatalf("merge: exit %d: %s", code, errs)
			}
			if got != want {
				t.Errorf("merged JSON differs from the one-machine JSON byte for byte\n--- one machine ---\n%s\n--- merged ---\n%s", firstLines([]byte(want), 30), firstLines([]byte(got), 30))
			}
			// Without the same workers, only provenance differs.
			_, got1, _ := runCLI("merge", "--json", "--quiet", "--workers", "1", dir)
			if !reflect.DeepEqual(stripProvenance(t, got1), stripProvenance(t, want)) {
				t.Error("merged JSON differs beyond the provenance fields")
			}
			_, wantText, _ := runCLI(one...)
			_, gotText, _ := runCLI("merge", "--quiet", "--workers", "2", dir)
			if gotText != wantText {
				t.Errorf("merged text differs from the one-machine report")
			}
			_, wantCSV, _ := runCLI(append(one, "--csv", "-")...)
			_, gotCSV, _ := runCLI("merge", "--quiet", "--csv", "-", dir)
			if gotCSV != wantCSV {
				t.Errorf("merged CSV differs from the one-machine CSV")
			}
		})
	}
}

// TestMergePartial: a merge of some parts with --allow-missing is valid,
// says which parts are missing and exits 3; without the flag it is refused.
func TestMergePartial(t *testing.T) {
	dir := t.TempDir()
	files := runParts(t, dir, 3, "simulate", "--example", "cover-flange", "--samples", "60000")
	code, _, errs := runCLI("merge", files[0], files[2])
	if code != 1 || !strings.Contains(errs, "1 of 3 parts missing (K = 2)") {
		t.Errorf("missing part: exit %d, %s", code, errs)
	}
	code, out, errs := runCLI("merge", "--json", "--allow-missing", files[0], files[2])
	if code != 3 || !strings.Contains(errs, "partial merge") {
		t.Errorf("--allow-missing: exit %d, %s", code, errs)
	}
	var doc struct {
		Partial  bool     `json:"partial"`
		Samples  int64    `json:"samples"`
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if !doc.Partial || doc.Samples != 16384+(60000-2*16384) || !strings.Contains(strings.Join(doc.Warnings, " "), "parts missing (2)") {
		t.Errorf("partial document: partial %v, samples %d, warnings %q", doc.Partial, doc.Samples, doc.Warnings)
	}
}

// TestPartBadInput is the hostile-input corpus of parts and merges: each
// is refused with its exit status, the message naming the problem, and
// nothing written.
func TestPartBadInput(t *testing.T) {
	dir := t.TempDir()
	good := runParts(t, dir, 2, "simulate", "--example", "cover-flange", "--samples", "40000")
	other := runParts(t, t.TempDir(), 2, "simulate", "--example", "cover-flange", "--samples", "40000", "--seed", "8")
	otherScen := runParts(t, t.TempDir(), 2, "simulate", "--example", "bracket-shear", "--samples", "40000")
	three := runParts(t, t.TempDir(), 3, "simulate", "--example", "cover-flange", "--samples", "40000")
	data, _ := os.ReadFile(good[0])
	validate(t, compile(t, "part"), good[0], data)
	write := func(name string, b []byte) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	imp := runParts(t, t.TempDir(), 2, "simulate", "--example", "cover-flange", "--samples", "1000", "--method", "importance")
	ib, _ := os.ReadFile(imp[0])
	id, err := report.DecodePart(imp[0], ib)
	if err != nil {
		t.Fatal(err)
	}
	id.Steps[0].ImportanceChunks[0].Dim++
	ib, _ = report.EncodePart(*id)
	badSums := write("bad-sums.json", ib)
	truncated := write("truncated.json", data[:len(data)/2])
	flipped := write("flipped.json", []byte(strings.Replace(string(data), `"any_failures":`, `"any_failures":1`, 1)))
	pd, err := report.DecodePart(good[0], data)
	if err != nil {
		t.Fatal(err)
	}
	pd.ToolVersion = "9.9.9"
	vb, _ := report.EncodePart(*pd)
	versioned := write("version.json", vb)
	empty := write("empty.json", nil)
	notPart := write("simulate.json", []byte(`{"schema_version":2,"kind":"simulate"}`))
	sim := []string{"simulate", "--example", "cover-flange", "--samples", "40000", "--part-file", filepath.Join(dir, "never.json")}
	for _, tc := range []struct {
		name string
		args []string
		code int
		msg  string
	}{
		{"part 0/4", append(sim, "--part", "0/4"), 2, "counts from 1"},
		{"part 5/4", append(sim, "--part", "5/4"), 2, "counts from 1 to the number of parts 4, got 5"},
		{"part a/b", append(sim, "--part", "a/b"), 2, "give K/N"},
		{"part 3", append(sim, "--part", "3"), 2, "give K/N"},
		{"part 1/0", append(sim, "--part", "1/0"), 2, "number of parts"},
		{"precision", append(sim, "--part", "1/2", "--precision", "5%"), 2, "give a fixed --samples"},
		{"subset", append(sim, "--part", "1/2", "--method", "subset"), 2, "subset simulation is sequential"},
		{"importance sweep", []string{"sweep", "--example", "cover-flange", "--vary", "torque=40..70N*m", "--method", "importance", "--part", "1/2", "--part-file", filepath.Join(dir, "never.json")}, 2, "sweep parts run crude"},
		{"fixed with precision", []string{"simulate", "--example", "cover-flange", "--method", "importance", "--fixed-samples", "--precision", "10%"}, 2, "without --precision"},
		{"out in a part", append(sim, "--part", "1/2", "--out", filepath.Join(dir, "rev")), 2, "give them to 'boltrisk merge'"},
		{"sweep target", []string{"sweep", "--example", "cover-flange", "--vary", "torque=40..70N*m", "--target", "1e-3", "--part", "1/2", "--part-file", filepath.Join(dir, "never.json")}, 2, "bisection"},
		{"sweep max-scatter", []string{"sweep", "--example", "cover-flange", "--max-scatter", "torque", "--target", "1e-3", "--part", "1/2", "--part-file", filepath.Join(dir, "never.json")}, 2, "sequential"},
		{"truncated", []string{"merge", truncated, good[1]}, 1, "truncated part file"},
		{"importance sums", []string{"merge", badSums, imp[1]}, 1, "importance chunk 1: the sums are not 6 events ×"},
		{"changed", []string{"merge", flipped, good[1]}, 1, "checksum mismatch"},
		{"empty", []string{"merge", empty}, 1, "the file is empty"},
		{"not a part", []string{"merge", notPart}, 1, "not a part file"},
		{"other tool version", []string{"merge", versioned, good[1]}, 1, "was written by boltrisk 9.9.9"},
		{"other seed", []string{"merge", good[0], other[1]}, 1, "different seeds"},
		{"other scenario", []string{"merge", good[0], otherScen[1]}, 1, "different scenarios"},
		{"other N", []string{"merge", good[0], three[1]}, 1, "different numbers of parts"},
		{"twice", []string{"merge", good[0], good[0], good[1]}, 1, "given twice"},
		{"missing file", []string{"merge", filepath.Join(dir, "nope.json")}, 1, "cannot read part file"},
		{"empty folder", []string{"merge", t.TempDir()}, 1, "holds no part files"},
	} {
		code, _, errs := runCLI(tc.args...)
		if code != tc.code || !strings.Contains(errs, tc.msg) {
			t.Errorf("%s: exit %d (want %d), stderr %q (want %q)", tc.name, code, tc.code, errs, tc.msg)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "never.json")); err == nil {
		t.Error("a refused part wrote its part file")
	}
}

// TestPartAuto maps job-array environments to K/N (README "Running on a
// cluster").
func TestPartAuto(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name  string
		env   map[string]string
		count int
		k, n  int
		err   string
	}{
		{"slurm from 1", map[string]string{"SLURM_ARRAY_TASK_ID": "3", "SLURM_ARRAY_TASK_MIN": "1", "SLURM_ARRAY_TASK_MAX": "4", "SLURM_ARRAY_TASK_COUNT": "4"}, 0, 3, 4, ""},
		{"slurm from 0", map[string]string{"SLURM_ARRAY_TASK_ID": "0", "SLURM_ARRAY_TASK_MIN": "0", "SLURM_ARRAY_TASK_MAX": "63", "SLURM_ARRAY_TASK_COUNT": "64"}, 0, 1, 64, ""},
		{"slurm with a step", map[string]string{"SLURM_ARRAY_TASK_ID": "2", "SLURM_ARRAY_TASK_MIN": "0", "SLURM_ARRAY_TASK_MAX": "8", "SLURM_ARRAY_TASK_COUNT": "5"}, 0, 0, 0, "contiguous array"},
		{"slurm without count", map[string]string{"SLURM_ARRAY_TASK_ID": "2"}, 0, 0, 0, "SLURM_ARRAY_TASK_MIN"},
		{"kubernetes", map[string]string{"JOB_COMPLETION_INDEX": "0"}, 8, 1, 8, ""},
		{"kubernetes without --parts", map[string]string{"JOB_COMPLETION_INDEX": "0"}, 0, 0, 0, "give --parts N"},
		{"kubernetes index too large", map[string]string{"JOB_COMPLETION_INDEX": "8"}, 8, 0, 0, "got 9"},
		{"pbs", map[string]string{"PBS_ARRAY_INDEX": "4"}, 4, 4, 4, ""},
		{"aws batch", map[string]string{"AWS_BATCH_JOB_ARRAY_INDEX": "5"}, 10, 6, 10, ""},
		{"no environment", map[string]string{}, 0, 0, 0, "no job-array variable is set"},
		{"two engines", map[string]string{"PBS_ARRAY_INDEX": "1", "JOB_COMPLETION_INDEX": "0"}, 2, 0, 0, "several job-array variables"},
		{"not a number", map[string]string{"JOB_COMPLETION_INDEX": "x"}, 2, 0, 0, "not a whole number"},
	} {
		p := partFlags{Spec: "auto", Count: tc.count}
		k, n, err := p.resolve(func(s string) string { return tc.env[s] })
		switch {
		case tc.err == "" && (err != nil || k != tc.k || n != tc.n):
			t.Errorf("%s: %d/%d, %v; want %d/%d", tc.name, k, n, err, tc.k, tc.n)
		case tc.err != "" && (err == nil || !strings.Contains(err.Error(), tc.err)):
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.err)
		}
	}
}
