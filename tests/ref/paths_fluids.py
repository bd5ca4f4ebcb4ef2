"""paths_fluids.py - ```path blocks of the real program against an
independent computation from Debian's python3-fluids and python3-iapws.

Sources (the versions found are printed):
  python3-fluids 1.0.22   fluids.friction.Colebrook (exact solution),
                          fluids.friction.Swamee_Jain_1976,
                          fluids.friction.Haaland, fluids.fittings.ft_Crane
                          and the Crane valve, bend and entrance functions
                          named in crane_k() below
  python3-iapws 1.5.x     iapws.IAPWS97 (IF97 region 1 density) and
                          iapws._iapws._Viscosity (IAPWS 2008 viscosity at
                          that density), at T and one standard atmosphere,
                          the pressure water(T) assumes
  NIST SP 811             exact unit definitions used to turn the literals
                          written into the calc files into SI (1 ft =
                          0.3048 m, 1 gal = 231 in^3, 1 lbf = 4.4482216152605
                          N, standard gravity 9.80665 m/s^2)

Pipe bores and roughnesses are read from our own pipe() output in the JSON
(a first run evaluates every pipe the paths use): those numbers are checked
elsewhere, against fluids.piping in tests/ref/pipes-fluids.sh, and against
the standards in tests/unit/test_pipes.c. Everything else is computed here.

The path physics written out (DESIGN 2.2a), per segment:
  A = pi*D^2/4, V = Q/A, Re = rho*V*D/mu
  Darcy-Weisbach   h_f = f*L/D*V^2/(2g), f from the path's friction method
  Hazen-Williams   h_f = 10.67*L*Q^1.852/(C^1.852*D^4.8704) (SI: m, m^3/s),
                   the same constants as src/methods/friction.c (HW_K_SI =
                   10.67; 1.852 and 4.8704), checked here on purpose with
                   the same rounding: the law's constant itself is the
                   subject of tests/unit (10.67 vs the derived 10.674)
  fittings         K = sum(count*K_kind) + the K column, h_m = K*V^2/(2g)
  energy           p_out = p_in - rho*g*(h_f + h_m) - rho*g*rise
  junction         p_in(i) = p_out(i-1) + rho*(V(i-1)^2 - V(i)^2)/2
  p_min            the least of every p_in and p_out

Swamee-Jain: fluids' Swamee_Jain_1976 uses (6.97/Re)^0.9 where the paper
prints 5.74/Re^0.9; it is called with a rescaled Re so that it evaluates the
published form (see SJ_RE below); the constant's effect, 1.3e-6 in f, would
otherwise exceed the 1e-6 tolerance on p_end.

Fittings, Crane TP-410 (K = f_T*(L/D)_eq). NOTE: fluids' own
fluids.fittings.ft_Crane(D) is NOT the f_T we use. Ours is the fully rough
limit of Colebrook, 1/sqrt(f_T) = -2*log10((eps/D)/3.7) with eps = 0.0018 in,
the closed form Crane states for its table; fluids fits Crane's rounded f_T
table at a finite Re. So f_T is computed here from that formula, and the
fluids Crane functions are called with fd=f_T. Separately (family
"f_T vs ft_Crane") our f_T, read back from the program as
k_fitting("gate", D, 1e6)/8, is compared with fluids' ft_Crane(D) at 2 %
relative, a sanity check of the formula against Crane's table.
(L/D)_eq where fluids has the Crane function: gate 8 (K_gate_valve_Crane),
globe 340, ball 3, swing check 100 (angled=True), lift check 600
(angled=False), butterfly 45 for 2-8 in (style=0; only sizes up to 8 in
use it here), bend r/d = 1 as "elbow 90 std flanged" 20
(bend_rounded_Crane/ft_Crane); direct K: entrance sharp 0.5
(entrance_sharp(method="Crane")), entrance projecting 0.78
(entrance_distance(method="Crane")), entrance rounded 0.04 (no r given: our
kind means a well rounded inlet, so fluids is asked at r/d = 0.2 where
Crane's curve is flat), exit 1.0 (exit_normal()). Where fluids has no Crane
counterpart the L/D is Crane TP-410's table value (from memory): standard
elbow 90 30, standard elbow 45 16, tee run 20, tee branch 60, and the 90
bend r/d = 1.5 "elbow 90 long" 14 (fluids' bend chart fit gives 14.06;
tests/ref/fittings-fluids.sh compares those at 0.5 %).

220 paths, seeded: 1 to 5 segments; pipes from ASME B36.10M steel sch 40 and
80, ASTM B88 copper K, L, M and ASTM D1785 PVC sch 40 and 80; velocities
0.6-2.8 m/s (so every segment is turbulent, Re > 5000, and inside the
Hazen-Williams velocity range); lengths 0.5-120 m, rises -15..+20 m;
temperatures 5-80 degC; half of them in US documents (literals in ft,
gal/min, psi, degF) and half in SI documents (m, L/s, kPa, degC); about 40 %
change size mid-path, flows drop along some paths, about 20 % use loss:
hazen_williams with a C column, about 30 % friction: swamee_jain or haaland,
some carry a K column. Flow cells are sometimes expressions (q_3, q_3*0.5).
p_end and p_min must agree to 1e-6 relative; per-segment f, K, h_f and V
are compared too, at 1e-9, to locate any disagreement.

    paths_fluids.py            (HEADROOM env var, default build/headroom)
"""
import json
import math
import os
import random
import subprocess
import sys
import tempfile

import fluids
import fluids.fittings as ff
import iapws
from fluids.friction import Colebrook, Haaland, Swamee_Jain_1976
from iapws._iapws import _Viscosity

from hydraulics_ref import Tally, headroom, num

N_PATHS = 220
PER_DOC = 20
REL = 1e-6
REL_SEG = 1e-9
rng = random.Random(20240522)

G = 9.80665                      # standard gravity, m/s^2 (exact)
IN = 0.0254
FT = 0.3048
GPM = 231 * IN ** 3 / 60         # m^3/s per gal/min
PSI = 4.4482216152605 / IN ** 2  # Pa per psi
EPS_CRANE = 0.0018 * IN
# fluids writes Swamee-Jain's 5.74/Re^0.9 as (6.97/Re)^0.9 (6.97^0.9 =
# 5.7398, 3.5e-5 off the published 5.74; this moves f by about 1.3e-6
# here, see tests/ref/friction-fluids.sh). Swamee & Jain (1976) print 5.74
# (from memory; fluids' own docstring cites them), and so does friction.c.
# To ask fluids for the published equation, it is given the Reynolds number
# Re' with (6.97/Re')^0.9 = 5.74/Re^0.9, i.e. Re' = Re*6.97/5.74^(1/0.9).
SJ_RE = 6.97 / 5.74 ** (1 / 0.9)

STEEL = ["1/2", "3/4", "1", "1-1/4", "1-1/2", "2", "2-1/2", "3", "4", "5", "6", "8", "10", "12"]
COPPER = ["1/2", "3/4", "1", "1-1/4", "1-1/2", "2", "2-1/2", "3", "4", "5", "6"]
PVC = ["1/2", "3/4", "1", "1-1/4", "1-1/2", "2", "2-1/2", "3", "4", "6", "8"]
PIPES = ([("ASME B36.10M", s, c) for s in STEEL for c in ("40", "80")] +
         [("ASTM B88", s, c) for s in COPPER for c in ("K", "L", "M")] +
         [("ASTM D1785", s, c) for s in PVC for c in ("40", "80")])


def nominal_in(size):
    whole, _, frac = size.partition("-")
    if "/" in whole:
        a, b = whole.split("/")
        return int(a) / int(b)
    x = float(whole)
    if frac:
        a, b = frac.split("/")
        x += int(a) / int(b)
    return x


def pipe_name(p):
    std, size, cls = p
    return "p_%s_%s_%s" % (std.split()[1].replace(".", "").lower(),
                           size.replace("/", "o").replace("-", "_"), cls)


def f_T(D):
    """Fully rough Colebrook limit with eps = 0.0018 in (Crane's basis)."""
    x = -2.0 * math.log10(EPS_CRANE / D / 3.7)
    return 1.0 / (x * x)


def crane_k(kind, D):
    ft = f_T(D)
    if kind == "gate":
        return ff.K_gate_valve_Crane(D, D, 0, fd=ft)
    if kind == "globe":
        return ff.K_globe_valve_Crane(D, D, fd=ft)
    if kind == "ball":
        return ff.K_ball_valve_Crane(D, D, 0, fd=ft)
    if kind == "swing check":
        return ff.K_swing_check_valve_Crane(D, fd=ft, angled=True)
    if kind == "lift check":
        return ff.K_lift_check_valve_Crane(D, D, fd=ft, angled=False)
    if kind == "butterfly":
        return ff.K_butterfly_valve_Crane(D, fd=ft, style=0)
    if kind == "elbow 90 std flanged":
        return ft * ff.bend_rounded_Crane(D, 90, rc=D) / ff.ft_Crane(D)
    if kind == "entrance sharp":
        return ff.entrance_sharp(method="Crane")
    if kind == "entrance projecting":
        return ff.entrance_distance(D, t=0.001 * D, l=D, method="Crane")
    if kind == "entrance rounded":
        return ff.entrance_rounded(D, 0.2 * D, method="Crane")
    if kind == "exit":
        return ff.exit_normal()
    # Crane TP-410 table L/D (from memory); no fluids counterpart.
    table = {"elbow 90 std": 30, "elbow 45 std": 16, "tee run": 20, "tee branch": 60,
             "tee run flanged": 20, "tee branch flanged": 60, "elbow 90 long": 14}
    return ft * table[kind]


KINDS = ["elbow 90 std", "elbow 90 std flanged", "elbow 90 long", "elbow 45 std", "tee run",
         "tee run flanged", "tee branch", "tee branch flanged", "gate", "globe", "ball",
         "butterfly", "swing check", "lift check", "entrance sharp", "entrance projecting",
         "entrance rounded", "exit"]


def field_of(seg_id):
    return "".join(c if (c.isalnum() or c == "_") else "_" for c in seg_id)


def run_doc(text, tag):
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, tag + ".calc.md")
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
        proc = subprocess.run([headroom(), "check", path, "--json"], stdout=subprocess.PIPE,
                              stderr=subprocess.PIPE, timeout=600)
    err = proc.stderr.decode("utf-8", "replace")
    if proc.returncode not in (0, 1) or "Sanitizer" in err or "runtime error" in err:
        sys.stderr.write(err[-3000:])
        sys.stderr.write("paths-fluids: headroom exited with %d on %s\n" % (proc.returncode, tag))
        return None
    return json.loads(proc.stdout.decode("utf-8"))


def water(T):
    st = iapws.IAPWS97(T=T, P=0.101325)
    return st.rho, _Viscosity(st.rho, T)


def fmt(x, sig=6):
    return "%.*g" % (sig, x)


def make_path(k, units, dims):
    """One random path: returns (options, rows, definitions, reference)."""
    us = units == "US"
    T_c = rng.uniform(5, 80)
    if us:
        T_lit = fmt(T_c * 9 / 5 + 32, 7)
        T = (float(T_lit) + 459.67) * 5 / 9
        T_cell = "%s degF" % T_lit
    else:
        T_lit = fmt(T_c, 7)
        T = float(T_lit) + 273.15
        T_cell = "%s degC" % T_lit
    rho, mu = water(T)
    loss = "hazen_williams" if rng.random() < 0.2 else "darcy"
    method = "colebrook"
    opts = ["fluid: w_%d" % k]
    defs = ["w_%d = water(%s)" % (k, T_cell)]
    if loss == "hazen_williams":
        opts.append("loss: hazen_williams")
    else:
        r = rng.random()
        if r < 0.15:
            method = "swamee_jain"
        elif r < 0.3:
            method = "haaland"
        elif r < 0.4:
            method = "colebrook"
            opts.append("friction: colebrook")
        if method != "colebrook":
            opts.append("friction: %s" % method)
    nseg = rng.randint(1, 5)
    pipe = rng.choice(PIPES)
    D0 = dims[pipe][0]
    V0 = rng.uniform(0.8, 2.4)
    Q = V0 * math.pi * D0 * D0 / 4
    # Flow literal in the document's unit, read back exactly.
    Q_lit = fmt(Q / GPM if us else Q * 1000, 7)
    q_unit = "gal/min" if us else "L/s"
    Q = float(Q_lit) * (GPM if us else 1e-3)
    use_name = rng.random() < 0.3
    if use_name:
        defs.append("q_%d = %s %s" % (k, Q_lit, q_unit))
    has_K = rng.random() < 0.25
    segs = []
    changed = False
    for i in range(nseg):
        flow_cell = ("q_%d" % k) if use_name else "%s %s" % (Q_lit, q_unit)
        Qi = Q
        if i > 0 and rng.random() < 0.3:
            if use_name:
                flow_cell = "q_%d*0.5" % k
                Qi = Q * 0.5
            else:
                share = rng.choice([0.9, 0.75, 0.6])
                Qi = float(fmt(Q * share / (GPM if us else 1e-3), 7)) * (GPM if us else 1e-3)
                flow_cell = "%s %s" % (fmt(Qi / (GPM if us else 1e-3), 7), q_unit)
        if i > 0 and rng.random() < 0.3:
            # a size change: another pipe whose velocity stays 0.6-2.8 m/s
            cands = [p for p in PIPES if 0.6 <= Qi / (math.pi * dims[p][0] ** 2 / 4) <= 2.8 and p != pipe]
            if cands:
                pipe = rng.choice(cands)
                changed = True
        D, eps = dims[pipe]
        V = Qi / (math.pi * D * D / 4)
        if not 0.55 <= V <= 2.9:
            # keep the velocity in range when the flow dropped: stay on size
            Qi = Q
            flow_cell = ("q_%d" % k) if use_name else "%s %s" % (Q_lit, q_unit)
        L = float(fmt(rng.uniform(0.5, 120) / (FT if us else 1), 5)) * (FT if us else 1)
        rise = float(fmt(rng.uniform(-15, 20) / (FT if us else 1), 4)) * (FT if us else 1)
        lu = "ft" if us else "m"
        fits = []
        for _ in range(rng.choice([0, 0, 1, 1, 2, 3])):
            kind = rng.choice(KINDS)
            if kind == "butterfly" and nominal_in(pipe[1]) > 8:
                kind = "gate"
            if kind in [f[1] for f in fits]:
                continue
            fits.append((rng.randint(1, 4), kind))
        Kx = float(fmt(rng.uniform(0, 2), 3)) if has_K else 0.0
        C = rng.choice([100, 110, 120, 130, 140, 150])
        seg_id = rng.choice(["S-%d", "R%d", "seg.%d", "B_%d"]) % (i + 1)
        segs.append(dict(id=seg_id, flow=flow_cell, Q=Qi, pipe=pipe, D=D, eps=eps,
                         L=L, L_cell="%s %s" % (fmt(L / (FT if us else 1), 8), lu),
                         rise=rise, rise_cell="%s %s" % (fmt(rise / (FT if us else 1), 8), lu),
                         fits=fits, K=Kx, C=C))
    # reference hydraulics
    p = None
    res = []
    drops = 0.0
    for i, s in enumerate(segs):
        A = math.pi * s["D"] ** 2 / 4
        V = s["Q"] / A
        Re = rho * V * s["D"] / mu
        hv = V * V / (2 * G)
        if loss == "darcy":
            rr = s["eps"] / s["D"]
            if method == "swamee_jain":
                f = Swamee_Jain_1976(Re * SJ_RE, rr)
            else:
                f = {"colebrook": Colebrook, "haaland": Haaland}[method](Re, rr)
            h_f = f * s["L"] / s["D"] * hv
        else:
            f = None
            h_f = 10.67 * s["L"] * s["Q"] ** 1.852 / (s["C"] ** 1.852 * s["D"] ** 4.8704)
        K = s["K"] + sum(n * crane_k(kind, s["D"]) for n, kind in s["fits"])
        h_m = K * hv
        res.append(dict(V=V, Re=Re, f=f, K=K, h_f=h_f, h_m=h_m))
        drops += rho * G * (h_f + h_m + max(s["rise"], 0)) + rho * V * V
    # start pressure: enough that the path stays well above zero
    p_start = drops + rng.uniform(100e3, 500e3)
    p_lit = fmt(p_start / (PSI if us else 1e3), 7)
    p_start = float(p_lit) * (PSI if us else 1e3)
    opts.insert(1, "start: %s %s" % (p_lit, "psi" if us else "kPa"))
    p_min = p_start
    for i, (s, r) in enumerate(zip(segs, res)):
        if i == 0:
            p_in = p_start
        else:
            Vp = res[i - 1]["V"]
            p_in = res[i - 1]["p_out"] + rho * (Vp * Vp - r["V"] ** 2) / 2
        r["p_in"] = p_in
        r["p_out"] = p_in - rho * G * (r["h_f"] + r["h_m"]) - rho * G * s["rise"]
        p_min = min(p_min, p_in, r["p_out"])
    ref = dict(rho=rho, mu=mu, T=T, p_end=res[-1]["p_out"], p_min=p_min, segs=res,
               loss=loss, method=method, changed=changed)
    cols = ["segment", "flow", "pipe", "length", "rise", "fittings"]
    if has_K:
        cols.append("K")
    if loss == "hazen_williams":
        cols.append("C")
    rows = []
    for s in segs:
        cells = [s["id"], s["flow"], pipe_name(s["pipe"]), s["L_cell"], s["rise_cell"],
                 ", ".join("%d %s" % fk for fk in s["fits"]) or "-"]
        if has_K:
            cells.append(repr(s["K"]))
        if loss == "hazen_williams":
            cells.append(str(s["C"]))
        rows.append(cells)
    block = "```path path_%d\n%s\n| %s |\n|%s\n%s\n```\n" % (
        k, "\n".join(opts), " | ".join(cols), "---|" * len(cols),
        "\n".join("| %s |" % " | ".join(c) for c in rows))
    return block, defs, ref, segs


def pipe_defs():
    return ['%s = pipe("%s", "%s", "%s")' % (pipe_name(p), p[0], p[1], p[2]) for p in PIPES]


def main():
    tally = Tally("paths-fluids")
    print("references: python3-fluids %s, python3-iapws %s" % (fluids.__version__, iapws.__version__))

    # Pass 1: the pipe records (bores and roughness from our own pipe(),
    # checked elsewhere against fluids.piping) and f_T read back from
    # k_fitting("gate", D, 1e6)/8.
    stmts = pipe_defs()
    stmts += ['ft_%s = k_fitting("gate", %s.id, 1e6)/8' % (pipe_name(p), pipe_name(p)) for p in PIPES]
    doc = run_doc("# pipes\n\n```calc\n%s\n```\n" % "\n".join(stmts), "pipes")
    if doc is None:
        print("paths-fluids: 0 passed, 1 failed")
        sys.exit(1)
    vals = doc["values"]
    dims = {}
    for p in PIPES:
        fl = vals[pipe_name(p)]["fields"]
        dims[p] = (fl["id"]["si"], fl["roughness"]["si"])
        D = dims[p][0]
        ft_ours = vals["ft_" + pipe_name(p)]["si"]
        tally.check("f_T formula %s %s %s" % p, ft_ours, f_T(D), 1e-12, "f_T formula")
        tally.check("f_T vs ft_Crane %s %s %s" % p, ft_ours, ff.ft_Crane(D), 0.02, "f_T vs ft_Crane")

    # Pass 2: the paths, PER_DOC to a document, US and SI in turn.
    k = 0
    ndoc = 0
    counts = dict(US=0, SI=0, hazen_williams=0, swamee_jain=0, haaland=0, changed=0, segments=0)
    while k < N_PATHS:
        units = "US" if ndoc % 2 == 0 else "SI"
        blocks, defs, refs = [], [], []
        for _ in range(min(PER_DOC, N_PATHS - k)):
            block, d, ref, segs = make_path(k, units, dims)
            blocks.append(block)
            defs += d
            refs.append((k, ref, segs))
            k += 1
        text = "---\ntitle: paths against fluids %d\nunits: %s\n---\n\n```calc\n%s\n```\n\n%s" % (
            ndoc, units, "\n".join(pipe_defs() + defs), "\n".join(blocks))
        doc = run_doc(text, "paths_%d" % ndoc)
        ndoc += 1
        if doc is None:
            tally.failed += len(refs)
            continue
        for d in doc.get("diagnostics", []):
            if d.get("severity") == "error":
                tally.failed += 1
                print("FAIL unexpected error at line %s: %s" % (d.get("line"), d.get("message")))
        vals = doc["values"]
        for k_, ref, segs in refs:
            name = "path_%d" % k_
            rec = vals.get(name, {}).get("fields", {})
            counts[units] += 1
            counts["segments"] += len(segs)
            if ref["loss"] == "hazen_williams":
                counts["hazen_williams"] += 1
            if ref["method"] in ("swamee_jain", "haaland"):
                counts[ref["method"]] += 1
            if ref["changed"]:
                counts["changed"] += 1
            what = "%s (%s doc, %s, %s)" % (name, units, ref["loss"], ref["method"])
            tally.check(what + ".p_end", rec.get("p_end", {}).get("si"), ref["p_end"], REL, "p_end")
            tally.check(what + ".p_min", rec.get("p_min", {}).get("si"), ref["p_min"], REL, "p_min")
            for s, r in zip(segs, ref["segs"]):
                sf = rec.get(field_of(s["id"]), {}).get("fields", {})
                w = "%s.%s" % (what, field_of(s["id"]))
                for fld in ("V", "K", "h_f"):
                    if fld == "K" and r["K"] == 0:
                        continue
                    tally.check(w + "." + fld, sf.get(fld, {}).get("si"), r[fld], REL_SEG, "segment " + fld)
                if r["f"] is not None:
                    tally.check(w + ".f", sf.get("f", {}).get("si"), r["f"], REL_SEG, "segment f")
    print("paths: %d US, %d SI documents' paths, %d segments; %d Hazen-Williams, %d Swamee-Jain, "
          "%d Haaland, %d with a size change" % (counts["US"], counts["SI"], counts["segments"],
                                                 counts["hazen_williams"], counts["swamee_jain"],
                                                 counts["haaland"], counts["changed"]))
    if counts["US"] + counts["SI"] < 200:
        tally.failed += 1
        print("FAIL fewer than 200 paths checked")
    tally.finish()


if __name__ == "__main__":
    main()
