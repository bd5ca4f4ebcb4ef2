"""friction_fluids.py - Darcy friction factors of headroom against Debian's
python3-fluids 1.0.22 (fluids.friction), through the real program.

Families (1000 points each, Re log-uniform over each correlation's range,
relative roughness log-uniform 1e-6..0.05 plus smooth pipe where allowed):
  colebrook   vs fluids.friction.Colebrook       rel 1e-10 (both solve the
              same equation to rounding; fluids uses a Lambert-W closed form)
  swamee_jain vs fluids.friction.Swamee_Jain_1976 rel 2e-5 (fluids writes
              5.74/Re^0.9 as (6.97/Re)^0.9, 6.97^0.9 = 5.7398, a 3.5e-5
              change of that term)
  haaland     vs fluids.friction.Haaland          rel 1e-12 (same formula)
  churchill   vs fluids.friction.Churchill_1977   rel 1e-12 (same formula),
              Re 10..1e8 (all regimes)
  clamond     headroom's colebrook vs fluids.friction.Clamond rel 4e-15
              (both are Clamond's 2009 two-step solution of Colebrook's
              equation, so they agree to rounding, not just to the 1e-10
              of the Lambert-W form)
Inside each range the program must give no diagnostic at all."""
import math
import random

import fluids
import fluids.friction as F

from hydraulics_ref import Tally, num, run_calc, si

N = 1000
rng = random.Random(20240611)


def log_uniform(lo, hi):
    return math.exp(rng.uniform(math.log(lo), math.log(hi)))


FAMILIES = [
    # label, headroom function, reference, Re range, allow rr = 0, tolerance
    ("colebrook", "colebrook", F.Colebrook, (4000.0, 1e8), True, 1e-10),
    ("swamee_jain", "swamee_jain", F.Swamee_Jain_1976, (5000.0, 1e8), False, 2e-5),
    ("haaland", "haaland", F.Haaland, (4000.0, 1e8), False, 1e-12),
    ("churchill", "churchill", F.Churchill_1977, (10.0, 1e8), True, 1e-12),
    ("clamond", "colebrook", F.Clamond, (4000.0, 1e8), True, 4e-15),
]


def main():
    tally = Tally("friction-fluids")
    print("reference: python3-fluids %s (fluids.friction)" % fluids.__version__)
    statements, expected = [], []
    for fam, fn, ref, (re_lo, re_hi), smooth, tol in FAMILIES:
        for i in range(N):
            Re = log_uniform(re_lo, re_hi)
            rr = 0.0 if (smooth and i % 10 == 0) else log_uniform(1e-6, 0.05)
            if fam == "churchill" and 2000.0 <= Re < 4000.0:
                Re = 4000.0 + Re        # stay out of the flagged transition zone
            name = "%s_%d" % (fam, i)
            statements.append("%s = %s(%s, %s)" % (name, fn, num(Re), num(rr)))
            expected.append((name, fam, Re, rr, ref(Re, rr), tol))
    values, diags = run_calc(statements, "friction factors against python3-fluids")
    for name, fam, Re, rr, want, tol in expected:
        tally.check("%s(Re=%r, rr=%r)" % (fam, Re, rr), si(values, name), want, tol, fam)
    for d in diags:
        tally.failed += 1
        print("FAIL unexpected %s at line %s: %s" % (d.get("severity"), d.get("line"), d.get("message")))
    tally.finish()


if __name__ == "__main__":
    main()
