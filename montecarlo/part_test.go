package montecarlo_test

import (
	"context"
	"errors"
	"reflect"
	"testing"
	"time"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// TestPartsMergeExactly: a crude run split into N parts and merged equals
// the run on one machine bit for bit (the reproducibility contract,
// DEVELOPERS.md), for several N, worker counts and a budget that ends in a
// short chunk; with more parts than chunks some parts are empty.
func TestPartsMergeExactly(t *testing.T) {
	t.Parallel()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name    string
		samples int64
		parts   int
		binned  bool
	}{
		{"one part", 70_000, 1, true},
		{"three parts", 70_000, 3, true},
		{"seven parts", 100_003, 7, true},
		{"more parts than chunks", 40_000, 5, false},
		{"load cases", 50_000, 3, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			s := s
			if tc.name == "load cases" {
				var err error
				if s, err = scenario.Example("service-life"); err != nil {
					t.Fatal(err)
				}
			}
			set := montecarlo.Settings{Samples: tc.samples, Seed: 11, Workers: 2, ProbabilitiesOnly: !tc.binned}
			one, err := montecarlo.Run(context.Background(), &s.Problem, set)
			if err != nil {
				t.Fatal(err)
			}
			var parts []*montecarlo.PartState
			for k := tc.parts; k >= 1; k-- { // any order
				ps := set
				ps.Workers = 1 + k%2
				p, err := montecarlo.RunPart(context.Background(), &s.Problem, ps, k, tc.parts)
				if err != nil {
					t.Fatal(err)
				}
				parts = append(parts, p)
			}
			got, err := montecarlo.MergeParts(context.Background(), &s.Problem, set, parts)
			if err != nil {
				t.Fatal(err)
			}
			one.Elapsed, got.Elapsed = 0, 0
			if !reflect.DeepEqual(one, got) {
				t.Errorf("merged result differs from one machine:\n one %+v\n got %+v", one.Any, got.Any)
			}
			if got.Partial {
				t.Error("complete merge marked partial")
			}
		})
	}
}

// TestPartChunksTile: the blocks of the documented assignment tile the
// chunks in order and differ in size by at most one.
func TestPartChunksTile(t *testing.T) {
	t.Parallel()
	for _, samples := range []int64{1, 16384, 16385, 1e6, 1e9} {
		for _, n := range []int{1, 2, 3, 7, 64, 1000} {
			next := int64(0)
			lo, hi := int64(1<<62), int64(0)
			for k := 1; k <= n; k++ {
				c0, c1 := montecarlo.PartChunks(samples, k, n)
				if c0 != next {
					t.Fatalf("samples %d, %d parts: part %d starts at chunk %d, want %d", samples, n, k, c0, next)
				}
				next = c1
				lo, hi = min(lo, c1-c0), max(hi, c1-c0)
			}
			if want := (samples + montecarlo.ChunkSize - 1) / montecarlo.ChunkSize; next != want || hi-lo > 1 {
				t.Errorf("samples %d, %d parts: end %d (want %d), sizes %d … %d", samples, n, next, want, lo, hi)
			}
		}
	}
}

// TestPartRefusals: methods and stopping rules that do not merge exactly
// are refused with the way out named.
func TestPartRefusals(t *testing.T) {
	t.Parallel()
	s, _ := scenario.Example("cover-flange")
	for _, tc := range []struct {
		name string
		set  montecarlo.Settings
		k, n int
	}{
		{"precision", montecarlo.Settings{Samples: 1e5, Precision: 0.1}, 1, 2},
		{"subset", montecarlo.Settings{Samples: 1e5, Method: montecarlo.Subset}, 1, 2},
		{"part 0", montecarlo.Settings{Samples: 1e5}, 0, 4},
		{"part 5 of 4", montecarlo.Settings{Samples: 1e5}, 5, 4},
	} {
		_, err := montecarlo.RunPart(context.Background(), &s.Problem, tc.set, tc.k, tc.n)
		if err == nil {
			t.Errorf("%s: accepted", tc.name)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := montecarlo.RunPart(ctx, &s.Problem, montecarlo.Settings{Samples: 1e5}, 1, 1)
	if !errors.Is(err, montecarlo.ErrInterrupted) {
		t.Errorf("cancelled part: %v", err)
	}
	_ = time.Second
}

// TestImportancePartsMergeExactly: importance sampling of a fixed sample
// count split into parts and merged equals the run on one machine
// (Settings.FixedSamples) bit for bit, percentiles included.
func TestImportancePartsMergeExactly(t *testing.T) {
	t.Parallel()
	s, err := scenario.Example("cover-flange")
	if err != nil {
		t.Fatal(err)
	}
	set := montecarlo.Settings{Samples: 5000, Seed: 3, Workers: 2, Method: montecarlo.Importance, FixedSamples: true}
	one, err := montecarlo.Estimate(context.Background(), &s.Problem, set)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{1, 3, 7} {
		var parts []*montecarlo.PartState
		for k := 1; k <= n; k++ {
			ps := set
			ps.Workers = 1 + k%2
			p, err := montecarlo.RunPart(context.Background(), &s.Problem, ps, k, n)
			if err != nil {
				t.Fatal(err)
			}
			parts = append(parts, p)
		}
		got, err := montecarlo.MergeParts(context.Background(), &s.Problem, set, parts)
		if err != nil {
			t.Fatal(err)
		}
		one.Elapsed, got.Elapsed = 0, 0
		if !reflect.DeepEqual(one, got) {
			t.Errorf("%d parts: merged importance result differs from one machine: one %+v, got %+v", n, one.Any, got.Any)
		}
	}
}
