package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// BenchmarkMerge1000Parts times 'boltrisk merge' of 1 000 part files (one
// chunk of 16 384 samples each, cover-flange, 1.6·10⁷ samples, histograms
// kept) — reading, checking, decoding and merging them and writing the JSON —
// beside the reference: the same run on this machine. The README's figure
// (target: under 2 s) comes from
//
//	go test ./cmd/boltrisk -run '^$' -bench Merge1000Parts -benchtime 3x
func BenchmarkMerge1000Parts(b *testing.B) {
	const n = 1000
	samples := int64(n * montecarlo.ChunkSize)
	src := report.PartSource{Name: "example:cover-flange"}
	var err error
	if src.Data, err = scenario.ExampleSource("cover-flange"); err != nil {
		b.Fatal(err)
	}
	if src.Scenario, err = scenario.Example("cover-flange"); err != nil {
		b.Fatal(err)
	}
	dir := b.TempDir()
	set := montecarlo.Settings{Samples: samples, Seed: 1, Confidence: 0.95, Method: montecarlo.Crude}.WithDefaults()
	var size int64
	for k := 1; k <= n; k++ {
		st, err := montecarlo.RunPart(context.Background(), &src.Scenario.Problem, set, k, n)
		if err != nil {
			b.Fatal(err)
		}
		data, err := report.EncodePart(report.NewPartDoc("simulate", src, set, "crude", []*montecarlo.PartState{st}, nil, toolVersion()))
		if err != nil {
			b.Fatal(err)
		}
		size += int64(len(data))
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("part-%d-of-%d.json", k, n)), data, 0o644); err != nil {
			b.Fatal(err)
		}
	}
	b.Logf("%d part files, %.1f MB", n, float64(size)/1e6)
	b.Run("merge", func(b *testing.B) {
		for range b.N {
			if code, _, errs := runCLI("merge", dir, "--json", "--quiet"); code != 0 {
				b.Fatal(errs)
			}
		}
	})
	b.Run("one-machine", func(b *testing.B) {
		for range b.N {
			if code, _, errs := runCLI("simulate", "--example", "cover-flange", "--samples", fmt.Sprint(samples), "--method", "crude", "--json", "--quiet"); code != 0 {
				b.Fatal(errs)
			}
		}
	})
}
