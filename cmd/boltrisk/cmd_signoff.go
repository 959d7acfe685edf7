package main

import (
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/decide"
	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// checkSignOff checks simulate's --sign-off target.
func checkSignOff(opts *SimulateOptions) error {
	if !opts.Cmd().Flags().Changed("sign-off") {
		return nil
	}
	if !(opts.SignOff > 0 && opts.SignOff < 1) {
		return usagef("--sign-off %g: a target failure probability strictly between 0 and 1, e.g. 1e-4", opts.SignOff)
	}
	if opts.Output.Dir == "" {
		return usagef("--sign-off sets the verdicts of the review's sign-off page: give --out DIR too")
	}
	return nil
}

// addSignOff puts the sign-off sheet in front of a simulation review and
// the scenario file in its appendix.
func addSignOff(rev *report.Review, opts *SimulateOptions, s *scenario.Scenario, res *montecarlo.Result, doc report.SimDoc) {
	target, from := opts.SignOff, "simulate --sign-off"
	if !opts.Cmd().Flags().Changed("sign-off") {
		target, from = s.Study.TargetProbability, "the scenario's study.target_probability"
	}
	var vs []decide.Verdict
	if target > 0 {
		for _, m := range res.Modes {
			vs = append(vs, decide.Judge(m.Estimate, res.Samples, target, res.Confidence))
		}
		vs = append(vs, decide.Judge(res.Any, res.Samples, target, res.Confidence))
	}
	sys, _ := opts.system(s)
	rev.SignOff = report.SignOffSheet(s, doc, target, from, vs, opts.Output.Now().UTC().Format("2006-01-02 15:04 UTC"), sys)
	rev.Appendices = append(rev.Appendices, report.ScenarioAppendix(s))
}
