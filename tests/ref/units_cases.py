"""units_cases.py — unit conversions checked against GNU units.

Reference: GNU units (Debian package `units`, /usr/bin/units, checked with
version 2.22 and its /usr/share/units/definitions.units). Nobody here wrote
it; it is the outside source DESIGN.md section 3 names for conversions.

    units_cases.py list                 print the cases, one a line, tab separated:
                                        value, from, to, GNU from, GNU to
    units_cases.py run HEADROOM         convert every case with `HEADROOM convert
                                        "VALUE FROM" TO` and with GNU units, compare

Every conversion is sent to GNU units in ONE process (interactive mode reads
a `You have:` line and a `You want:` line per conversion from stdin); the
program under test is called once per case. A case passes when the two
values agree to 1.5e-9 relative: headroom prints 10 significant digits
(up to 5e-10 relative rounding) and the conversion itself must be good to
1e-9. No case has a zero result, so the comparison is purely relative.

How our names map onto GNU units' names (its definitions file differs from
ours in a few places, some of them traps):
  h       -> hr              GNU `h` is Planck's constant
  rad     -> radian          GNU `rad` is the radiation dose unit
  mrad    -> milliradian
  Btu     -> btu             GNU's btu is btu_IT, 1055.05585262 J, as ours
  psf     -> lbf/ft^2        not defined in GNU units
  ftH2O   -> ft*water        not defined in GNU units
  mH2O    -> m*water         GNU `mH2O` parses as milli-H2O, a pressure
                             gradient: a trap
  inH2O   -> inH2O           GNU `water` is gram force/cm^3: the conventional
                             column (1000 kg/m^3 under standard gravity), as ours
  delta_degC, delta_degF -> degC, degF   GNU degC/degF are differences
  a lone degC / degF     -> tempC(x) / tempF(x) and tempC / tempF (GNU's
                            nonlinear functions for points on the scales)
  degC, degF inside a compound -> degC, degF (differences in both programs)
"""

import math
import re
import subprocess
import sys

# ---- name mapping --------------------------------------------------------

GNU_NAME = {
    "h": "hr",
    "rad": "radian",
    "mrad": "milliradian",
    "Btu": "btu",
    "psf": "(lbf/ft^2)",
    "ftH2O": "(ft*water)",
    "mH2O": "(m*water)",
    "delta_degC": "degC",
    "delta_degF": "degF",
    "lpm": "(liter/min)",
    "l": "liter",
    "ppm": "ppm",
    "%": "percent",
}

NAME_RE = re.compile(r"(?:[A-Za-z_]|\u00b0|\u00b5|\u03bc)(?:[A-Za-z0-9_]|\u00b0|\u00b5|\u03bc)*")


def gnu_expr(expr):
    """A headroom unit expression in GNU units' spelling."""
    expr = expr.replace("\u00b7", "*").replace("\u00b2", "^2").replace("\u00b3", "^3")
    expr = expr.replace("\u00b0", "deg")

    def name(m):
        n = m.group(0)
        return GNU_NAME.get(n, n)

    # psi/100ft: our "100ft" is one factor, a hundred feet
    expr = re.sub(r"/100([A-Za-z_]+)", r"/(100 \1)", expr)
    if expr == "%":
        return "percent"
    return NAME_RE.sub(name, expr)


LONE_POINT_FROM = {"degC": "tempC({v})", "degF": "tempF({v})"}
LONE_POINT_TO = {"degC": "tempC", "degF": "tempF"}


def fmt(v):
    return "%.10g" % v


def case(v, frm, to):
    """One conversion: headroom's spelling and GNU's."""
    key = frm.replace("\u00b0", "deg")
    if key in LONE_POINT_FROM:
        gfrom = LONE_POINT_FROM[key].format(v=fmt(v))
    else:
        gfrom = "%s (%s)" % (fmt(v), gnu_expr(frm))
    tkey = to.replace("\u00b0", "deg")
    gto = LONE_POINT_TO.get(tkey) or gnu_expr(to)
    return (fmt(v), frm, to, gfrom, gto)


# ---- the cases ----------------------------------------------------------

VALUES = [1, 3.7, 0.0625, 1234.5, 2.5e-3, 7.25e4, 42, 0.3]

# Every unit of the registry except the temperature scales, each with the
# coherent SI spelling it converts to.
TO_SI = [
    ("m", "m"), ("cm", "m"), ("mm", "m"), ("km", "m"), ("in", "m"), ("ft", "m"), ("yd", "m"),
    ("mi", "m"),
    ("s", "s"), ("min", "s"), ("h", "s"),
    ("kg", "kg"), ("g", "kg"), ("lbm", "kg"), ("slug", "kg"),
    ("N", "N"), ("kN", "N"), ("lbf", "N"),
    ("Pa", "Pa"), ("kPa", "Pa"), ("MPa", "Pa"), ("bar", "Pa"), ("mbar", "Pa"), ("psi", "Pa"),
    ("psf", "Pa"), ("ksi", "Pa"), ("atm", "Pa"), ("ftH2O", "Pa"), ("inH2O", "Pa"), ("mH2O", "Pa"),
    ("L", "m^3"), ("mL", "m^3"), ("m^3", "m^3"), ("gal", "m^3"), ("ft^3", "m^3"), ("in^3", "m^3"),
    ("gpm", "m^3/s"), ("gal/min", "m^3/s"), ("cfs", "m^3/s"), ("ft^3/s", "m^3/s"),
    ("L/s", "m^3/s"), ("L/min", "m^3/s"), ("m^3/h", "m^3/s"),
    ("Pa*s", "Pa*s"), ("cP", "Pa*s"), ("P", "Pa*s"), ("lbf*s/ft^2", "Pa*s"),
    ("m^2/s", "m^2/s"), ("St", "m^2/s"), ("cSt", "m^2/s"), ("ft^2/s", "m^2/s"),
    ("J", "J"), ("kJ", "J"), ("Btu", "J"), ("W", "W"), ("kW", "W"), ("hp", "W"),
    ("delta_degC", "K"), ("delta_degF", "K"),
    ("rad", "deg"), ("deg", "rad"), ("percent", "1"),
    ("A", "A"), ("mol", "mol"), ("cd", "cd"), ("Hz", "1/s"),
]

# Units of one kind, every ordered pair converted.
GROUPS = [
    ["m", "cm", "mm", "km", "in", "ft", "yd", "mi", "\u00b5m"],
    ["Pa", "kPa", "MPa", "bar", "mbar", "psi", "psf", "ksi", "atm", "ftH2O", "inH2O", "mH2O"],
    ["L", "mL", "m^3", "gal", "ft^3", "in^3"],
    ["gal/min", "gpm", "cfs", "L/s", "L/min", "m^3/h", "m^3/s", "ft^3/s"],
    ["Pa*s", "cP", "P", "lbf*s/ft^2", "lbm/(ft*s)"],
    ["m^2/s", "St", "cSt", "ft^2/s"],
    ["J", "kJ", "Btu", "ft*lbf", "kW*h"],
    ["W", "kW", "hp", "Btu/h", "ft*lbf/s"],
    ["kg", "g", "lbm", "slug"],
    ["N", "kN", "lbf"],
    ["s", "min", "h"],
    ["kg/m^3", "lbm/ft^3", "g/cm^3", "slug/ft^3"],
    ["N/m^3", "lbf/ft^3", "kN/m^3"],
    ["m/s", "ft/s", "ft/min", "km/h", "mi/h"],
    ["m/s^2", "ft/s^2"],
]

# Points on the temperature scales: values chosen so no result is zero.
TEMP_POINTS = {
    "degC": [-40, 4, 20, 100],
    "degF": [-40, 39.2, 68, 212],
    "K": [233.15, 277.15, 373.15, 500],
    "degR": [419.67, 527.67, 671.67, 800],
}

# Temperature differences, and temperatures inside compounds.
DIFFERENCES = [
    ("delta_degF", "K"), ("delta_degC", "delta_degF"), ("delta_degF", "delta_degC"),
    ("delta_degC", "K"), ("delta_degF", "degR"),
    ("J/(kg*degC)", "Btu/(lbm*degF)"), ("Btu/(lbm*degF)", "J/(kg*K)"),
    ("W/(m*K)", "Btu/(h*ft*degF)"), ("degF/ft", "K/m"), ("kJ/(kg*degC)", "Btu/(lbm*degR)"),
]

# Compound and spelling cases the brief names, UTF-8 spellings, exponents.
SPECIAL = [
    ("lbf*s/ft^2", "Pa*s"), ("gal/min", "m^3/s"), ("psi", "ftH2O"), ("m^3/h", "gal/min"),
    ("cSt", "ft^2/s"), ("Btu", "ft*lbf"), ("N\u00b7m", "ft*lbf"), ("m\u00b3/h", "gal/min"),
    ("ft\u00b2", "m^2"), ("lbf\u00b7s/ft\u00b2", "cP"), ("s^-1", "Hz"), ("ft^-2", "m^-2"),
    ("1/min", "Hz"), ("(ft/s)^2", "m^2/s^2"), ("ft^(-3)", "L^-1"), ("kg/m/s", "cP"),
    ("lbm/ft^3*ft/s^2", "lbf/ft^3"), ("psi/ft", "kPa/m"), ("ft*lbf/s", "hp"),
    ("kPa*L/s", "hp"), ("psi*gal/min", "W"), ("lbf/in^2", "psi"), ("\u03bcm", "in"),
    ("um", "in"), ("ns", "s"), ("ms", "s"), ("Ms", "h"), ("GPa", "ksi"), ("MW", "hp"),
    ("MJ", "Btu"), ("mg", "lbm"), ("Mg", "lbm"), ("kHz", "Hz"), ("mmol", "mol"), ("kA", "A"),
    ("mK", "K"), ("cL", "mL"), ("dL", "L"), ("hL", "gal"), ("kbar", "psi"), ("mP", "cP"),
    ("hPa", "inH2O"), ("daN", "lbf"), ("dam", "ft"), ("Ym", "mi"), ("am", "m"), ("pm", "in"),
    ("fs", "s"), ("EJ", "Btu"), ("PPa", "psi"), ("TW", "hp"), ("nm", "m"), ("mrad", "deg"),
    ("deg", "rad"), ("percent", "1"), ("gpm", "L/s"), ("cfs", "gpm"), ("mH2O", "psi"),
    ("ftH2O", "kPa"), ("inH2O", "Pa"), ("slug", "lbm"), ("ksi", "MPa"), ("atm", "psi"),
]


# DESIGN 2.9: gauge and absolute pressures differ by the atmosphere, which
# `headroom convert` takes as the standard one (GNU units' `atm`, 101325 Pa).
# Each case: value, from, to, and the GNU expression of the same conversion.
REFERENCES = [
    (10, "psig", "psia", "(10 psi + atm)", "psi"),
    (0, "psig", "psia", "(0 psi + atm)", "psi"),
    (125, "psig", "kPaa", "(125 psi + atm)", "kPa"),
    (30, "psia", "psig", "(30 psi - atm)", "psi"),
    (5, "psia", "psig", "(5 psi - atm)", "psi"),
    (350, "kPag", "psia", "(350 kPa + atm)", "psi"),
    (2.5, "bara", "psig", "(2.5 bar - atm)", "psi"),
    (1.2, "MPaa", "kPag", "(1.2 MPa - atm)", "kPa"),
    (6, "barg", "kPaa", "(6 bar + atm)", "kPa"),
    (80, "psig", "bara", "(80 psi + atm)", "bar"),
    (400, "kPaa", "barg", "(400 kPa - atm)", "bar"),
    (12, "psi", "psia", "(12 psi + atm)", "psi"),    # a plain pressure is read as gauge
    (60, "psig", "kPag", "60 psi", "kPa"),          # gauge to gauge: no atmosphere
    (14.7, "psia", "MPaa", "14.7 psi", "MPa"),
    (40, "psig", "psi", "40 psi", "psi"),
]

# Rates, ratios and gradients per hundred lengths (issue 12).
RATES = [
    ("%", "1"), ("ppm", "1"), ("percent", "ppm"), ("psi/100ft", "kPa/m"), ("psi/100ft", "kPa/100m"),
    ("ft/100ft", "percent"), ("m/100m", "%"), ("kPa/100m", "psi/100ft"), ("lpm", "gal/min"),
    ("l/s", "gal/min"), ("lpm", "L/s"), ("ml", "in^3"), ("Btu/h", "W"),
]


def cases():
    out = []
    for v, frm, to, gfrom, gto in REFERENCES:
        out.append((fmt(v), frm, to, gfrom, gto))
    for frm, to in RATES:
        for v in (1, 3.7, 42):
            out.append(case(v, frm, to))
    vi = 0

    def value():
        nonlocal vi
        vi += 1
        return VALUES[vi % len(VALUES)]

    for frm, to in TO_SI:
        for k in range(3):
            out.append(case(VALUES[(3 * len(out) + k) % len(VALUES)], frm, to))
    for group in GROUPS:
        for a in group:
            for b in group:
                if a != b:
                    out.append(case(value(), a, b))
    for a, pts in TEMP_POINTS.items():
        for b in TEMP_POINTS:
            if a != b:
                for v in pts:
                    out.append(case(v, a, b))
    for v, a, b in [(20, "\u00b0C", "degF"), (68, "\u00b0F", "degC"), (100, "degC", "\u00b0F"),
                    (451, "\u00b0F", "K")]:
        out.append(case(v, a, b))
    for frm, to in DIFFERENCES:
        for v in (1, 18, 3.7):
            out.append(case(v, frm, to))
    for frm, to in SPECIAL:
        out.append(case(value(), frm, to))
    return out


# ---- running and comparing ----------------------------------------------

UNITS = "/usr/bin/units"
REL_TOL = 1.5e-9


def gnu_version():
    first = subprocess.run([UNITS, "--version"], capture_output=True, text=True).stdout
    return first.splitlines()[0].strip() if first else "unknown version"


def gnu_batch(cs):
    """All conversions through one GNU units process; per case on trouble."""
    text = "".join("%s\n%s\n" % (c[3], c[4]) for c in cs)
    res = subprocess.run([UNITS, "-t", "-d", "15"], input=text, capture_output=True, text=True)
    lines = res.stdout.splitlines()
    if len(lines) == len(cs) and all(_float(x) is not None for x in lines):
        return lines
    # An error line desynchronises the pairs: fall back to one call a case.
    return [subprocess.run([UNITS, "-t", "-d", "15", c[3], c[4]], capture_output=True,
                           text=True).stdout.strip() for c in cs]


def _float(s):
    try:
        x = float(s)
    except ValueError:
        return None
    return x if math.isfinite(x) else None


def shown(unit):
    """Display spellings a program may print for the unit as written."""
    norm = unit.replace("\u00b0", "deg").replace("\u00b7", "*")
    norm = norm.replace("\u00b2", "^2").replace("\u00b3", "^3")
    return {unit, norm}


def run(headroom):
    cs = cases()
    version = gnu_version()
    print("units-gnu: reference %s, %s cases" % (version, len(cs)))
    gnu = gnu_batch(cs)
    passed = failed = 0
    for c, g in zip(cs, gnu):
        v, frm, to, gfrom, gto = c
        p = subprocess.run([headroom, "convert", "%s %s" % (v, frm), to], capture_output=True,
                           text=True)
        out = p.stdout.strip()
        parts = out.split(None, 1)
        want = _float(g)
        got = _float(parts[0]) if parts else None
        why = None
        if want is None:
            why = "GNU units gave %r" % g
        elif p.returncode != 0 or got is None:
            why = "headroom exit %d: %r %r" % (p.returncode, out, p.stderr.strip()[:200])
        elif len(parts) < 2 or parts[1] not in shown(to):
            why = "unit shown as %r, want %r" % (parts[1] if len(parts) > 1 else "", to)
        elif not abs(got - want) <= REL_TOL * abs(want):
            why = "headroom %s, GNU units %s (rel diff %.2e)" % (
                parts[0], g, abs(got - want) / abs(want))
        if why:
            failed += 1
            print("FAIL %s %s -> %s  [GNU: %s -> %s]: %s" % (v, frm, to, gfrom, gto, why))
        else:
            passed += 1
    print("units-gnu: %d passed, %d failed" % (passed, failed))
    return 1 if failed or passed == 0 else 0


def main(argv):
    if len(argv) == 2 and argv[1] == "list":
        for c in cases():
            print("\t".join(c))
        return 0
    if len(argv) == 3 and argv[1] == "run":
        return run(argv[2])
    sys.stderr.write("usage: units_cases.py list | run HEADROOM\n")
    return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv))
