package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"boltrisk/montecarlo/report"
)

// corpus holds the hostile part files of testdata/bad/parts and what the
// merge must say about each (exit status 1, nothing written). Rewrite the
// files with 'go test ./cmd/boltrisk -run TestPartCorpus -update'.
var corpus = []struct {
	file, msg string
	make      func(good []byte) []byte
}{
	{"truncated.json", "truncated part file", func(g []byte) []byte { return g[:len(g)*2/3] }},
	{"bit-flip.json", "checksum mismatch", func(g []byte) []byte {
		return []byte(strings.Replace(string(g), `"samples":16384`, `"samples":16385`, 1))
	}},
	{"not-json.json", "not a part file", func([]byte) []byte { return []byte("part: 1\nof: 2\n") }},
	{"other-kind.json", `a "simulate" document, not a part file`, func([]byte) []byte {
		return []byte(`{"schema_version":2,"kind":"simulate","tool_version":"x","part_format":1}`)
	}},
	{"future-format.json", "part format 99", func(g []byte) []byte { return reencode(g, func(d *report.PartDoc) { d.PartFormat = 99 }) }},
	{"subset.json", "a part of a subset run", func(g []byte) []byte { return reencode(g, func(d *report.PartDoc) { d.Steps[0].Method = "subset" }) }},
	{"scenario-edited.json", "does not match its SHA-256", func(g []byte) []byte {
		return reencode(g, func(d *report.PartDoc) { d.Source += "\n# edited\n" })
	}},
	{"bad-counts.json", "bin counts end", func(g []byte) []byte {
		return reencode(g, func(d *report.PartDoc) { d.Steps[0].Sketches[0].Counts = "AAAA" })
	}},
	{"part-9-of-2.json", "part 9 of 2", func(g []byte) []byte { return reencode(g, func(d *report.PartDoc) { d.Part = 9 }) }},
}

func reencode(g []byte, f func(*report.PartDoc)) []byte {
	d, err := report.DecodePart("good", g)
	if err != nil {
		panic(err)
	}
	f(d)
	b, err := report.EncodePart(*d)
	if err != nil {
		panic(err)
	}
	return b
}

func TestPartCorpus(t *testing.T) {
	dir := filepath.Join("..", "..", "testdata", "bad", "parts")
	if *update {
		good := runParts(t, t.TempDir(), 2, "simulate", "--example", "cover-flange", "--samples", "30000", "--seed", "4")
		g, _ := os.ReadFile(good[0])
		os.MkdirAll(dir, 0o755)
		for _, c := range corpus {
			if err := os.WriteFile(filepath.Join(dir, c.file), c.make(g), 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
	for _, c := range corpus {
		out := filepath.Join(t.TempDir(), "review")
		code, stdout, errs := runCLI("merge", "--allow-missing", filepath.Join(dir, c.file), "--out", out)
		if code != 1 || !strings.Contains(errs, c.msg) || stdout != "" {
			t.Errorf("%s: exit %d, stderr %q (want %q)", c.file, code, errs, c.msg)
		}
		if _, err := os.Stat(out); err == nil {
			t.Errorf("%s: the refused merge wrote %s", c.file, out)
		}
	}
}
