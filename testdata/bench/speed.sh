#!/usr/bin/env bash
# Side-by-side speed of the tool against its references on this machine
# (shared/bench README), in interleaved rounds (default 5), whole processes,
# wall-clock time; prints every round and the median of each, and the ratios
# of the medians. Absolute rates drift on shared machines (±20 % between
# minutes): compare ratios from one run of this script.
#
#   1. bench-m12 ("R1") at 10^7 samples: boltrisk with R1's three modes and
#      with all five active modes, against the plain Go loop (goloop) and the
#      vectorised NumPy script (r1_numpy.py).
#   2. cover-flange (8 bolts) at 5·10^6 samples, all five modes and
#      separation only, against the plain 8-bolt loop (goloop8): time ratio
#      goloop8/boltrisk, i.e. the tool's share of the loop's speed per bolt
#      evaluation.
#   3. compare of the cover-flange base and its two variants (oiled,
#      mos2-paste: 3 joints) at 10^6 samples against the three separate runs:
#      time ratio compare/(separate sum).
#
#   bash testdata/bench/speed.sh [rounds] [path/to/shared/bench]
#
# Needs Debian's python3-numpy for the NumPy reference (apt-get install -y python3-numpy).
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
rounds=${1:-5}
bench=${2:-$here/../shared/bench}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
for l in goloop goloop8; do
	cp -r "$bench/$l" "$tmp/$l"
	(cd "$tmp/$l" && go build -o "$l" .)
done
b="$tmp/boltrisk"
for v in oiled mos2-paste; do
	"$b" example cover-flange | sed "s/condition: dry /condition: $v /" >"$tmp/$v.yaml"
	grep -q "condition: $v " "$tmp/$v.yaml" || { echo "speed.sh: could not make the $v variant" >&2; exit 1; }
done

rate() { sed -n 's/.*(\([0-9.]*\) M samples\/s).*/\1/p; s/.*rate=\([0-9.]*\) M samples\/s.*/\1/p'; }
median() { tr ' ' '\n' | grep . | sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }
secs() { local t0 t1; t0=$(date +%s.%N); "$@" >/dev/null 2>&1; t1=$(date +%s.%N); awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.3f", b-a}'; }
n=10000000
n8=5000000
nc=1000000
ours3=() oursall=() loop=() numpy=() cfall=() cfsep=() l8=() cmp=() sep=()
echo "round: bench-m12 [R1 modes, all modes, goloop, NumPy] M samples/s | cover-flange s [all, separation, goloop8] | compare s [compare, separate]"
for r in $(seq "$rounds"); do
	ours3+=("$("$b" simulate --example bench-m12 --method crude --samples $n --modes fatigue,separation,proof --json 2>&1 >/dev/null | rate)")
	oursall+=("$("$b" simulate --example bench-m12 --method crude --samples $n --json 2>&1 >/dev/null | rate)")
	loop+=("$("$tmp/goloop/goloop" $n | rate)")
	numpy+=("$(/usr/bin/python3 "$bench/r1_numpy.py" $n | rate)")
	cfall+=("$(secs "$b" simulate --example cover-flange --method crude --samples $n8 --quiet --json)")
	cfsep+=("$(secs "$b" simulate --example cover-flange --method crude --samples $n8 --modes separation --quiet --json)")
	l8+=("$(secs "$tmp/goloop8/goloop8" $n8)")
	cmp+=("$(secs "$b" compare --example cover-flange --samples $nc --quiet --json)")
	sep+=("$(awk -v a="$(secs "$b" simulate --example cover-flange --method crude --samples $nc --quiet --json)" \
		-v c="$(secs "$b" simulate "$tmp/oiled.yaml" --method crude --samples $nc --quiet --json)" \
		-v d="$(secs "$b" simulate "$tmp/mos2-paste.yaml" --method crude --samples $nc --quiet --json)" 'BEGIN {printf "%.3f", a+c+d}')")
	echo "  round $r: ${ours3[-1]} ${oursall[-1]} ${loop[-1]} ${numpy[-1]} | ${cfall[-1]} ${cfsep[-1]} ${l8[-1]} | ${cmp[-1]} ${sep[-1]}"
done
m3=$(echo "${ours3[@]}" | median); mall=$(echo "${oursall[@]}" | median)
ml=$(echo "${loop[@]}" | median); mn=$(echo "${numpy[@]}" | median)
mcfa=$(echo "${cfall[@]}" | median); mcfs=$(echo "${cfsep[@]}" | median); ml8=$(echo "${l8[@]}" | median)
mcmp=$(echo "${cmp[@]}" | median); msep=$(echo "${sep[@]}" | median)
echo "medians:"
echo "  bench-m12, the three R1 modes + any: $m3 M samples/s"
echo "  bench-m12, all five active modes:    $mall M samples/s"
echo "  plain Go loop (goloop):              $ml M samples/s"
echo "  vectorised NumPy (r1_numpy.py):      $mn M samples/s"
awk -v a="$m3" -v b="$mall" -v l="$ml" -v p="$mn" 'BEGIN { printf "  ratio to goloop: %.2f (three modes), %.2f (all five)   ratio to NumPy: %.2f (three), %.2f (all five)\n", a/l, b/l, a/p, b/p }'
echo "  cover-flange $n8 samples: all modes $mcfa s, separation $mcfs s, goloop8 $ml8 s"
awk -v a="$mcfa" -v s="$mcfs" -v l="$ml8" 'BEGIN { printf "  speed per bolt evaluation relative to goloop8: %.2f (all five modes), %.2f (separation only)\n", l/a, l/s }'
awk -v c="$mcmp" -v s="$msep" 'BEGIN { printf "  compare of 3 joints (base and 2 variants): %.3f s vs 3 separate runs %.3f s: ratio %.2f\n", c, s, c/s }'
