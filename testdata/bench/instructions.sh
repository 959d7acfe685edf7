#!/usr/bin/env bash
# Instruction counts (callgrind) instead of seconds: repeatable whatever else
# the machine is doing, for A/B work on the hot loop and for the README's
# compare figure.
#
#   1. instructions per sample of one worker on the cover-flange chunks
#      (BenchmarkChunkCoverFlange at 20 and 60 chunks; the difference over
#      40·16384 samples removes the set-up);
#   2. compare of the cover-flange base and its two variants against the
#      three separate simulate runs, whole processes, one worker, 3·10⁵
#      samples: ratio compare/(sum of the three).
#
#   bash testdata/bench/instructions.sh
#
# Needs valgrind. GODEBUG=asyncpreemptoff=1 keeps Go's preemption signals
# away from callgrind, which otherwise aborts.
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
go test -c -o "$tmp/mc.test" ./montecarlo/
refs() {
	GODEBUG=asyncpreemptoff=1 GOMAXPROCS=1 valgrind --tool=callgrind --callgrind-out-file=/dev/null "$@" >/dev/null 2>"$tmp/cg.err"
	sed -n 's/.*refs: *\([0-9,]*\).*/\1/p' "$tmp/cg.err" | tr -d ,
}
a=$(refs "$tmp/mc.test" -test.run '^$' -test.bench ChunkCoverFlange -test.benchtime 20x)
b=$(refs "$tmp/mc.test" -test.run '^$' -test.bench ChunkCoverFlange -test.benchtime 60x)
awk -v a="$a" -v b="$b" 'BEGIN { printf "cover-flange, one worker: %.0f instructions per sample (8 bolts)\n", (b-a)/(40*16384) }'
b0="$tmp/boltrisk"
for v in oiled mos2-paste; do
	"$b0" example cover-flange | sed "s/condition: dry /condition: $v /" >"$tmp/$v.yaml"
done
n=300000
c=$(refs "$b0" compare --example cover-flange --samples $n --workers 1 --quiet --json)
s1=$(refs "$b0" simulate --example cover-flange --method crude --samples $n --workers 1 --quiet --json)
s2=$(refs "$b0" simulate "$tmp/oiled.yaml" --method crude --samples $n --workers 1 --quiet --json)
s3=$(refs "$b0" simulate "$tmp/mos2-paste.yaml" --method crude --samples $n --workers 1 --quiet --json)
awk -v c="$c" -v s="$((s1 + s2 + s3))" 'BEGIN { printf "compare of 3 joints: %.3g instructions against %.3g for 3 separate runs: ratio %.2f\n", c, s, c/s }'
