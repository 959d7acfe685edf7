#!/usr/bin/env bash
# Peak resident memory of a simulate run at 10^6, 10^7 and 10^8 samples
# (reference case R1): the runner keeps tallies and histograms, never the
# samples, so the peak must not grow with the sample count.
#
#   bash testdata/bench/memory.sh
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
for n in 1e6 1e7 1e8; do
  kb=$( { /usr/bin/time -f '%M' "$tmp/boltrisk" simulate --example bench-m12 --samples $n --quiet --json >/dev/null; } 2>&1 | tail -1)
  echo "samples $n: peak RSS $((kb / 1024)) MiB"
done
