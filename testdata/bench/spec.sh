#!/usr/bin/env bash
# Speed of 'boltrisk spec' (issue 13: target 1e-4 on cover-flange under 10 s,
# 1e-6 with a rare-event method under 30 s, on 2 cores), side by side with
# one simulate run of the same joint and samples (the unit a spec repeats),
# in interleaved rounds (default 3), whole processes, wall-clock seconds;
# prints every round and the medians. Measure while nothing else runs.
#
#   1. cover-flange (dry, torque wrench): no torque meets 1e-4 or 1e-6, so
#      spec runs its grid and then the preset sweep (8 changes).
#   2. the oiled variant: a window exists; spec bisects the window's edges
#      and the tolerance (the full callout).
#
#   bash testdata/bench/spec.sh [rounds]
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
rounds=${1:-3}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
b="$tmp/boltrisk"
"$b" example cover-flange | sed "s/condition: dry /condition: oiled /" >"$tmp/oiled.yaml"
grep -q "condition: oiled " "$tmp/oiled.yaml" || { echo "spec.sh: could not make the oiled variant" >&2; exit 1; }
median() { tr ' ' '\n' | grep . | sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
secs() { local t0 t1; t0=$(date +%s.%N); "$@" >/dev/null 2>&1; t1=$(date +%s.%N); awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.3f", b-a}'; }
sim=() s4=() s6=() o4=() o6=()
echo "cores: $(nproc); round: simulate 1e6 crude | spec cover-flange 1e-4 crude, 1e-6 importance | spec oiled 1e-4 crude, 1e-6 importance (s)"
for r in $(seq "$rounds"); do
	sim+=("$(secs "$b" simulate --example cover-flange --method crude --samples 1e6 --quiet --json)")
	s4+=("$(secs "$b" spec --example cover-flange --target 1e-4 --quiet --json)")
	s6+=("$(secs "$b" spec --example cover-flange --target 1e-6 --method importance --quiet --json)")
	o4+=("$(secs "$b" spec "$tmp/oiled.yaml" --target 1e-4 --quiet --json)")
	o6+=("$(secs "$b" spec "$tmp/oiled.yaml" --target 1e-6 --method importance --quiet --json)")
	echo "  round $r: ${sim[-1]} | ${s4[-1]} ${s6[-1]} | ${o4[-1]} ${o6[-1]}"
done
echo "median: simulate $(echo "${sim[*]}" | median) s | spec cover-flange 1e-4 $(echo "${s4[*]}" | median) s, 1e-6 (importance) $(echo "${s6[*]}" | median) s | spec oiled 1e-4 $(echo "${o4[*]}" | median) s, 1e-6 (importance) $(echo "${o6[*]}" | median) s"
"$b" spec "$tmp/oiled.yaml" --target 1e-4 --quiet --json | sed -n 's/.*"runs": \([0-9]*\).*/  runs of the oiled 1e-4 spec: \1/p'
