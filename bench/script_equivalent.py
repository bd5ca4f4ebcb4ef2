"""script_equivalent.py — the 5,000-statement benchmark calc written the way
an engineer would script it in Python: pint for units, python3-fluids for the
friction factor, python3-iapws for water, scipy's brentq for the solve.

It computes the same quantities as build/bench/check5000.calc.md (generated
by bench.py) and prints the checks, so the two runs do the same work. Run by
bench.py with /usr/bin/python3; the time includes importing the libraries,
as running the script does.
"""
import sys

import pint
from fluids.friction import friction_factor
from iapws import IAPWS97
from iapws._iapws import _Viscosity
from scipy.optimize import brentq

u = pint.UnitRegistry()
Q_ = u.Quantity


def water(T):
    """Density and viscosity at T (a pint temperature), 101.325 kPa."""
    TK = T.to(u.kelvin).magnitude
    w = IAPWS97(T=TK, P=0.101325)
    return Q_(w.rho, "kg/m^3"), Q_(_Viscosity(w.rho, TK), "Pa*s")


def main():
    holds = fails = 0
    g = Q_(9.80665, "m/s^2")
    for b in range(50):
        Q = Q_(50 + b, "gal/min")
        D = Q_(2 + (b % 5) * 0.5, "inch")
        T = Q_(50 + b % 30, u.degF)
        rho, mu = water(T)
        A = 3.141592653589793 * D ** 2 / 4
        V = (Q / A).to("ft/s")
        Re = (rho * V * D / mu).to("dimensionless").magnitude
        f = friction_factor(Re, eD=(Q_(0.00005, "inch") / D).to("").magnitude)
        L = Q_(100, "ft")
        h = (f * (L / D) * V ** 2 / (2 * g)).to("ft")

        def residual(L_ft):
            Lq = Q_(L_ft, "ft")
            return (f * (Lq / D) * V ** 2 / (2 * g)).to("ft").magnitude - 20.0

        brentq(residual, 1e-3, 1e6, xtol=1e-12)
        for k in range(87):
            _ = h * (k + 1) + Q_(k, "ft")
        holds += h <= Q_(100, "ft")
        holds += V <= Q_(10, "ft/s")
        fails += (h > Q_(100, "ft")) + (V > Q_(10, "ft/s"))
    print(f"script: {holds} hold, {fails} fail")
    return 0


sys.exit(main())
