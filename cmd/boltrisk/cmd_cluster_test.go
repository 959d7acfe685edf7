package main

import (
	"bytes"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

// TestClusterScript: the Slurm script is valid bash with the array and the
// dependent merge; the Kubernetes output is two valid YAML Jobs, the first
// Indexed; bad invocations are refused.
func TestClusterScript(t *testing.T) {
	file := filepath.Join("..", "..", "testdata", "examples", "cover-flange.yaml")
	code, out, errs := runCLI("cluster-script", "slurm", file, "--parts", "64", "--samples", "1e9", "--seed", "7", "--", "--method", "crude")
	if code != 0 {
		t.Fatalf("slurm: exit %d: %s", code, errs)
	}
	for _, want := range []string{"--array=1-64", "--dependency=afterok:\"$array\"", "--part auto", "--samples 1e9 --seed 7 --method crude", "merge . --json"} {
		if !strings.Contains(out, want) {
			t.Errorf("slurm script lacks %q:\n%s", want, out)
		}
	}
	if bash, err := exec.LookPath("bash"); err == nil {
		cmd := exec.Command(bash, "-n")
		cmd.Stdin = strings.NewReader(out)
		if b, err := cmd.CombinedOutput(); err != nil {
			t.Errorf("bash -n: %v: %s", err, b)
		}
	}
	code, out, errs = runCLI("cluster-script", "kubernetes", file, "--parts", "8", "--image", "reg/boltrisk:1")
	if code != 0 {
		t.Fatalf("kubernetes: exit %d: %s", code, errs)
	}
	dec := yaml.NewDecoder(bytes.NewReader([]byte(out)))
	var kinds []string
	for {
		var job struct {
			Kind string `yaml:"kind"`
			Spec struct {
				CompletionMode string `yaml:"completionMode"`
				Completions    int    `yaml:"completions"`
				Deadline       int    `yaml:"activeDeadlineSeconds"`
			} `yaml:"spec"`
		}
		if err := dec.Decode(&job); err != nil {
			break
		}
		kinds = append(kinds, job.Kind+"/"+job.Spec.CompletionMode)
		if job.Spec.CompletionMode == "Indexed" && job.Spec.Completions != 8 {
			t.Errorf("completions %d", job.Spec.Completions)
		}
		if job.Spec.CompletionMode == "" && job.Spec.Deadline != 86400 {
			t.Errorf("merge Job activeDeadlineSeconds %d, want the default 24 h", job.Spec.Deadline) // it must not wait forever for a failed part
		}
	}
	if strings.Join(kinds, " ") != "Job/Indexed Job/" {
		t.Errorf("kubernetes documents %v:\n%s", kinds, out)
	}
	for _, tc := range []struct {
		args []string
		msg  string
	}{
		{[]string{"cluster-script", "slurm", file, "--parts", "0"}, "--parts 0"},
		{[]string{"cluster-script", "pbs", file, "--parts", "4"}, "allowed slurm or kubernetes"},
		{[]string{"cluster-script", "kubernetes", file, "--parts", "4", "--merge-deadline", "10s"}, "--merge-deadline 10s: at least 1m"},
		{[]string{"cluster-script", "slurm", file, "--parts", "4", "--", "--precision", "5%"}, "cannot be passed"},
		{[]string{"cluster-script", "slurm", file, "--parts", "4", "--samples", "x"}, "--samples"},
	} {
		if code, _, errs := runCLI(tc.args...); code != 2 || !strings.Contains(errs, tc.msg) {
			t.Errorf("%v: exit %d, %s", tc.args, code, errs)
		}
	}
}
