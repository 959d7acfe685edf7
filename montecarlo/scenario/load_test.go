package scenario

import (
	"math"
	"strings"
	"testing"

	"boltrisk/model"
)

const base = `name: test joint
bolt:
  thread: M12
  class: "10.9"
  count: 4
  length: 50 mm
members:
  layers:
    - thickness: 15 mm
      material: steel
    - thickness: 15 mm
      material: steel
tightening:
  torque: 100 N*m
  nut_factor: 0.2
loads:
  axial_max: 20 kN
  axial_min: 5 kN
  shear: 10 kN
plate:
  material: S355
  edge_distance: 25 mm
  width: 80 mm
`

func TestBaseScenarioLoads(t *testing.T) {
	t.Parallel()
	s, err := Parse("base.yaml", []byte(base))
	if err != nil {
		t.Fatal(err)
	}
	in := s.Inputs()
	if in.Thread.Name != "M12" || in.Bolts != 4 || in.Torque != 100e3 || in.AxialMax != 20e3 {
		t.Errorf("unexpected inputs %+v", in)
	}
	// length 50, thread length 2d + 6 = 30 (Shigley Table 8-7) → 20 mm shank, all inside the 30 mm grip.
	if in.ShankInGrip != 20 {
		t.Errorf("shank in grip = %g, want 20", in.ShankInGrip)
	}
	if in.HoleDia != 13 || in.BearingDia != 18 {
		t.Errorf("default hole/bearing = %g/%g, want 13/18", in.HoleDia, in.BearingDia)
	}
}

func TestUnits(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		torque string
		nmm    float64
	}{
		{"100 N*m", 100e3}, {"100 N·m", 100e3}, {"100 Nm", 100e3}, {"100000 N*mm", 100e3},
		{"73.756 lbf*ft", 100e3}, {"885.07 lbf*in", 100e3}, {"0.1 kN*m", 100e3},
	} {
		s, err := Parse("u.yaml", []byte(strings.Replace(base, "100 N*m", test.torque, 1)))
		if err != nil {
			t.Fatalf("%s: %v", test.torque, err)
		}
		// 1 lbf·ft = 1.355818 N·m (NIST SP 811).
		if got := s.Inputs().Torque; math.Abs(got-test.nmm) > 1e-4*test.nmm {
			t.Errorf("%s: got %g N·mm, want %g", test.torque, got, test.nmm)
		}
	}
}

func TestBadInput(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		name     string
		old, new string
		want     []string // all must appear in the message
	}{
		{"missing unit", "100 N*m", "100", []string{"tightening.torque", `"100"`, "needs a unit of torque", "N*m"}},
		{"wrong unit", "100 N*m", "100 kN", []string{"tightening.torque", "not a unit of torque"}},
		{"zero thickness", "- thickness: 15 mm", "- thickness: 0 mm", []string{"members.layers.1.thickness", "must be > 0"}},
		{"negative thickness", "- thickness: 15 mm", "- thickness: -3 mm", []string{"members.layers.1.thickness", "must be > 0"}},
		{"bolt shorter than grip", "length: 50 mm", "length: 25 mm", []string{"bolt.length", "not longer than the grip 30.00 mm"}},
		{"hole smaller than bolt", "  count: 4\n", "  count: 4\n  hole_diameter: 11 mm\n", []string{"bolt.hole_diameter", "11.00 mm", "must exceed the bolt diameter 12.00 mm"}},
		{"unknown thread", "thread: M12", "thread: M13", []string{"bolt.thread", `"M13"`, "unknown thread", "M2–M64"}},
		{"unknown class", `class: "10.9"`, `class: "10.8"`, []string{"bolt.class", "unknown property class", "10.9"}},
		{"edge distance inside hole", "edge_distance: 25 mm", "edge_distance: 6 mm", []string{"plate.edge_distance", "beyond the hole edge", "6.500 mm"}},
		{"nut factor too high", "nut_factor: 0.2", "nut_factor: 1.5", []string{"tightening.nut_factor", "0.03 … 0.8"}},
		{"nut factor zero", "nut_factor: 0.2", "nut_factor: 0", []string{"tightening.nut_factor", "0.03 … 0.8"}},
		{"friction out of range", "  nut_factor: 0.2\n", "  method: friction\n  thread_friction: 1.2\n  head_friction: 0.1\n", []string{"tightening.thread_friction", "0.01 … 0.8"}},
		{"pmin above pmax", "axial_min: 5 kN", "axial_min: 25 kN", []string{"loads.axial_min", "25.00 kN", "exceeds loads.axial_max 20.00 kN"}},
		{"NaN", "100 N*m", "NaN N*m", []string{"tightening.torque", "not a finite number"}},
		{"Inf", "axial_max: 20 kN", "axial_max: +Inf kN", []string{"loads.axial_max", "not a finite number"}},
		{"unknown key", "  count: 4\n", "  cuont: 4\n", []string{"bolt.cuont", "unknown key", `did you mean "count"`}},
		{"unknown section", "loads:", "laods:", []string{"laods", `did you mean "loads"`}},
		{"dist bad cov", "nut_factor: 0.2", "nut_factor: {dist: lognormal, mean: 0.2, cov: -0.1}", []string{"tightening.nut_factor.cov", "must be > 0"}},
		{"dist sd and cov", "nut_factor: 0.2", "nut_factor: {dist: normal, mean: 0.2, cov: 0.1, sd: 0.02}", []string{"tightening.nut_factor", "exactly one of sd, cov or tolerance"}},
		{"uniform bounds", "nut_factor: 0.2", "nut_factor: {dist: uniform, min: 0.3, max: 0.1}", []string{"tightening.nut_factor", "lower bound 0.3 must be below upper bound 0.1"}},
		{"lognormal nonpositive", "axial_min: 5 kN", "axial_min: {dist: lognormal, mean: -5 kN, sd: 1 kN}", []string{"loads.axial_min", "lognormal", "> 0"}},
		{"unknown dist", "nut_factor: 0.2", "nut_factor: {dist: gamma, mean: 0.2, cov: 0.1}", []string{"tightening.nut_factor.dist", "allowed: normal"}},
		{"bare dimension in dist", "nut_factor: 0.2", "nut_factor: 0.2\n  embedding: {dist: normal, mean: 8, sd: 2 um}", []string{"tightening.embedding.mean", "needs a unit of length"}},
		{"unused input", "  nut_factor: 0.2\n", "  nut_factor: 0.2\n  preload: 40 kN\n  method: nut-factor\n", []string{"tightening.preload", "not used by tightening method nut-factor"}},
		{"no plate strength", "  material: S355\n", "", []string{"plate.yield_strength", "needs the plate strength"}},
		{"width too small", "width: 80 mm", "width: 40 mm", []string{"plate.width", "must exceed the holes across it"}},
		{"not a mapping", base, "- a\n- b\n", []string{"a YAML mapping of sections"}},
		{"bad yaml", base, "bolt: [\n", []string{"not valid YAML"}},
		{"empty", base, "  \n\n", []string{"the file is empty"}},
		{"binary", base, "\x00\x01\x02bolt", []string{"not text"}},
		{"missing thread", "  thread: M12\n", "", []string{"bolt.thread", "required"}},
		{"duplicate key", "  count: 4\n", "  count: 4\n  count: 5\n", []string{"bolt.count", "given twice"}},
		{"correlation not PD", "  nut_factor: 0.2\n", "  nut_factor: {dist: lognormal, mean: 0.2, cov: 0.1}\n  torque_x: 1\n", []string{"tightening.torque_x", "unknown key"}},
	} {
		t.Run(test.name, func(t *testing.T) {
			t.Parallel()
			text := strings.Replace(base, test.old, test.new, 1)
			if text == base {
				t.Fatalf("test setup: %q not found", test.old)
			}
			_, err := Parse("bad.yaml", []byte(text))
			if err == nil {
				t.Fatal("want an error")
			}
			for _, w := range test.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not mention %q", err, w)
				}
			}
			if !strings.HasPrefix(err.Error(), "bad.yaml") {
				t.Errorf("error %q does not name the file", err)
			}
		})
	}
}

func TestErrorLine(t *testing.T) {
	t.Parallel()
	_, err := Parse("f.yaml", []byte(strings.Replace(base, "100 N*m", "100 kg", 1)))
	if err == nil || !strings.HasPrefix(err.Error(), "f.yaml:14: tightening.torque") {
		t.Errorf("want file:line prefix f.yaml:14, got %v", err)
	}
}

func TestCorrelations(t *testing.T) {
	t.Parallel()
	doc := strings.Replace(base, "  nut_factor: 0.2\n", "  method: friction\n  thread_friction: {dist: normal, mean: 0.12, sd: 0.01}\n  head_friction: {dist: normal, mean: 0.12, sd: 0.01}\n", 1)
	ok := doc + "correlations:\n  - between: [thread_friction, head_friction]\n    rho: 0.6\n"
	s, err := Parse("c.yaml", []byte(ok))
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Problem.Corr) != 1 || s.Problem.Corr[0].Rho != 0.6 {
		t.Errorf("correlation not read: %+v", s.Problem.Corr)
	}
	// Three pairwise correlations that no matrix can have: ρ12 = 0.9, ρ13 = 0.9, ρ23 = −0.9.
	bad := strings.Replace(doc, "  torque: 100 N*m\n", "  torque: {dist: normal, mean: 100 N*m, cov: 3%}\n", 1) +
		"correlations:\n  - {between: [thread_friction, head_friction], rho: 0.9}\n  - {between: [thread_friction, torque], rho: 0.9}\n  - {between: [head_friction, torque], rho: -0.9}\n"
	if _, err := Parse("c.yaml", []byte(bad)); err == nil || !strings.Contains(err.Error(), "not positive definite") {
		t.Errorf("want not-positive-definite error, got %v", err)
	}
	notUnc := doc + "correlations:\n  - between: [thread_friction, torque]\n    rho: 0.5\n"
	if _, err := Parse("c.yaml", []byte(notUnc)); err == nil || !strings.Contains(err.Error(), "is not uncertain") {
		t.Errorf("want not-uncertain error, got %v", err)
	}
	missing := doc + "correlations:\n  - between: [thread_friction, torqe]\n    rho: 0.5\n"
	if _, err := Parse("c.yaml", []byte(missing)); err == nil || !strings.Contains(err.Error(), "no such input") {
		t.Errorf("want no-such-input error, got %v", err)
	}
}

func TestPresets(t *testing.T) {
	t.Parallel()
	doc := strings.Replace(base, "  nut_factor: 0.2\n", "  condition: oiled\n  tool: torque-wrench\n", 1)
	s, err := Parse("p.yaml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	k, ok := s.Uncertain("tightening.nut_factor")
	if !ok {
		t.Fatal("condition oiled did not set the nut factor")
	}
	// Shigley Table 8-15: lubricated K = 0.18 (confirmed); c.o.v. 0.084 from Table 8-14.
	if m := k.Dist.Mean(); math.Abs(m-0.18) > 1e-12 {
		t.Errorf("oiled K mean = %g, want 0.18", m)
	}
	if c := k.Dist.StdDev() / k.Dist.Mean(); math.Abs(c-0.084) > 1e-9 {
		t.Errorf("oiled K c.o.v. = %g, want 0.084", c)
	}
	tq, ok := s.Uncertain("tightening.torque")
	if !ok || math.Abs(tq.Dist.StdDev()-0.06*100e3/3) > 1e-9 {
		t.Errorf("torque-wrench preset: want sd 2 N·m, got %+v", tq)
	}
	// An explicit value overrides the preset.
	doc = strings.Replace(base, "  nut_factor: 0.2\n", "  nut_factor: 0.15\n  condition: oiled\n", 1)
	s, err = Parse("p.yaml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := s.Uncertain("tightening.nut_factor"); ok || s.Inputs().NutFactor != 0.15 {
		t.Error("an explicit nut factor must win over the condition preset")
	}
	// Dry → oiled is one line.
	dry := strings.Replace(base, "  nut_factor: 0.2\n", "  condition: dry\n", 1)
	oil := strings.Replace(dry, "condition: dry", "condition: oiled", 1)
	a, _ := Parse("a.yaml", []byte(dry))
	b, _ := Parse("b.yaml", []byte(oil))
	if !(b.Inputs().NutFactor < a.Inputs().NutFactor) {
		t.Error("oiled must have a lower nut factor than dry (Shigley Table 8-15)")
	}
}

func TestVariants(t *testing.T) {
	t.Parallel()
	doc := strings.Replace(base, "  nut_factor: 0.2\n", "  condition: dry\n", 1) +
		"variants:\n  - name: oiled\n    set:\n      tightening.condition: oiled\n  - name: paste\n    set:\n      tightening.nut_factor: {dist: lognormal, mean: 0.12, cov: 10%}\n"
	s, err := Parse("v.yaml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Variants) != 2 || s.Variants[0].Variant != "oiled" || s.Variants[0].ConditionName != "oiled" {
		t.Fatalf("variants: %+v", s.Variants)
	}
	if s.Variants[1].ConditionName != "" || math.Abs(s.Variants[1].Inputs().NutFactor-0.12) > 1e-12 {
		t.Errorf("paste variant: explicit K should replace the condition")
	}
	// A variant may change the tightening method: the base's torque and
	// presets do not carry over.
	angle := doc + "  - name: angle\n    set:\n      tightening.method: preload\n      tightening.preload: 40 kN\n      tightening.tool: angle-controlled\n"
	sa, err := Parse("v.yaml", []byte(angle))
	if err != nil {
		t.Fatal(err)
	}
	if a := sa.Variants[2]; a.Inputs().Method != model.DirectPreload || a.ConditionName != "" || a.ToolName != "angle-controlled" {
		t.Errorf("angle variant: method %v, condition %q, tool %q", a.Inputs().Method, a.ConditionName, a.ToolName)
	}
	bad := doc + "  - name: broken\n    set:\n      tightening.torqe: 5 N*m\n"
	if _, err := Parse("v.yaml", []byte(bad)); err == nil || !strings.Contains(err.Error(), `did you mean "tightening.torque"`) {
		t.Errorf("want did-you-mean for a misspelled variant path, got %v", err)
	}
}

func TestExamplesLoad(t *testing.T) {
	t.Parallel()
	for _, name := range Examples() {
		s, err := Example(name)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		var o model.Outcome
		model.Evaluate(s.Inputs(), &o)
		if o.Invalid {
			t.Errorf("%s: nominal joint invalid", name)
		}
	}
}

func FuzzParse(f *testing.F) {
	f.Add([]byte(base))
	f.Add([]byte(capScrew))
	for _, name := range Examples() {
		b, _ := ExampleSource(name)
		f.Add(b)
	}
	f.Add([]byte("bolt: {thread: M12}\n"))
	f.Add([]byte("\x00"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Parse("fuzz.yaml", data)
		if err != nil {
			if s != nil {
				t.Fatal("scenario returned together with an error")
			}
			return
		}
		var o model.Outcome
		model.Evaluate(s.Inputs(), &o)
		for m := model.Mode(0); m < model.NumModes; m++ {
			if o.Active[m] && (math.IsNaN(o.Demand[m]) || math.IsNaN(o.Capacity[m])) {
				t.Fatalf("accepted scenario gives NaN in mode %s", m.Key())
			}
		}
	})
}

// capScrew is a cap-screw joint of our own: M10 8.8 through a 12 mm S235
// plate with a washer into an aluminium housing, heated in service.
const capScrew = `name: cap screw
bolt:
  thread: M10
  class: "8.8"
  length: 35 mm
  washer: {thickness: 2 mm, outer_diameter: 20 mm, material: steel}
members:
  tapped: {engagement: 15 mm}
  layers:
    - {thickness: 12 mm, material: S235}
    - {thickness: 30 mm, material: AW-6082-T6}
tightening:
  method: friction
  torque: 40 N*m
  condition: oiled
service:
  temperature_change: {dist: normal, mean: 80 K, sd: 10 K}
loads:
  axial_max: 8 kN
`

func TestNewKeys(t *testing.T) {
	t.Parallel()
	s, err := Parse("cap.yaml", []byte(capScrew))
	if err != nil {
		t.Fatal(err)
	}
	in := s.Inputs()
	if !in.Tapped || in.Engagement != 15 || !in.Washer.Present() || in.Washer.OuterDia != 20 || in.Washer.InnerDia != in.HoleDia {
		t.Errorf("tapped/washer not read: %+v", in)
	}
	// Clamp length h = 12 + 2 (washer); thread engagement 35 − 14 = 21 ≥ 15.
	if in.Grip() != 14 {
		t.Errorf("clamp length %g, want 14", in.Grip())
	}
	// Tapped shear strength: 0.6·Rm of AW-6082 (Rm 290, VDI 2230-1 Table A9).
	if math.Abs(in.TappedShear-0.6*290) > 1e-9 || !strings.Contains(s.SourceOf("members.tapped.shear_strength"), "0.6·Rm") {
		t.Errorf("tapped shear %g (%s)", in.TappedShear, s.SourceOf("members.tapped.shear_strength"))
	}
	// Expansion: steel bolt 12, S235 12, aluminium 23.6 µm/m/K.
	if in.BoltExpansion != 12e-6 || in.Layers[0].Expansion != 12e-6 || in.Layers[1].Expansion != 23.6e-6 {
		t.Errorf("expansion: bolt %g, layers %g %g", in.BoltExpansion, in.Layers[0].Expansion, in.Layers[1].Expansion)
	}
	v, ok := s.Uncertain("service.temperature_change")
	if !ok || v.Dist.Mean() != 80 || v.PerBolt() {
		t.Errorf("temperature change: %+v", v)
	}
	// pG: S235 under the washer (490 MPa), the washer of plain steel has none.
	if in.Layers[0].PressureLimit != 490 || in.Washer.PressureLimit != 0 {
		t.Errorf("pG: %g, washer %g", in.Layers[0].PressureLimit, in.Washer.PressureLimit)
	}
	var o model.Outcome
	model.Evaluate(in, &o)
	for _, m := range []model.Mode{model.ThreadStripping, model.HeadPressure} {
		if !o.Active[m] {
			t.Errorf("%s not active for a tapped joint on S235", m.Key())
		}
	}
}

func TestPreloadMethodFriction(t *testing.T) {
	t.Parallel()
	pre := strings.Replace(base, "  torque: 100 N*m\n  nut_factor: 0.2\n", "  method: preload\n  preload: 40 kN\n  tool: angle-controlled\n", 1)
	s, err := Parse("p.yaml", []byte(pre))
	if err != nil {
		t.Fatal(err)
	}
	in := s.Inputs()
	if in.Tensioned || in.ThreadFriction != DefaultThreadFriction || !strings.HasPrefix(s.SourceOf("tightening.thread_friction"), "default: μG = 0.12") {
		t.Errorf("angle-controlled: tensioned %v, μG %g (%s)", in.Tensioned, in.ThreadFriction, s.SourceOf("tightening.thread_friction"))
	}
	// A condition sets the thread friction of the preload method.
	s, err = Parse("p.yaml", []byte(strings.Replace(pre, "  tool: angle-controlled\n", "  tool: ultrasonic\n  condition: oiled\n", 1)))
	if err != nil {
		t.Fatal(err)
	}
	if v, ok := s.Uncertain("tightening.thread_friction"); !ok || math.Abs(v.Dist.Mean()-0.12) > 1e-12 {
		t.Errorf("oiled: thread friction %+v", v)
	}
	// thread_friction is accepted with method preload and labelled as given.
	s, err = Parse("p.yaml", []byte(strings.Replace(pre, "  tool: angle-controlled\n", "  thread_friction: 0.1\n", 1)))
	if err != nil {
		t.Fatal(err)
	}
	if s.Inputs().ThreadFriction != 0.1 || s.SourceOf("tightening.thread_friction") != "given" {
		t.Errorf("thread friction %g (%s)", s.Inputs().ThreadFriction, s.SourceOf("tightening.thread_friction"))
	}
	// A tensioner applies no torsion.
	s, err = Parse("p.yaml", []byte(strings.Replace(pre, "angle-controlled", "tension-controlled", 1)))
	if err != nil {
		t.Fatal(err)
	}
	if !s.Inputs().Tensioned {
		t.Error("tension-controlled tool: want Tensioned")
	}
}

func TestSourcesAreTruthful(t *testing.T) {
	t.Parallel()
	// An explicit thread friction beside a condition is labelled "given"; the
	// head friction the condition sets is labelled with the condition.
	doc := strings.Replace(base, "  nut_factor: 0.2\n", "  method: friction\n  condition: dry\n  thread_friction: 0.11\n", 1)
	s, err := Parse("s.yaml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	if s.SourceOf("tightening.thread_friction") != "given" || !strings.HasPrefix(s.SourceOf("tightening.head_friction"), "condition dry") {
		t.Errorf("sources: thread %q, head %q", s.SourceOf("tightening.thread_friction"), s.SourceOf("tightening.head_friction"))
	}
}

func TestLoaderWarnings(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		name, old, new, field, want string
	}{
		{"metric thread, inch class", `class: "10.9"`, "class: SAE 5\n  proof_strength: 585 MPa", "bolt.class", "inch-series class"},
		{"pitch below EN minimum", "  width: 80 mm\n", "  width: 80 mm\n  resistance: en1993\n  bolts_across: 2\n  pitch: 25 mm\n  gauge: 40 mm\n", "plate.pitch", "Table 3.3 minimum p1 = 2.2·d0 = 28.60 mm"},
		{"nut class below the bolt's", "  count: 4\n", "  count: 4\n  nut: {class: \"8\"}\n", "bolt.nut.class", "may strip"},
		{"US units in warnings", "edge_distance: 25 mm\n  width: 80 mm\n", "edge_distance: 16 mm\n  width: 80 mm\nunits: us\n", "plate.edge_distance", "0.6299 in is below 1.5·d = 0.7087 in"},
	} {
		s, err := Parse("w.yaml", []byte(strings.Replace(base, test.old, test.new, 1)))
		if err != nil {
			t.Fatalf("%s: %v", test.name, err)
		}
		found := false
		for _, w := range s.Warnings {
			if w.Field == test.field && strings.Contains(w.Message, test.want) {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: no warning on %s mentioning %q in %v", test.name, test.field, test.want, s.Warnings)
		}
	}
}

func TestEmbeddingEstimateApplied(t *testing.T) {
	t.Parallel()
	// VDI 2230-1 Table 5 (from memory), Rz 10–40 µm assumed, axial load:
	// thread 3 + 2 bearing faces × 3 + 1 interface × 2 = 11 µm — but this
	// joint carries shear (transverse): 3 + 2 × 4.5 + 1 × 2.5 = 14.5 µm.
	s, err := Parse("e.yaml", []byte(strings.Replace(base, "  nut_factor: 0.2\n", "  nut_factor: 0.2\n  embedding: vdi2230\n", 1)))
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Inputs().Embedding; math.Abs(got-0.0145) > 1e-12 {
		t.Errorf("embedding %g mm, want 0.0145 (%s)", got, s.SourceOf("tightening.embedding"))
	}
}

func TestCustomThreadAndLargeGrade(t *testing.T) {
	t.Parallel()
	doc := strings.Replace(strings.Replace(base, "thread: M12", "thread: {diameter: 2.5 in, threads_per_inch: 8}", 1), `class: "10.9"`, "class: B7", 1)
	doc = strings.Replace(strings.Replace(doc, "length: 50 mm", "length: 8 in", 1), "  shear: 10 kN\n", "", 1) + "fatigue:\n  endurance: 40 MPa\n"
	s, err := Parse("c.yaml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	in := s.Inputs()
	// ASME B1.1 At = 0.7854·(2.5 − 0.9743/8)² = 4.44 in² (computed); A193 B7
	// ≤ 2-1/2 in: Sy 105 ksi (from memory).
	if math.Abs(in.Thread.StressArea/645.16-0.7854*math.Pow(2.5-0.9743/8, 2)) > 1e-9 || math.Abs(in.Yield-105*6.894757) > 0.01 {
		t.Errorf("custom thread %+v, Sy %g", in.Thread, in.Yield)
	}
}

func TestNotChecked(t *testing.T) {
	t.Parallel()
	s, err := Parse("n.yaml", []byte(base))
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, u := range s.NotChecked() {
		got[u.Key] = u.Reason
	}
	for key, want := range map[string]string{
		"thread_stripping":  "bolt.nut",
		"head_pressure":     "pressure_limit",
		"block_tearing":     "plate.gauge",
		"slip":              "plate.slip_factor",
		"prying":            "not modelled by this tool",
		"eccentric_loading": "not modelled",
	} {
		if !strings.Contains(got[key], want) {
			t.Errorf("not checked %s: got %q, want it to mention %q", key, got[key], want)
		}
	}
	for _, key := range []string{"proof", "fatigue", "bolt_shear", "tension_shear"} {
		if _, ok := got[key]; ok {
			t.Errorf("%s is checked for this joint but listed as not checked", key)
		}
	}
	// Without shear every shear-side mode is listed with that reason.
	s, _ = Parse("n.yaml", []byte(strings.Replace(base, "  shear: 10 kN\n", "", 1)))
	n := 0
	for _, u := range s.NotChecked() {
		if strings.Contains(u.Reason, "no shear load") {
			n++
		}
	}
	if n != 8 {
		t.Errorf("%d shear-side modes listed as unchecked for want of shear, want 8", n)
	}
}
