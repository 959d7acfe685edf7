#!/usr/bin/env bash
# Side-by-side speed of reference case R1 (shared/bench README) on this
# machine: boltrisk's runner, the plain Go loop and the vectorised NumPy
# script, each at 10^7 samples, run in interleaved rounds (default 5). Prints
# every round and the median rate of each program with the ratios of the
# medians. Absolute rates drift on shared machines (±20 % between minutes);
# compare ratios from one run of this script.
#
#   bash testdata/bench/speed.sh [rounds] [path/to/shared/bench]
#
# Needs Debian's python3-numpy for the NumPy reference (apt-get install -y python3-numpy).
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
rounds=${1:-5}
bench=${2:-$here/../shared/bench}
n=10000000
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
cp -r "$bench/goloop" "$tmp/goloop"
(cd "$tmp/goloop" && go build -o goloop .)

rate() { sed -n 's/.*(\([0-9.]*\) M samples\/s).*/\1/p; s/.*rate=\([0-9.]*\) M samples\/s.*/\1/p'; }
median() { tr ' ' '\n' | grep . | sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
ours3=() oursall=() loop=() numpy=()
echo "R1 at $n samples, M samples/s on $(nproc) cores; round: R1 modes, all modes, goloop, NumPy"
for r in $(seq "$rounds"); do
	ours3+=("$("$tmp/boltrisk" simulate --example bench-m12 --samples $n --modes fatigue,separation,proof --json 2>&1 >/dev/null | rate)")
	oursall+=("$("$tmp/boltrisk" simulate --example bench-m12 --samples $n --json 2>&1 >/dev/null | rate)")
	loop+=("$("$tmp/goloop/goloop" $n | rate)")
	numpy+=("$(/usr/bin/python3 "$bench/r1_numpy.py" $n | rate)")
	echo "  round $r: ${ours3[-1]}  ${oursall[-1]}  ${loop[-1]}  ${numpy[-1]}"
done
m3=$(echo "${ours3[@]}" | median)
mall=$(echo "${oursall[@]}" | median)
ml=$(echo "${loop[@]}" | median)
mn=$(echo "${numpy[@]}" | median)
echo "medians:"
echo "  boltrisk, the three R1 modes + any: $m3"
echo "  boltrisk, all five active modes:    $mall"
echo "  plain Go loop (goloop):             $ml"
echo "  vectorised NumPy (r1_numpy.py):     $mn"
awk -v a="$m3" -v l="$ml" -v p="$mn" 'BEGIN { printf "  ratio to goloop: %.2f   ratio to NumPy: %.2f\n", a/l, a/p }'
