package scenario

import (
	"strconv"

	"boltrisk/model/units"
)

func (b *builder) study() error {
	p, r, s := b.p, b.r, b.s
	n, err := p.integer(r, "study.samples", 0, 1, 1e11)
	if err != nil {
		return err
	}
	s.Study.Samples = n
	if v, line, ok, err := p.scalar(r, "study.seed"); err != nil {
		return err
	} else if ok {
		seed, err := strconv.ParseUint(v, 10, 64)
		if err != nil {
			return p.errf(line, "study.seed", v, "expected a whole number from 0 to 2^64−1")
		}
		s.Study.Seed, s.Study.SeedSet = seed, true
	}
	if v, line, ok, err := p.scalar(r, "study.confidence"); err != nil {
		return err
	} else if ok {
		c, err := units.Parse(v, units.Fraction)
		if err != nil || !(c > 0 && c < 1) {
			return p.errf(line, "study.confidence", v, "must lie strictly between 0 and 1 (e.g. 0.95 or 95%%)")
		}
		s.Study.Confidence = c
	}
	if _, line, ok, err := p.scalar(r, "study.target"); err != nil {
		return err
	} else if ok {
		return p.errf(line, "study.target", "", "no longer a half-width: write the stopping rule as study.precision, a coefficient of variation (old target R ≈ 1.96 × c.o.v., so target 0.1 becomes precision 0.05), and a target failure probability as study.target_probability")
	}
	if v, line, ok, err := p.scalar(r, "study.precision"); err != nil {
		return err
	} else if ok {
		c, err := units.Parse(v, units.Fraction)
		if err != nil || !(c > 0 && c < 1) {
			return p.errf(line, "study.precision", v, "the target coefficient of variation must lie strictly between 0 and 1 (e.g. 5%% or 0.05)")
		}
		s.Study.Precision = c
	}
	if v, line, ok, err := p.scalar(r, "study.target_probability"); err != nil {
		return err
	} else if ok {
		c, err := units.ParseNumber(v)
		if err != nil || !(c > 0 && c < 1) {
			return p.errf(line, "study.target_probability", v, "a failure probability strictly between 0 and 1 (e.g. 1e-4)")
		}
		s.Study.TargetProbability = c
	}
	return nil
}
