"""hydraulics_hand.py - Hazen-Williams, pumps, surge and PVC ratings of
headroom, through the real program, against forms worked independently here.

Families (1000 points each unless said):
  hazen_williams  the SI form the program uses against the US form
                  h_f = 4.52*Q^1.852/(C^1.852*d^4.87) psi/ft (Q gal/min,
                  d in; NFPA 13's statement of Hazen-Williams, from memory),
                  converted with water at 60 degF (999.0 kg/m^3, from
                  memory): rel 2e-3, the rounding of 4.52, 4.87 and 10.67
                  over d = 0.5..24 in
  operating_point Q from the three points by Lagrange interpolation and the
                  textbook quadratic formula in Python: rel 1e-9
  surge           Joukowsky rho*a*dV worked in Python: rel 1e-12
  pvc_sdr         ASTM D2241 PVC 1120 pressure classes at 73.4 degF, SDR
                  21, 26, 32.5 -> 200, 160, 125 psi (Hydraulic Institute
                  Engineering Data Book, Section IV, Table 4.E.2, "Pressure
                  Class"): the record's p_class exactly, and its unrounded
                  p = 2*2000/(SDR - 1) to rel 1e-9 (3 points: the classes
                  the pipe table holds)
"""
import math
import random

from hydraulics_ref import Tally, num, run_calc, si

N = 1000
rng = random.Random(1905)
INCH, FT, PSI = 0.0254, 0.3048, 6894.757293168361
GPM = 231.0 * INCH ** 3 / 60.0
G = 9.80665


def main():
    tally = Tally("hydraulics-hand")
    print("reference: published forms worked in Python (no outside library covers these)")
    st, checks = [], []
    for i in range(N):
        q = math.exp(rng.uniform(math.log(5.0), math.log(5000.0)))
        d = math.exp(rng.uniform(math.log(0.5), math.log(24.0)))
        c = rng.uniform(90.0, 150.0)
        L = rng.uniform(10.0, 1000.0)
        name = "hw_%d" % i
        st.append("%s = hazen_williams(%s gal/min, %s, %s in, %s ft)" % (name, num(q), num(c), num(d), num(L)))
        us_psi = 4.52 * q ** 1.852 / (c ** 1.852 * d ** 4.87) * L
        checks.append(("hazen_williams", name, None, lambda h: 999.0 * G * h / PSI, us_psi, 2e-3))
    for i in range(N):
        q2 = rng.uniform(5.0, 20.0)
        q3 = q2 + rng.uniform(5.0, 20.0)
        h1 = rng.uniform(20.0, 80.0)
        h2 = h1 * rng.uniform(0.85, 0.98)
        h3 = h2 * rng.uniform(0.6, 0.9)
        hs = rng.uniform(0.0, 0.8) * h1
        k = rng.uniform(0.02, 0.3)                     # m per (L/s)^2
        pname, oname = "p_%d" % i, "op_%d" % i
        st.append("%s = pump_curve(0 L/s, %s m, %s L/s, %s m, %s L/s, %s m)"
                  % (pname, num(h1), num(q2), num(h2), num(q3), num(h3)))
        # k written as a quotient of two quantities: `X m/(L/s)^2` after a number
        # is read by the lexer as (X m/(L/s))^2 (reported upstream)
        st.append("%s = operating_point(%s, %s m, %s m/(1 L/s)^2)" % (oname, pname, num(hs), num(k)))
        # Lagrange coefficients of H(Q) = a + b Q + c Q^2 through (0,h1),(q2,h2),(q3,h3)
        a = h1
        c_ = (h3 - h1) / (q3 * (q3 - q2)) - (h2 - h1) / (q2 * (q3 - q2))
        b = (h2 - h1) / q2 - c_ * q2
        A, B, C = c_ - k, b, a - hs
        disc = B * B - 4 * A * C
        roots = [(-B + s * math.sqrt(disc)) / (2 * A) for s in (1, -1)] if disc >= 0 else []
        qop = max([r for r in roots if r >= 0], default=None)
        checks.append(("operating_point", oname, "Q", lambda x: x * 1000.0, qop, 1e-9))
    for i in range(N):
        rho, a, dv = rng.uniform(950.0, 1000.0), rng.uniform(300.0, 1450.0), rng.uniform(-3.0, 3.0)
        name = "dp_%d" % i
        st.append("%s = surge(%s kg/m^3, %s m/s, %s m/s)" % (name, num(rho), num(a), num(dv)))
        checks.append(("surge", name, None, lambda x: x, rho * a * dv, 1e-12))
    for sdr, rating in ((21.0, 200.0), (26.0, 160.0), (32.5, 125.0)):
        od = 6.625
        name = "r_sdr_%d" % int(sdr * 10)
        st.append('%s_pipe = pipe("ASTM D2241", "6", "SDR %s")' % (name, ("%g" % sdr)))
        st.append("%s = pressure_rating(%s_pipe, 73.4 degF)" % (name, name))
        checks.append(("pvc_sdr", name, "p_class", lambda x: x / PSI, rating, 1e-12))
        checks.append(("pvc_sdr", name, "p", lambda x: x / PSI, 2 * 2000.0 / (sdr - 1.0), 1e-9))
    values, diags = run_calc(st, "hand-worked hydraulics")
    for fam, name, field, conv, want, tol in checks:
        got = si(values, name, field)
        if want is None:
            tally.failed += 1
            print("FAIL %s: the Python side found no intersection" % name)
            continue
        tally.check("%s %s" % (fam, name), conv(got) if got is not None else None, want, tol, fam)
    for d in diags:
        if d.get("severity") == "error":
            tally.failed += 1
            print("FAIL unexpected error at line %s: %s" % (d.get("line"), d.get("message")))
    tally.finish()


if __name__ == "__main__":
    main()
