package main

import (
	"fmt"
	"io"
	"path/filepath"
	"regexp"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

// ClusterOptions are the options of `boltrisk cluster-script`.
type ClusterOptions struct {
	Out       io.Writer
	Parts     int
	Samples   string
	Seed      uint64
	SeedSet   bool
	CPUs      int
	Time      string
	Partition string
	Image     string
	Claim     string
	Mount     string
	Dir       string
	Result    string
	Binary    string
	Deadline  time.Duration
	Extra     []string
}

func newClusterScriptCmd(stdout io.Writer) *cobra.Command {
	o := &ClusterOptions{Out: stdout}
	cmd := &cobra.Command{
		Use:   "cluster-script slurm|kubernetes FILE --parts N [-- SIMULATE-FLAGS…]",
		Short: "Print a job-array script: a simulation in N parts, merged when all succeed",
		Long: `Print what submits 'boltrisk simulate FILE' split into N parts on a batch
cluster, each part one task of a job array ('simulate --part auto'), and the
merge ('boltrisk merge') run once every part has succeeded:

  slurm       a bash script to run on the login node: it submits the array with
              sbatch --array=1-N and the merge with --dependency=afterok on it
  kubernetes  two Job manifests (apply both with kubectl apply -f): an Indexed Job
              of N completions, and a merge Job that waits for the N part files
              on the shared volume, then merges them

Flags after -- are passed to every part unchanged (e.g. -- --method crude --modes
fatigue). Nothing is submitted; read the script, then run it.`,
		Example: `  boltrisk cluster-script slurm joint.yaml --parts 64 --samples 1e10 > submit.sh && bash submit.sh
  boltrisk cluster-script kubernetes joint.yaml --parts 32 --image registry/boltrisk:1 > job.yaml`,
		Args: cobra.MinimumNArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.SeedSet = cmd.Flags().Changed("seed")
			if d := cmd.ArgsLenAtDash(); d >= 0 {
				o.Extra, args = args[d:], args[:d]
			}
			if len(args) != 2 {
				return usagef("give the engine (slurm or kubernetes) and one scenario FILE, then -- and any simulate flags")
			}
			return runClusterScript(o, args[0], args[1])
		},
	}
	fl := cmd.Flags()
	fl.IntVar(&o.Parts, "parts", 0, "number of parts (array tasks), 1 … 100000 (required)")
	fl.StringVar(&o.Samples, "samples", "", "samples of the whole run, e.g. 1e9 (default: the scenario's study.samples, else 1e6)")
	fl.Uint64Var(&o.Seed, "seed", 0, "seed of the run (default: the scenario's study.seed, else 1)")
	fl.IntVar(&o.CPUs, "cpus", 2, "cores per task (the part's --workers)")
	fl.StringVar(&o.Time, "time", "01:00:00", "slurm: time limit of each task (sbatch --time)")
	fl.StringVar(&o.Partition, "partition", "", "slurm: partition (sbatch --partition; default: the cluster's)")
	fl.StringVar(&o.Image, "image", "boltrisk:latest", "kubernetes: container image holding boltrisk and /bin/sh")
	fl.StringVar(&o.Claim, "claim", "boltrisk-data", "kubernetes: PersistentVolumeClaim (ReadWriteMany) holding FILE and the parts")
	fl.StringVar(&o.Mount, "mount", "/data", "kubernetes: where the claim is mounted; FILE is taken relative to it")
	fl.StringVar(&o.Dir, "dir", "boltrisk-parts", "folder of the part files and logs")
	fl.StringVar(&o.Result, "result", "result.json", "file the merge writes (JSON)")
	fl.StringVar(&o.Binary, "boltrisk", "boltrisk", "path of the boltrisk program on the nodes (slurm)")
	fl.DurationVar(&o.Deadline, "merge-deadline", 24*time.Hour, "kubernetes: the merge Job gives up (fails) when the parts are not all there after this long, e.g. 6h")
	return cmd
}

var safeWord = regexp.MustCompile(`^[A-Za-z0-9_./:@%+=,-]+$`)

// shq quotes a word for the shell.
func shq(s string) string {
	if safeWord.MatchString(s) {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

func runClusterScript(o *ClusterOptions, engine, file string) error {
	if o.Parts < 1 || o.Parts > 100000 {
		return usagef("--parts %d: the number of array tasks, 1 … 100000", o.Parts)
	}
	if o.CPUs < 1 || o.CPUs > 1024 {
		return usagef("--cpus %d: cores per task, 1 … 1024", o.CPUs)
	}
	if o.Deadline < time.Minute {
		return usagef("--merge-deadline %v: at least 1m (how long the merge Job waits for the parts)", o.Deadline)
	}
	s, err := scenario.Load(file)
	if err != nil {
		return err
	}
	if s.Study.Precision > 0 {
		return usagef("%s sets study.precision (adaptive stopping), which cannot be split into parts: remove it and give --samples", file)
	}
	for _, e := range o.Extra {
		if e == "--precision" || strings.HasPrefix(e, "--precision=") || e == "--part" || strings.HasPrefix(e, "--part=") {
			return usagef("%s cannot be passed to the parts (the script sets --part auto; adaptive stopping cannot be split)", e)
		}
	}
	args := []string{}
	if o.Samples != "" {
		var v float64
		if _, err := fmt.Sscan(o.Samples, &v); err != nil || v < 1 || v > montecarlo.MaxSamples {
			return usagef("--samples %q: a whole number from 1 to %.0e (e.g. 1e9)", o.Samples, montecarlo.MaxSamples)
		}
		args = append(args, "--samples", o.Samples)
	}
	if o.SeedSet {
		args = append(args, "--seed", fmt.Sprint(o.Seed))
	}
	args = append(args, o.Extra...)
	switch engine {
	case "slurm":
		abs, err := filepath.Abs(file)
		if err != nil {
			return err
		}
		writeSlurm(o, abs, args)
	case "kubernetes", "k8s":
		writeKubernetes(o, file, args)
	default:
		return usagef("engine %q: allowed slurm or kubernetes", engine)
	}
	return nil
}

func writeSlurm(o *ClusterOptions, file string, args []string) {
	w := o.Out
	n := o.Parts
	run := []string{shq(o.Binary), "simulate", shq(file)}
	for _, a := range args {
		run = append(run, shq(a))
	}
	run = append(run, "--workers", "\"${SLURM_CPUS_PER_TASK:-1}\"", "--part", "auto", "--quiet")
	part := ""
	if o.Partition != "" {
		part = " --partition=" + shq(o.Partition)
	}
	fmt.Fprintf(w, `#!/usr/bin/env bash
# Written by 'boltrisk cluster-script slurm': %s in %d parts on a Slurm job
# array, then one merge job that starts only when every part succeeded
# (--dependency=afterok). Run it on a login node: bash THIS-FILE
# Parts write %s/part-K-of-%d.json (K = array index, 1 … %d); the merge writes
# %s beside this folder. Re-run a failed part alone with
#   sbatch --array=K …  (the same command); every part is reproducible.
set -euo pipefail
dir=%s
mkdir -p "$dir"
array=$(sbatch --parsable --job-name=boltrisk-part --array=1-%d --cpus-per-task=%d --time=%s%s \
  --chdir="$dir" --output=part-%%a.log <<'PART'
#!/usr/bin/env bash
set -euo pipefail
exec %s
PART
)
array=${array%%%%;*}
merge=$(sbatch --parsable --job-name=boltrisk-merge --dependency=afterok:"$array" --kill-on-invalid-dep=yes \
  --cpus-per-task=%d --time=%s%s --chdir="$dir" --output=merge.log <<'MERGE'
#!/usr/bin/env bash
set -euo pipefail
%s merge . --json --quiet > ../%s.tmp
mv ../%s.tmp ../%s
MERGE
)
echo "submitted array job $array (%d parts) and merge job ${merge%%%%;*} (after all parts succeed)"
`, filepath.Base(file), n, o.Dir, n, n, o.Result,
		shq(o.Dir), n, o.CPUs, shq(o.Time), part, strings.Join(run, " "),
		o.CPUs, shq(o.Time), part, shq(o.Binary), shq(o.Result), shq(o.Result), shq(o.Result), n)
}

func writeKubernetes(o *ClusterOptions, file string, args []string) {
	w := o.Out
	n := o.Parts
	mount := strings.TrimSuffix(o.Mount, "/")
	path := file
	if !filepath.IsAbs(path) {
		path = mount + "/" + filepath.ToSlash(filepath.Clean(file))
	}
	dir := mount + "/" + o.Dir
	cmd := []string{"boltrisk", "simulate", path}
	cmd = append(cmd, args...)
	cmd = append(cmd, "--workers", fmt.Sprint(o.CPUs), "--part", "auto", "--parts", fmt.Sprint(n), "--quiet")
	q := func(ss []string) string {
		var out []string
		for _, s := range ss {
			out = append(out, fmt.Sprintf("%q", s))
		}
		return "[" + strings.Join(out, ", ") + "]"
	}
	par := min(n, 64)
	fmt.Fprintf(w, `# Written by 'boltrisk cluster-script kubernetes': %s in %d parts as an
# Indexed Job (each pod's JOB_COMPLETION_INDEX 0 … %d is part index+1 of %d),
# and a merge Job that waits until all %d part files are on the shared volume
# (and fails after activeDeadlineSeconds if a part never arrives).
# Apply both: kubectl apply -f THIS-FILE. The claim %s (ReadWriteMany) holds the
# scenario at %s; parts land in %s, the merged result in %s/%s.
apiVersion: batch/v1
kind: Job
metadata:
  name: boltrisk-parts
spec:
  completionMode: Indexed
  completions: %d
  parallelism: %d
  backoffLimitPerIndex: 2
  template:
    spec:
      restartPolicy: Never
      containers:
        - name: part
          image: %s
          workingDir: %s
          command: %s
          resources:
            requests: {cpu: "%d"}
          volumeMounts: [{name: data, mountPath: %s}]
      volumes: [{name: data, persistentVolumeClaim: {claimName: %s}}]
---
apiVersion: batch/v1
kind: Job
metadata:
  name: boltrisk-merge
spec:
  backoffLimit: 2
  activeDeadlineSeconds: %d
  template:
    spec:
      restartPolicy: Never
      containers:
        - name: merge
          image: %s
          workingDir: %s
          command:
            - /bin/sh
            - -c
            - |
              until [ "$(ls part-*-of-%d.json 2>/dev/null | wc -l)" -ge %d ]; do sleep 15; done
              boltrisk merge . --json --quiet > ../%s.tmp && mv ../%s.tmp ../%s
          volumeMounts: [{name: data, mountPath: %s}]
      volumes: [{name: data, persistentVolumeClaim: {claimName: %s}}]
`, filepath.Base(file), n, n-1, n, n, o.Claim, path, dir, mount, o.Result,
		n, par, o.Image, dir, q(cmd), o.CPUs, mount, o.Claim,
		int64(o.Deadline.Seconds()), o.Image, dir, n, n, o.Result, o.Result, o.Result, mount, o.Claim)
}
