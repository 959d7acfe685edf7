#!/usr/bin/env bash
# Side-by-side speed of reference case R1 (shared/bench README) on this
# machine, in one run: boltrisk's runner, the plain Go loop and the vectorised
# NumPy script, each at 10^7 samples, then the ratios. Absolute rates drift on
# shared machines; the ratios are what to compare.
#
#   bash testdata/bench/speed.sh [path/to/shared/bench]
#
# Needs Debian's python3-numpy for the NumPy reference (apt-get install -y python3-numpy).
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
bench=${1:-$here/../shared/bench}
n=10000000
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
cp -r "$bench/goloop" "$tmp/goloop"
(cd "$tmp/goloop" && go build -o goloop .)

rate() { sed -n 's/.*(\([0-9.]*\) M samples\/s).*/\1/p; s/.*rate=\([0-9.]*\) M samples\/s.*/\1/p'; }
ours3=$("$tmp/boltrisk" simulate --example r1 --samples $n --modes fatigue,separation,proof --json 2>&1 >/dev/null | rate)
oursall=$("$tmp/boltrisk" simulate --example r1 --samples $n --json 2>&1 >/dev/null | rate)
loop=$("$tmp/goloop/goloop" $n | rate)
numpy=$(/usr/bin/python3 "$bench/r1_numpy.py" $n | rate)
echo "R1 at $n samples, M samples/s on $(nproc) cores:"
echo "  boltrisk, the three R1 modes + any: $ours3"
echo "  boltrisk, all five active modes:    $oursall"
echo "  plain Go loop (goloop):             $loop"
echo "  vectorised NumPy (r1_numpy.py):     $numpy"
awk -v a="$ours3" -v l="$loop" -v p="$numpy" 'BEGIN { printf "  ratio to goloop: %.2f   ratio to NumPy: %.2f\n", a/l, a/p }'
