#!/usr/bin/env bash
# Rare-event estimators side by side with a general-purpose reliability
# library (shared/bench/rare_openturns.py, OpenTURNS' FORM + importance
# sampling and subset simulation) in one run on this machine: for each
# reference event the estimate over the exact value, the c.o.v., the model
# evaluations, evaluations·c.o.v.² (the evaluations a c.o.v. of 1 would take:
# lower is better) and the whole-process time.
#
#   bash testdata/bench/rare.sh [path/to/shared/bench]
#
# Needs Debian's python3-openturns, python3-numpy and python3-scipy.
set -euo pipefail
here=$(cd "$(dirname "$0")/../.." && pwd)
bench=${1:-$here/../shared/bench}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$here"
go build -o "$tmp/boltrisk" ./cmd/boltrisk
b="$tmp/boltrisk"
"$b" example bench-m12 | sed 's/mean: 120 N\*m/mean: 155 N*m/' >"$tmp/r1sep7.yaml"
"$b" example cover-flange | sed 's/mean: 16 kN/mean: 11.5 kN/' >"$tmp/cf8-115.yaml"

# ours: case method file modes exact
ours() {
	local name=$1 method=$2 file=$3 modes=$4 exact=$5 t0 t1
	t0=$(date +%s.%N)
	"$b" simulate "$file" --modes "$modes" --method "$method" --precision 5% --samples 1e8 --quiet --json >"$tmp/out.json"
	t1=$(date +%s.%N)
	/usr/bin/python3 - "$tmp/out.json" "$name" "$method" "$exact" "$t0" "$t1" <<'PY'
import json, sys
d = json.load(open(sys.argv[1])); name, method, exact = sys.argv[2], sys.argv[3], float(sys.argv[4])
t = float(sys.argv[6]) - float(sys.argv[5])
a = [m for m in d["modes"] if m["key"] == "any"][0]
cov = a["cov"] or float("nan")
print(f"  boltrisk {method:<10} {name:<8} P/exact {a['probability']/exact:6.3f}  c.o.v. {cov:6.3f}  evaluations {d['evaluations']:>10}  evals·cov² {d['evaluations']*cov*cov:9.1f}  {t:6.2f} s")
PY
}

echo "boltrisk (5 % c.o.v. target):"
bm="$tmp/bench-m12.yaml"; "$b" example bench-m12 >"$bm"
cf="$tmp/cf8.yaml"; "$b" example cover-flange >"$cf"
for m in importance subset; do
	ours r1sep7 $m "$tmp/r1sep7.yaml" separation 1.587891e-7
	ours r1any $m "$bm" fatigue,separation,proof 5.35727e-2
	ours cf8sep $m "$cf" separation 6.448169e-4
	ours cf8-115 $m "$tmp/cf8-115.yaml" separation 1.0127e-7
done
echo "OpenTURNS (shared/bench/rare_openturns.py; its own estimates and c.o.v.):"
(cd "$bench" && RARE_JSON="$tmp/ot.json" /usr/bin/python3 rare_openturns.py r1sep7 r1any cf8sep >/dev/null 2>&1) || true
/usr/bin/python3 - "$tmp/ot.json" <<'PY'
import json, sys, math
try:
    rows = json.load(open(sys.argv[1]))
except Exception as e:
    print("  (the reference script did not run:", e, ")"); sys.exit()
exact = {"r1sep7": 1.587891e-7, "r1any": 5.35727e-2, "cf8sep": 6.448169e-4}
for r in rows:
    case, meth = r.get("case"), r.get("method")
    pf, cov, ev = r.get("pf"), r.get("cov"), r.get("evals")
    if pf is None or ev is None:
        continue
    c = cov if isinstance(cov, (int, float)) and cov == cov else float("nan")
    print(f"  {meth:<28} {case:<8} P/exact {pf/exact.get(case, float('nan')):6.3f}  c.o.v. {c:6.3f}  evaluations {int(ev):>10}  evals·cov² {ev*c*c:9.1f}")
PY
