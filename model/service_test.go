package model_test

import (
	"math"
	"testing"

	"boltrisk/model"
	"boltrisk/model/fatigue"
)

// TestFatigueLifeVDI is the hand check of the fatigue_life mode:
// reference-data-2 A1 worked check (computed there; VDI 2230-1 formulas not
// confirmed against the published text): M12 SV, σa = 60 MPa, N =
// 2·10⁶·(48.875/60)³ = 1.0810·10⁶ cycles. Against a design life of 10⁶ the
// mode holds (life factor 1.081); against 2·10⁶ it fails. The bolt force of
// a separated joint is the external load (Shigley §8-7): BoltForceAt.
func TestFatigueLifeVDI(t *testing.T) {
	t.Parallel()
	v, err := fatigue.NewVDI2230(12, fatigue.RolledBeforeHeatTreatment, 0)
	if err != nil {
		t.Fatal(err)
	}
	as := 84.3
	hi, lo := model.BoltForceAt(1000, 0.2, 20000+120*as), model.BoltForceAt(1000, 0.2, 20000)
	l, err := v.Life(fatigue.MaxMin(hi/as, lo/as))
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(l.Cycles/1.0810e6-1) > 1e-4 {
		t.Fatalf("life %g, want 1.0810e6", l.Cycles)
	}
	for _, c := range []struct {
		design float64
		fails  bool
	}{{1e6, false}, {2e6, true}} {
		var b model.BoltResult
		model.SetFatigueLife(&b, c.design, l.Cycles)
		if got := b.Failures(model.SetOf(model.FatigueLife)).Has(model.FatigueLife); got != c.fails || !b.Active[model.FatigueLife] {
			t.Errorf("design life %g: fails %v, want %v", c.design, got, c.fails)
		}
	}
	// closed joint: Fb = Fi + Φ·P (Shigley Eq. 8-24)
	if f := model.BoltForceAt(30000, 0.2, 10000); f != 32000 {
		t.Errorf("closed joint bolt force %g, want 32000", f)
	}
	var b model.BoltResult
	model.SetFatigueLife(&b, 1e6, math.Inf(1))
	if b.Capacity[model.FatigueLife] != 1e30 {
		t.Errorf("infinite life held at %g", b.Capacity[model.FatigueLife])
	}
}
