"""Usage: /usr/bin/python3 testdata/bench/drivers_openturns.py [path/to/shared/bench]

FORM importance factors of the cover-flange separation event ("any of 8 bolts
separates": axial load shared, torque and nut factor per bolt; the cf8sep case of
shared/bench/rare_openturns.py) from OpenTURNS (Debian python3-openturns), an
independent FORM (Cobyla from the mean), grouped as boltrisk groups them: the
load, and the torque and nut factor of the bolt at the design point. The
values are the check values of TestDriversBenchFORM (montecarlo/decide).
"""
import os, sys
bench = sys.argv[1] if len(sys.argv) > 1 else os.path.join(os.path.dirname(__file__), "..", "..", "..", "shared", "bench")
sys.path.insert(0, os.path.abspath(bench))
import openturns as ot
import rare_openturns as ro

X, g = ro.cf8_sep()
Y = ot.CompositeRandomVector(g, ot.RandomVector(X))
ev = ot.ThresholdEvent(Y, ot.LessOrEqual(), 0.0)
opt = ot.Cobyla(); opt.setMaximumEvaluationNumber(20000); opt.setMaximumAbsoluteError(1e-6); opt.setMaximumConstraintError(1e-6)
ot.RandomGenerator.SetSeed(1)
form = ot.FORM(opt, ev, X.getMean()); form.run(); fr = form.getResult()
u = fr.getStandardSpaceDesignPoint()
beta = fr.getHasoferReliabilityIndex()
alpha2 = [ui * ui / (beta * beta) for ui in u]
bolt = max(range(8), key=lambda i: alpha2[9 + i])
print(f"beta {beta:.4f}")
print(f"alpha2 load {alpha2[0]:.4f} (u {u[0]:+.4f})")
print(f"alpha2 torque {alpha2[1 + bolt]:.4f} (u {u[1 + bolt]:+.4f})")
print(f"alpha2 nut_factor {alpha2[9 + bolt]:.4f} (u {u[9 + bolt]:+.4f})")
print(f"alpha2 other bolts {sum(alpha2) - alpha2[0] - alpha2[1 + bolt] - alpha2[9 + bolt]:.2e}")
