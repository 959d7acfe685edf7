package scenario

import (
	"crypto/sha256"
	"encoding/hex"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"boltrisk/montecarlo"
)

const dataBase = "bolt: {thread: M10, class: \"10.9\", length: 60 mm}\nmembers:\n  layers: [{thickness: 20 mm, material: steel}, {thickness: 25 mm, material: cast-iron}]\n"

// The demo scenario's nut factor is fitted to its CSV file at load time:
// the file's SHA-256, the sample and the fit are kept; predictive: true
// gives the log-t of n − 1 degrees of freedom (Gelman et al., Bayesian
// Data Analysis, 3rd ed., §3.2).
func TestDataInputDemo(t *testing.T) {
	t.Parallel()
	dir := filepath.Join("..", "..", "testdata", "fit")
	s, err := Load(filepath.Join(dir, "flange-fitted.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Data) != 1 {
		t.Fatalf("%d data inputs, want 1", len(s.Data))
	}
	ds := s.Data[0]
	raw, _ := os.ReadFile(filepath.Join(dir, "torque-tension-demo.csv"))
	sum := sha256.Sum256(raw)
	if ds.SHA256 != hex.EncodeToString(sum[:]) || ds.N != 12 || ds.Column != "K" || ds.Family != montecarlo.LogNormal || !ds.Predictive {
		t.Errorf("data source %+v", ds)
	}
	v, ok := s.Uncertain("tightening.nut_factor")
	if !ok || v.Dist.Kind != montecarlo.LogT || v.Dist.C != 11 {
		t.Fatalf("nut factor %+v, want a log-t with 11 d.o.f.", v)
	}
	// location: the mean of ln K; exp of it is the geometric mean of the 12
	// values, 0.200361 (computed: NumPy 1.24).
	if math.Abs(math.Exp(v.Dist.A)-0.20036141) > 1e-7 || s.Inputs().NutFactor != v.Dist.Mean() {
		t.Errorf("median %.5g, nominal %.5g", math.Exp(v.Dist.A), s.Inputs().NutFactor)
	}
	if !strings.Contains(s.Sources["tightening.nut_factor"], "torque-tension-demo.csv") {
		t.Errorf("source %q", s.Sources["tightening.nut_factor"])
	}
	if ds.Fit.Kind != montecarlo.LogNormal || !(ds.Dist.StdDev() > ds.Fit.StdDev()) {
		t.Errorf("predictive spread %g not above the plug-in %g", ds.Dist.StdDev(), ds.Fit.StdDev())
	}
}

func TestDataInputs(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "k.csv"), []byte("n,K,F\n1,0.187,27.9\n2,0.213,24.6\n3,0.198,26.3\n4,0.221,23.7\n5,0.176,29.8\n6,0.205,25.5\n"), 0o644)
	for _, c := range []struct {
		name, tight string
		kind        montecarlo.Kind
		warn        string
	}{
		{"plug-in lognormal", "{method: nut-factor, torque: 52 N*m, nut_factor: {data: k.csv, column: K, family: lognormal}}", montecarlo.LogNormal, "only 6 test values"},
		{"predictive normal", "{method: nut-factor, torque: 52 N*m, nut_factor: {data: k.csv, column: K, family: normal, predictive: true}}", montecarlo.StudentT, ""},
		{"family chosen", "{method: nut-factor, torque: 52 N*m, nut_factor: {data: k.csv, column: K}}", 0, ""},
		{"force with unit", "{method: preload, preload: {data: k.csv, column: F, unit: kN, family: weibull}}", montecarlo.Weibull, ""},
		{"truncnormal", "{method: nut-factor, torque: 52 N*m, nut_factor: {data: k.csv, column: K, family: truncnormal, lower: 0.1}}", montecarlo.TruncNormal, ""},
	} {
		path := filepath.Join(dir, "s.yaml")
		data := []byte(dataBase + "tightening: " + c.tight + "\n")
		s, err := parse(path, data, dir)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if len(s.Data) != 1 {
			t.Fatalf("%s: %d data inputs", c.name, len(s.Data))
		}
		if c.kind != 0 && s.Data[0].Dist.Kind != c.kind {
			t.Errorf("%s: %v, want %v", c.name, s.Data[0].Dist.Kind, c.kind)
		}
		if c.kind == 0 && !s.Data[0].FamilyChosen {
			t.Errorf("%s: family not marked as chosen", c.name)
		}
		if c.warn != "" {
			found := false
			for _, w := range s.Warnings {
				found = found || strings.Contains(w.Message, c.warn)
			}
			if !found {
				t.Errorf("%s: no warning %q in %v", c.name, c.warn, s.Warnings)
			}
		}
	}
	// From standard input (Parse) a relative path is read from the working
	// folder: here the package folder, where k.csv is not.
	_, err := Parse("(standard input)", []byte(dataBase+"tightening: {method: nut-factor, torque: 52 N*m, nut_factor: {data: k.csv, column: K}}\n"))
	if err == nil || !strings.Contains(err.Error(), "relative to the working folder") {
		t.Errorf("standard input: %v", err)
	}
}

// Every key of a data input is in the scenario schema.
func TestSchemaCoversDataKeys(t *testing.T) {
	t.Parallel()
	defs := Schema()["$defs"].(map[string]any)
	v := defs["value_force"].(map[string]any)["oneOf"].([]any)
	if ref := v[len(v)-1].(map[string]any)["$ref"]; ref != "#/$defs/data_input" {
		t.Errorf("value_force does not offer a data input: %v", ref)
	}
	props := defs["data_input"].(map[string]any)["properties"].(map[string]any)
	for _, k := range dataKeys {
		if props[k] == nil {
			t.Errorf("scenario schema lacks the data key %s", k)
		}
	}
}
