package main

import (
	"context"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

func mergeSweep(ctx context.Context, opts *MergeOptions, ps *report.PartSet, s *scenario.Scenario, set montecarlo.Settings, states [][]*montecarlo.PartState, merge func(*montecarlo.Problem, []*montecarlo.PartState, string) (*montecarlo.Result, error), missing string) error {
	return nil
}
