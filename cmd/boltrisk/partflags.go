package main

import (
	"fmt"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
)

// partFlags split a run into parts of a batch cluster's job array.
type partFlags struct {
	Spec  string // K/N or auto
	File  string // --part-file
	Count int    // --parts, the count for engines that do not give it
	Fixed bool   // --fixed-samples (simulate)
}

func (p *partFlags) add(cmd *cobra.Command) {
	fl := cmd.Flags()
	fl.StringVar(&p.Spec, "part", "", "run only part K of N (K/N, K from 1; or auto: from the job array's environment) and write its part file for 'boltrisk merge'")
	fl.StringVar(&p.File, "part-file", "", "with --part: the part file to write (default part-K-of-N.json in the working folder)")
	fl.IntVar(&p.Count, "parts", 0, "with --part auto: the number of parts, for engines whose environment does not give it (Kubernetes, PBS, AWS Batch)")
	if cmd.Name() == "simulate" {
		fl.BoolVar(&p.Fixed, "fixed-samples", false, "importance sampling: draw exactly --samples samples, no precision stop (what the parts of a split run draw; the one-machine counterpart of --part)")
	}
}

// arrayEngines are the job-array environments --part auto reads, in the
// order they are tried. Each gives the task's index; Slurm also the count
// and the lowest index; the others are told the count by --parts.
var arrayEngines = []struct {
	name, index string
	base        int // the engine's first index, where it gives no MIN variable
}{
	{"Slurm", "SLURM_ARRAY_TASK_ID", 0},
	{"Kubernetes Indexed Job", "JOB_COMPLETION_INDEX", 0},
	{"PBS", "PBS_ARRAY_INDEX", 1},
	{"AWS Batch", "AWS_BATCH_JOB_ARRAY_INDEX", 0},
}

// resolve returns K and N from --part (and the environment for auto).
func (p *partFlags) resolve(getenv func(string) string) (int, int, error) {
	if p.Count < 0 {
		return 0, 0, usagef("--parts %d: a whole number of parts from 1 to %d", p.Count, montecarlo.MaxParts)
	}
	if p.Spec != "auto" {
		ks, ns, ok := strings.Cut(p.Spec, "/")
		k, err1 := strconv.Atoi(strings.TrimSpace(ks))
		n, err2 := strconv.Atoi(strings.TrimSpace(ns))
		if !ok || err1 != nil || err2 != nil {
			return 0, 0, usagef("--part %q: give K/N (part K of N, K from 1, e.g. 3/64) or auto (from the job array's environment)", p.Spec)
		}
		if err := montecarlo.ValidatePart(k, n); err != nil {
			return 0, 0, usagef("--part %q: %v", p.Spec, err)
		}
		return k, n, nil
	}
	var found []string
	for _, e := range arrayEngines {
		if getenv(e.index) != "" {
			found = append(found, e.index)
		}
	}
	switch len(found) {
	case 0:
		var names []string
		for _, e := range arrayEngines {
			names = append(names, e.index+" ("+e.name+")")
		}
		return 0, 0, usagef("--part auto: no job-array variable is set (looked for %s); give --part K/N outside a job array", strings.Join(names, ", "))
	case 1:
	default:
		return 0, 0, usagef("--part auto: several job-array variables are set (%s); give --part K/N", strings.Join(found, ", "))
	}
	num := func(name string) (int, bool, error) {
		v := getenv(name)
		if v == "" {
			return 0, false, nil
		}
		x, err := strconv.Atoi(strings.TrimSpace(v))
		if err != nil || x < 0 {
			return 0, true, usagef("--part auto: %s=%q is not a whole number ≥ 0", name, v)
		}
		return x, true, nil
	}
	for _, e := range arrayEngines {
		if e.index != found[0] {
			continue
		}
		idx, _, err := num(e.index)
		if err != nil {
			return 0, 0, err
		}
		lo, n := e.base, p.Count
		if e.name == "Slurm" {
			mn, okMin, err := num("SLURM_ARRAY_TASK_MIN")
			if err != nil {
				return 0, 0, err
			}
			mx, okMax, err := num("SLURM_ARRAY_TASK_MAX")
			if err != nil {
				return 0, 0, err
			}
			cnt, okCnt, err := num("SLURM_ARRAY_TASK_COUNT")
			if err != nil {
				return 0, 0, err
			}
			if !okMin || !okMax || !okCnt {
				return 0, 0, usagef("--part auto: SLURM_ARRAY_TASK_ID is set but not SLURM_ARRAY_TASK_MIN, _MAX and _COUNT; submit with sbatch --array")
			}
			if cnt != mx-mn+1 {
				return 0, 0, usagef("--part auto: the Slurm array %d-%d has %d tasks, not %d: submit a contiguous array (--array=%d-%d, no step or list)", mn, mx, cnt, mx-mn+1, mn, mn+cnt-1)
			}
			if p.Count != 0 && p.Count != cnt {
				return 0, 0, usagef("--parts %d, but the Slurm array has %d tasks", p.Count, cnt)
			}
			lo, n = mn, cnt
		} else if n == 0 {
			return 0, 0, usagef("--part auto: %s gives the task's index (%s) but not the count: give --parts N", e.name, e.index)
		}
		k := idx - lo + 1
		if err := montecarlo.ValidatePart(k, n); err != nil {
			return 0, 0, usagef("--part auto: %s=%d gives part %d of %d (first index %d): %v", e.index, idx, k, n, lo, err)
		}
		return k, n, nil
	}
	return 0, 0, fmt.Errorf("unreachable")
}

// partFile returns the part file's path.
func (p *partFlags) partFile(k, n int) string {
	if p.File != "" {
		return p.File
	}
	return fmt.Sprintf("part-%d-of-%d.json", k, n)
}

var osGetenv = os.Getenv

// fixed applies --fixed-samples to the settings of a run on one machine.
func (p *partFlags) fixed(run *runFlags, set *montecarlo.Settings) error {
	if !p.Fixed {
		return nil
	}
	if set.Precision > 0 {
		return usagef("--fixed-samples draws exactly --samples: give it without --precision (and without study.precision)")
	}
	set.FixedSamples = true
	return nil
}
