"""water_iapws.py - water() of headroom against Debian's python3-iapws
(1.5.x; the version found is printed), through the real program.

1000 states, T uniform over 0.01..150 degC, p either the default one
atmosphere (below 99 degC) or log-uniform from 1 % above saturation to
100 MPa. Families:
  rho, mu, K  vs iapws.IAPWS97 (IF97 region 1 density and speed of sound,
              K = rho*w^2; viscosity by the IAPWS 2008 release at the IF97
              density, mu2 = 1): rel 1e-11 - the same equations, so only
              rounding may differ
  p_vap       vs iapws.iapws97._PSat_T (IF97 region 4): rel 1e-11
  rho95, mu95 vs iapws.IAPWS95 (the scientific formulation, a different
              equation of state): IF97 is consistent with IAPWS-95 in
              region 1 to 0.01 % in density here (measured worst 2e-5; the
              IF97 release's permissible difference for v is +-0.05 %, from
              memory); viscosity then agrees to 1e-4
Every state is inside the served range, so no diagnostic may appear."""
import math
import random

import iapws
from iapws.iapws97 import _PSat_T

from hydraulics_ref import Tally, num, run_calc, si

N = 1000
rng = random.Random(19970901)


def main():
    tally = Tally("water-iapws")
    print("reference: python3-iapws %s (IAPWS97, IAPWS95, iapws97._PSat_T)" % iapws.__version__)
    statements, states = [], []
    for i in range(N):
        T = rng.uniform(273.16, 423.15)
        ps = _PSat_T(T) * 1e6
        name = "w_%d" % i
        if T < 372.0 and i % 3 == 0:
            p = 101325.0
            statements.append("%s = water(%s K)" % (name, num(T)))
        else:
            p = math.exp(rng.uniform(math.log(max(1.01 * ps, 1e3)), math.log(100e6)))
            statements.append("%s = water(%s K, %s kPaa)" % (name, num(T), num(p / 1e3)))
        states.append((name, T, p, ps))
    values, diags = run_calc(statements, "water properties against python3-iapws")
    for name, T, p, ps in states:
        ref = iapws.IAPWS97(T=T, P=p / 1e6)
        what = "water(T=%r K, p=%r Pa)" % (T, p)
        tally.check(what + ".rho", si(values, name, "rho"), ref.rho, 1e-11, "rho IF97")
        tally.check(what + ".mu", si(values, name, "mu"), ref.mu, 1e-11, "mu IAPWS 2008")
        tally.check(what + ".K", si(values, name, "K"), ref.rho * ref.w ** 2, 1e-11, "K = rho*w^2 IF97")
        tally.check(what + ".p_vap", si(values, name, "p_vap"), ps, 1e-11, "p_vap IF97 region 4")
        ref95 = iapws.IAPWS95(T=T, P=p / 1e6)
        tally.check(what + ".rho vs IAPWS-95", si(values, name, "rho"), ref95.rho, 1e-4, "rho vs IAPWS-95")
        tally.check(what + ".mu vs IAPWS-95", si(values, name, "mu"), ref95.mu, 1e-4, "mu vs IAPWS-95")
    for d in diags:
        tally.failed += 1
        print("FAIL unexpected %s at line %s: %s" % (d.get("severity"), d.get("line"), d.get("message")))
    tally.finish()


if __name__ == "__main__":
    main()
