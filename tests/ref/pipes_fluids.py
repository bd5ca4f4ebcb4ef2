"""pipes_fluids.py — pipe dimensions and roughness checked against fluids.

Reference: python3-fluids 1.0.22 (Debian package python3-fluids, modules
fluids.piping and fluids.friction, imported by /usr/bin/python3; the version
in use is printed). Nobody here wrote it; our tables (src/methods/
pipetab.def) were typed from the standards and fluids is the independent
check. Nothing is copied from fluids into src/.

What fluids has, and what is compared (od, id and wall of every row of ours
that fluids also tabulates, each row asked four ways: canonical spelling,
size as a number, the short name of the standard, and a class spelling such
as "Sch 40" / "SDR21" / "std" — so the spellings pipe() accepts are checked
against the same reference):

  ASME B36.10M  fluids.piping NPS10/S10o/S10t, NPS40, NPS80, NPS160,
                NPSSTD, NPSXS tables. fluids keeps the standard's METRIC
                columns (od to 0.1 mm, e.g. 1/8 in od 10.3 mm, and above
                NPS 16 to the whole mm, 18 in 457 and 24 in 610 mm; wall to
                0.01 mm); we keep the inch columns. Tolerance: wall within
                0.005 mm, od within 0.05 mm through NPS 16 and 0.5 mm above
                (half the metric column's last digit), id within the od
                tolerance plus 0.01 mm; plus 1e-12 m.
  ASTM D1785    NPS_D1785, S40o_D1785/S40t_D1785, S80..._D1785. fluids keeps
                inch values times 25.4: tolerance 1e-9 m.
  ASTM F441     NPS_F441, S40o_F441IPS ..., S80..._F441IPS: 1e-9 m.
  ASTM D2241    NPS_D2241, SDR21o_D2241/SDR21t_D2241, SDR26..., SDR325...:
                1e-9 m.
  Rows fluids has and we do not, left out by the explicit rule in
  cases() (never by asking headroom): plastic sizes above NPS 12 (fluids
  runs D1785 and D2241 to 24 and F441 to 16; our tables stop at 12).
  ASTM B88, ASTM F876   fluids has no copper water tube or PEX tubing table:
                not compared here; tests/unit/test_pipes.c holds every row
                to published copies (B88: the Hydraulic Institute
                Engineering Data Book's B88 table and the Copper Tube
                Handbook, Table 14.2f; F876: the Pipe Fitter's Calculator
                PEX tubing chart) and to their own rules (od = nominal +
                1/8 in; wall = od/9, not less than 0.070 in).
  roughness()   against fluids.friction.material_roughness for the Moody
                rows fluids also lists (its values are Moody's feet figures
                rounded to three digits in metres): tolerance 0.5 %.

Bad input (the real program only): a calc file with one unknown size, class
or standard must stop with exit status 2 and a `file:line:col: error:`
line at the offending argument that lists what the standard has.

    pipes_fluids.py run HEADROOM
"""

import math
import os
import re
import subprocess
import sys
import tempfile

import fluids
import fluids.friction as fr
import fluids.piping as fp

from fittings_route import require_cli, run_cli, si

IN = 0.0254

STEEL = {"10": "S10", "40": "S40", "80": "S80", "160": "S160", "STD": "STD", "XS": "XS"}
STEEL_NPS = {"10": "NPS10", "40": "NPS40", "80": "NPS80", "160": "NPS160", "STD": "NPSSTD",
             "XS": "NPSXS"}

# Our size spelling for each nominal size.
SIZES = {0.125: "1/8", 0.25: "1/4", 0.375: "3/8", 0.5: "1/2", 0.75: "3/4", 1: "1", 1.25: "1-1/4",
         1.5: "1-1/2", 2: "2", 2.5: "2-1/2", 3: "3", 3.5: "3-1/2", 4: "4", 5: "5", 6: "6", 8: "8",
         10: "10", 12: "12"}
SIZES.update({14: "14", 16: "16", 18: "18", 20: "20", 24: "24"})


def fluids_tables():
    """(standard, class) -> (nps list, od mm list, wall mm list, steel?)"""
    t = {}
    for c, pre in STEEL.items():
        t[("ASME B36.10M", c)] = (getattr(fp, STEEL_NPS[c]), getattr(fp, pre + "o"),
                                  getattr(fp, pre + "t"), True)
    t[("ASTM D1785", "40")] = (fp.NPS_D1785, fp.S40o_D1785, fp.S40t_D1785, False)
    t[("ASTM D1785", "80")] = (fp.NPS_D1785, fp.S80o_D1785, fp.S80t_D1785, False)
    t[("ASTM F441", "40")] = (fp.NPS_F441, fp.S40o_F441IPS, fp.S40t_F441IPS, False)
    t[("ASTM F441", "80")] = (fp.NPS_F441, fp.S80o_F441IPS, fp.S80t_F441IPS, False)
    for c, n in (("SDR 21", "21"), ("SDR 26", "26"), ("SDR 32.5", "325")):
        o = getattr(fp, "SDR%so_D2241" % n)
        w = getattr(fp, "SDR%st_D2241" % n)
        # the SDR lists are the tail of NPS_D2241 (its small sizes are other SDRs)
        t[("ASTM D2241", c)] = (fp.NPS_D2241[len(fp.NPS_D2241) - len(w):], o, w, False)
    return t


SHORT = {"ASME B36.10M": "b36.10m", "ASTM D1785": "D1785", "ASTM F441": "f441",
         "ASTM D2241": "D2241"}
CLASS_ALT = {"40": "Sch 40", "80": "schedule 80", "10": "sch10", "160": "Sch 160", "STD": "std",
             "XS": "xs", "SDR 21": "SDR21", "SDR 26": "sdr 26", "SDR 32.5": "32.5"}


class Case:
    def __init__(self, std, size_expr, size_text, cls_expr, cls_text, od, wall, steel, nps, how):
        self.std, self.size_expr, self.size_text = std, size_expr, size_text
        self.cls_expr, self.cls_text = cls_expr, cls_text
        self.od, self.wall, self.id = od, wall, od - 2 * wall
        od_tol = 0.05e-3 if nps <= 16 else 0.5e-3
        self.tol = (od_tol, od_tol + 0.01e-3, 0.005e-3) if steel else (1e-9, 1e-9, 1e-9)
        self.how = how

    def expr(self):
        return 'pipe("%s", %s, %s)' % (self.std, self.size_expr, self.cls_expr)



def cases():
    out = []
    for (std, cls), (nps, od, wall, steel) in fluids_tables().items():
        for n, o, w in zip(nps, od, wall):
            if n not in SIZES or n > (24 if steel else 12):
                continue
            size = SIZES[n]
            o, w = o / 1000.0, w / 1000.0
            variants = [
                (std, '"%s"' % size, size, '"%s"' % cls, cls, "canonical"),
                (std, repr(float(n)), repr(float(n)), '"%s"' % cls, cls, "size as a number"),
                (SHORT[std], '"%s"' % size.replace("-", " "), size.replace("-", " "),
                 '"%s"' % cls, cls, "short standard name, size with a space"),
                (std, '"%s"' % size, size, '"%s"' % CLASS_ALT[cls], CLASS_ALT[cls],
                 "class spelled differently"),
            ]
            for s, se, st, ce, ct, how in variants:
                out.append(Case(s, se, st, ce, ct, o, w, steel, n, how))
    return out


# Moody rows that fluids.friction also lists: our material name -> fluids ID
ROUGH = {"galvanised steel": "Galvanized iron", "cast iron": "Cast iron",
         "asphalted cast iron": "Asphalted cast iron", "concrete": "Concrete",
         "drawn tubing": "Brass", "copper": "Brass"}


# (statement, column of the offending argument, words the message must hold)
BAD = [
    ('a = pipe("ASTM B88", "7", "L")', 22, "ASTM B88 has no size 7; its sizes are 1/4, 3/8, 1/2"),
    ('a = pipe("ASTM D1785", "2", "120")', 29, 'has no class "120"; its classes are "40", "80"'),
    ('a = pipe("ASTM D9", "2", "40")', 10, 'unknown standard "ASTM D9"; known standards: "ASME B36.10M"'),
    ('a = pipe("ASME B36.10M", "3-1/2", "160")', 35, 'lists no "160" at size 3-1/2'),
]


def bad_input(headroom):
    """Run each bad statement through the program; return failures."""
    fails = []
    with tempfile.TemporaryDirectory() as tmp:
        for stmt, col, words in BAD:
            path = os.path.join(tmp, "bad.calc.md")
            with open(path, "w", encoding="utf-8") as f:
                f.write("# bad\n\n```calc\n%s\n```\n" % stmt)
            r = subprocess.run([headroom, "check", path], capture_output=True, text=True,
                               timeout=600)
            want = "%s:4:%d: error: pipe: " % (path, col)
            out = r.stdout + r.stderr
            if r.returncode != 2 or want not in out or words not in out:
                fails.append("%s: exit %d, expected 2 and '%s...%s' in: %s" %
                             (stmt, r.returncode, want, words, out.strip()[:400]))
    return fails


def main(argv):
    if len(argv) != 3 or argv[1] != "run":
        sys.stderr.write("usage: pipes_fluids.py run HEADROOM\n")
        return 2
    headroom = argv[2]
    all_cases = cases()
    require_cli(headroom)
    print("pipes-fluids: reference python3-fluids %s" % fluids.__version__)
    passed = failed = 0
    rough_got = {}
    stmts = [("p_%d" % i, c.expr()) for i, c in enumerate(all_cases)]
    stmts += [("eps_%d" % i, 'roughness("%s")' % m) for i, m in enumerate(ROUGH)]
    values, problems = run_cli(headroom, stmts)
    got = []
    for i in range(len(all_cases)):
        e = values.get("p_%d" % i)
        got.append(tuple(si(e, f) for f in ("od", "id", "wall")))
    for i, m in enumerate(ROUGH):
        rough_got[m] = si(values.get("eps_%d" % i))
    for p in problems[:20]:
        print("  " + p)

    worst = [0.0, 0.0, 0.0]
    for c, g in zip(all_cases, got):
        want = (c.od, c.id, c.wall)
        ok = all(v is not None for v in g)
        if ok:
            for k in range(3):
                worst[k] = max(worst[k], abs(g[k] - want[k]))
                if abs(g[k] - want[k]) > c.tol[k] + 1e-12:
                    ok = False
        if ok:
            passed += 1
        else:
            failed += 1
            if failed <= 40:
                print("FAIL %s (%s): od id wall = %r, fluids %r" % (c.expr(), c.how, g, want))
    print("  dimensions: %d rows x 4 spellings; largest differences od %.3g mm, id %.3g mm, wall %.3g mm"
          % (len(all_cases) // 4, worst[0] * 1e3, worst[1] * 1e3, worst[2] * 1e3))

    for m, fid in ROUGH.items():
        v, ref = rough_got.get(m), fr.material_roughness(fid)
        if v is not None and abs(v - ref) <= 0.005 * ref:
            passed += 1
        else:
            failed += 1
            print("FAIL roughness(\"%s\") = %r, fluids %s %r" % (m, v, fid, ref))
    bad_fails = bad_input(headroom)
    for f in bad_fails:
        print("FAIL bad input " + f)
    failed += len(bad_fails)
    passed += len(BAD) - len(bad_fails)
    if problems and failed == 0:
        failed += len(problems)
    print("pipes-fluids: %d passed, %d failed" % (passed, failed))
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
