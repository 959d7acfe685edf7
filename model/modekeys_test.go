package model_test

import (
	"go/ast"
	"go/parser"
	"go/token"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"boltrisk/model"
)

// handChecks names, for every mode key, the tests that check the mode
// against a value worked by hand from its published formula or a published
// example (the source is in each test's comments).
var handChecks = map[string][]string{
	"assembly_yield":   {"TestVDIPermissibleAssemblyPreload", "TestPreloadMethodsKeepThreadTorsion"},
	"proof":            {"TestGoodmanWithLoads", "TestSeparatedJoint"},
	"service_yield":    {"TestServiceYield"},
	"separation":       {"TestGoodmanWithLoads", "TestSeparatedJoint"},
	"thread_stripping": {"TestThreadStrippingM10InAluminium", "TestThreadShearAreas"},
	"head_pressure":    {"TestHeadPressure"},
	"fatigue":          {"TestGoodmanGerberASME", "TestGoodmanWithLoads", "TestSeparatedJoint"},
	"fatigue_life":     {"TestFatigueLifeVDI"},
	"bolt_shear":       {"TestShearEN1993", "TestShearAISC360", "TestShearYieldRule", "TestLongJointEN1993", "TestLongJointAISC360"},
	"bolt_bearing":     {"TestShearYieldRule"},
	"plate_bearing":    {"TestShearEN1993", "TestInnerBoltsEN1993", "TestEdgeAndInnerColumnsEN1993", "TestShearAISC360"},
	"net_section":      {"TestShearEN1993", "TestNetSectionAISC360HoleAllowance", "TestShearYieldRule"},
	"tear_out":         {"TestShearAISC360", "TestBlockTearingAISC360", "TestShearYieldRule"},
	"block_tearing":    {"TestBlockTearingEN1993", "TestBlockTearingAISC360"},
	"tension_shear":    {"TestTensionShearAISC360", "TestTensionShearEN1993", "TestTensionShearYield"},
	"slip":             {"TestSlipEN1993", "TestShearAISC360"},
}

func TestEveryModeHasAHandCheck(t *testing.T) {
	t.Parallel()
	tests := map[string]bool{}
	files, _ := filepath.Glob("*_test.go")
	fset := token.NewFileSet()
	for _, f := range files {
		src, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		file, err := parser.ParseFile(fset, f, src, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range file.Decls {
			if fn, ok := d.(*ast.FuncDecl); ok && strings.HasPrefix(fn.Name.Name, "Test") {
				tests[fn.Name.Name] = true
			}
		}
	}
	for _, key := range model.ModeKeys() {
		names, ok := handChecks[key]
		if !ok || len(names) == 0 {
			t.Errorf("mode %s has no hand-worked check", key)
		}
		for _, n := range names {
			if !tests[n] {
				t.Errorf("mode %s: test %s does not exist", key, n)
			}
		}
	}
	for key := range handChecks {
		if _, ok := model.ParseMode(key); !ok {
			t.Errorf("handChecks names %s, which is not a mode", key)
		}
	}
}

func TestServiceYield(t *testing.T) {
	t.Parallel()
	// VDI 2230-1 working-stress check (from memory): σred,B = √(σ² + 3(kτ·τ)²)
	// with σ = Fb/As, τ = MG/(π·d0³/16), kτ = 0.5. R1 by hand: K = 0.2 implies
	// μtot = (K·d − P/(2π))/(0.577·d2 + DKm/2) = 0.1513 (ISO 16047), MG =
	// FM·(P/(2π) + 0.577·d2·μtot) = 61.4 N·m; Fb = 50 + 0.2017·30 = 56.05 kN;
	// σ = 665.1, kτ·τ = 140.6 MPa → σred = 708.3 MPa.
	in := r1()
	var o model.Outcome
	model.Evaluate(&in, &o)
	th := in.Thread
	mu := (0.2*12 - th.Pitch/(2*math.Pi)) / (0.5773502691896258*th.PitchDia + (18+13)/4.0)
	mg := 50e3 * (th.Pitch/(2*math.Pi) + 0.5773502691896258*th.PitchDia*mu)
	d0 := (th.PitchDia + th.MinorDia) / 2
	sig := o.Bolt.BoltForce / th.StressArea
	tau := 0.5 * mg * 16 / (math.Pi * d0 * d0 * d0)
	near(t, "MG", o.Bolt.ThreadTorque, mg, 1e-12)
	near(t, "σred,B", o.Demand[model.ServiceYield], math.Sqrt(sig*sig+3*tau*tau), 1e-12)
	near(t, "σred,B value", o.Demand[model.ServiceYield], 708.3, 0.002)
}
