package units

import (
	"math"
	"testing"
)

func TestParse(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		s    string
		d    Dim
		want float64
	}{
		// Conversions: 1 in = 25.4 mm (exact); 1 lbf = 4.4482216152605 N (exact);
		// 1 ksi = 6.894757 MPa (reference sheet §0); 1 lbf·in = 0.1129848 N·m.
		{"30 kN", Force, 30000}, {"2.4 kip", Force, 2400 * 4.4482216152605}, {"100 lbf", Force, 444.82216152605},
		{"1.5 in", Length, 38.1}, {"8 um", Length, 0.008}, {"8 µm", Length, 0.008}, {"0.03 m", Length, 30},
		{"120 ksi", Stress, 827.3708751802}, {"207 GPa", Stress, 207000}, {"30 Mpsi", Stress, 206842.7188},
		{"1 lbf*in", Torque, 112.9848290}, {"1 lbf·ft", Torque, 1355.8179483}, {"120 N.m", Torque, 120000},
		{"5%", Fraction, 0.05}, {"0.05", Fraction, 0.05}, {"3", None, 3}, {"1e3 N", Force, 1000},
		{"2 kN/mm", Stiffness, 2000},
		// Temperature differences: 1 °C = 1 K, 1 °F = 5/9 K (NIST SP 811).
		{"80 K", TempDiff, 80}, {"-40 °C", TempDiff, -40}, {"144 °F", TempDiff, 80}, {"90 degF", TempDiff, 50},
		{"12e-6 1/K", Expansion, 12e-6}, {"23.6 um/m/K", Expansion, 23.6e-6}, {"6.5 µin/in/°F", Expansion, 11.7e-6},
		{"13e-6 /°C", Expansion, 13e-6},
	} {
		got, err := Parse(test.s, test.d)
		if err != nil {
			t.Fatalf("%q: %v", test.s, err)
		}
		if math.Abs(got-test.want) > 1e-7*math.Abs(test.want) {
			t.Errorf("%q: got %.10g, want %.10g", test.s, got, test.want)
		}
	}
	for _, bad := range []struct {
		s string
		d Dim
	}{{"30", Force}, {"30 kg", Force}, {"NaN N", Force}, {"Inf mm", Length}, {"", Force}, {"5 mm", None}, {"abc", None}, {"1.2.3 N", Force}, {"1e308 N*m", Torque}, {"80 kg", TempDiff}} {
		if _, err := Parse(bad.s, bad.d); err == nil {
			t.Errorf("%q as %v: want error", bad.s, bad.d)
		}
	}
}

func TestFormat(t *testing.T) {
	t.Parallel()
	for _, test := range []struct {
		sys  System
		v    float64
		d    Dim
		want string
	}{
		{SI, 41190.6, Force, "41.19 kN"}, {SI, 940, Stress, "940.0 MPa"}, {SI, 95000, Torque, "95.00 N*m"},
		{US, 4.4482216152605 * 2400, Force, "2.400 kip"}, {US, 827.37087518, Stress, "120.0 ksi"},
	} {
		if got := test.sys.Format(test.v, test.d); got != test.want {
			t.Errorf("Format(%g, %v) = %q, want %q", test.v, test.d, got, test.want)
		}
	}
}
