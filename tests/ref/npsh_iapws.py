"""npsh_iapws.py - npsh_available() of headroom against Debian's
python3-iapws (the version found is printed), through the real program.

NPSHa = (p_abs - p_vap)/(rho*g) + z - h_f, the definition of ANSI/HI 9.6.1
(Hydraulic Institute). The reference side computes every term itself:
  p_vap       iapws.iapws97._PSat_T(T) (IF97 region 4)
  rho         iapws.IAPWS97(T=T, P=p_atm).rho (IF97 region 1): the fluid is
              water(T), which headroom evaluates at the calc's atmosphere
  p_atm       the front matter's atmosphere, given or from the elevation by
              101325*(1 - 2.25577e-5*z)^5.25588 (U.S. Standard Atmosphere,
              1976, troposphere), written out here again
  p_abs       the surface pressure: absolute as given, or gauge + p_atm
  g           9.80665 m/s^2 (standard gravity, exact)
Tolerance 1e-11 relative: the same equations, so only rounding may differ
(at least 1e-9 m absolute, for a result near zero).

300 calcs, each one front matter and one npsh_available line, T uniform over
1..95 degC (and 1 K below boiling at the atmosphere), the surface pressure in psig, psia, kPag or kPaa, a flooded
suction or a lift, a suction loss of 0 to 3 m. Exit 1 on any failure."""
import json
import os
import random
import subprocess
import sys
import tempfile

import iapws
from iapws.iapws97 import _PSat_T, _TSat_P

from hydraulics_ref import Tally, headroom, num

N = 300
G = 9.80665
PSI = 0.45359237 * 9.80665 / 0.0254 ** 2
rng = random.Random(20261202)


def atmosphere(front):
    if "elevation" in front:
        return 101325.0 * (1.0 - 2.25577e-5 * front["elevation"]) ** 5.25588
    if "atmosphere" in front:
        return front["atmosphere"]
    return 101325.0


def main():
    tally = Tally("npsh-iapws")
    print("reference: python3-iapws %s (IAPWS97, iapws97._PSat_T)" % iapws.__version__)
    exe = headroom()
    with tempfile.TemporaryDirectory() as tmp:
        for i in range(N):
            kind = rng.choice(["elevation", "atmosphere", "standard"])
            front, fm = {}, ""
            if kind == "elevation":
                front["elevation"] = rng.uniform(-100.0, 3000.0)
                fm = "elevation: %s m\n" % num(front["elevation"])
            elif kind == "atmosphere":
                front["atmosphere"] = rng.uniform(70e3, 104e3)
                fm = "atmosphere: %s kPaa\n" % num(front["atmosphere"] / 1e3)
            p_atm = atmosphere(front)
            # liquid at the atmosphere: water(T) boils above T_sat(p_atm)
            T = rng.uniform(274.15, min(368.15, _TSat_P(p_atm / 1e6) - 1.0))
            unit = rng.choice(["psig", "psia", "kPag", "kPaa"])
            if unit == "psig":
                x = rng.uniform(-2.0, 30.0)
                p_abs = x * PSI + p_atm
            elif unit == "psia":
                x = rng.uniform(8.0, 45.0)
                p_abs = x * PSI
            elif unit == "kPag":
                x = rng.uniform(-10.0, 200.0)
                p_abs = x * 1e3 + p_atm
            else:
                x = rng.uniform(60.0, 300.0)
                p_abs = x * 1e3
            z = rng.uniform(-4.0, 8.0)
            hf = rng.uniform(0.0, 3.0)
            text = "---\n%s---\n# NPSH %d\n\n```calc\nw = water(%s K)\nN = npsh_available(%s %s, w, %s m, %s m)\n```\n" % (
                fm, i, num(T), num(x), unit, num(z), num(hf))
            path = os.path.join(tmp, "n.calc.md")
            with open(path, "w") as f:
                f.write(text)
            proc = subprocess.run([exe, "check", path, "--json"], stdout=subprocess.PIPE,
                                  stderr=subprocess.PIPE, timeout=60)
            try:
                doc = json.loads(proc.stdout.decode())
                got = doc["values"]["N"]["si"]
            except (ValueError, KeyError, TypeError):
                tally.failed += 1
                print("FAIL case %d: no result (%s)" % (i, proc.stderr.decode()[-300:]))
                continue
            rho = iapws.IAPWS97(T=T, P=p_atm / 1e6).rho
            pv = _PSat_T(T) * 1e6
            want = (p_abs - pv) / (rho * G) + z - hf
            what = "npsh_available(%r %s, water(%r K), %r m, %r m) at %r Pa" % (x, unit, T, z, hf, p_atm)
            if abs(want) < 1e-2:
                ok = abs(got - want) <= 1e-9
                tally.passed += ok
                tally.failed += not ok
            else:
                tally.check(what, got, want, 1e-11, "NPSHa")
            for d in doc.get("diagnostics", []):
                if d.get("severity") == "error" or want > 0:
                    tally.failed += 1
                    print("FAIL unexpected %s in case %d: %s" % (d.get("severity"), i, d.get("message")))
    tally.finish()


if __name__ == "__main__":
    main()
