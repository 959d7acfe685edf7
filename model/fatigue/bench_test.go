package fatigue

import "testing"

var (
	sinkLife   Life
	sinkDamage Damage
)

// benchCycles are amplitudes that visit every region of the curves.
var benchCycles = [...]Cycle{
	{Amplitude: 74.14, Mean: 696.64}, {Amplitude: 29.66, Mean: 652.16}, {Amplitude: 60, Mean: 650},
	{Amplitude: 15, Mean: 500}, {Amplitude: 40, Mean: 560}, {Amplitude: 7.5, Mean: 500},
	{Amplitude: 120, Mean: 740}, {Amplitude: 48, Mean: 600},
}

var benchSpectrum = []Block{
	{Cycle: Cycle{Amplitude: 40, Mean: 500}, Count: 1e5},
	{Cycle: Cycle{Amplitude: 25, Mean: 500}, Count: 3e5},
	{Cycle: Cycle{Amplitude: 15, Mean: 500}, Count: 2e6},
	{Cycle: Cycle{Amplitude: 7.5, Mean: 500}, Count: 1e8},
}

// The per-sample evaluations allocate nothing (rules: hot loops allocate
// nothing), including building a curve with a sampled strength.
func TestNoAllocations(t *testing.T) {
	sh, _ := NewShigley(1040, 162, 0)
	sv, _ := NewVDI2230(12, RolledBeforeHeatTreatment, 0)
	sg, _ := NewVDI2230(12, RolledAfterHeatTreatment, 940)
	en, _ := NewEN1993(20)
	i := 0
	next := func() Cycle { i++; return benchCycles[i%len(benchCycles)] }
	for _, tc := range []struct {
		name string
		f    func()
	}{
		{"Shigley.Life", func() { sinkLife, _ = sh.Life(next()) }},
		{"NewShigley+Life", func() {
			s, _ := NewShigley(1040, 150+float64(i%20), 0)
			sinkLife, _ = s.Life(next())
		}},
		{"VDI2230.Life SV", func() { sinkLife, _ = sv.Life(next()) }},
		{"VDI2230.Life SG", func() { sinkLife, _ = sg.Life(Cycle{Amplitude: next().Amplitude, Mean: 650}) }},
		{"VDI2230.Scaled+Life", func() {
			v, _ := sv.Scaled(0.9 + 0.01*float64(i%20))
			sinkLife, _ = v.Life(next())
		}},
		{"EN1993.Life", func() { sinkLife, _ = en.Life(next()) }},
		{"EN1993.SpectrumLife", func() { sinkLife, _ = en.SpectrumLife(next()) }},
		{"EN1993.Damage", func() { sinkDamage, _ = en.Damage(benchSpectrum, nil) }},
		{"Shigley.Damage", func() { sinkDamage, _ = sh.Damage(benchSpectrum, nil) }},
	} {
		if a := testing.AllocsPerRun(1000, tc.f); a != 0 {
			t.Errorf("%s: %g allocations per call, want 0", tc.name, a)
		}
	}
}

func BenchmarkShigleyLife(b *testing.B) {
	s, _ := NewShigley(1040, 162, 0)
	for i := 0; b.Loop(); i++ {
		sinkLife, _ = s.Life(benchCycles[i%len(benchCycles)])
	}
}

func BenchmarkNewShigleyLife(b *testing.B) {
	for i := 0; b.Loop(); i++ {
		s, _ := NewShigley(1040, 150+float64(i&15), 0)
		sinkLife, _ = s.Life(benchCycles[i%len(benchCycles)])
	}
}

func BenchmarkVDI2230Life(b *testing.B) {
	v, _ := NewVDI2230(12, RolledBeforeHeatTreatment, 0)
	for i := 0; b.Loop(); i++ {
		sinkLife, _ = v.Life(benchCycles[i%len(benchCycles)])
	}
}

func BenchmarkEN1993SpectrumLife(b *testing.B) {
	e, _ := NewEN1993(20)
	for i := 0; b.Loop(); i++ {
		sinkLife, _ = e.SpectrumLife(benchCycles[i%len(benchCycles)])
	}
}

func BenchmarkEN1993Damage4Blocks(b *testing.B) {
	e, _ := NewEN1993(20)
	for b.Loop() {
		sinkDamage, _ = e.Damage(benchSpectrum, nil)
	}
}
