"""bench.py — time headroom on generated calcs and print one table.

Each command runs in a fresh process; the best wall time of several runs is
reported (the machine has other load), and peak resident memory comes from
wait4's rusage of that process. Inputs are generated here into BUILD/bench/.
"""
import os
import subprocess
import sys
import time

BUILD = sys.argv[1] if len(sys.argv) > 1 else "build"
HEADROOM = os.path.join(BUILD, "headroom")
OUT = os.path.join(BUILD, "bench")


def run(argv, repeat=5):
    best, peak = float("inf"), 0
    for _ in range(repeat):
        start = time.perf_counter()
        proc = subprocess.Popen(argv, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.perf_counter() - start
        err = proc.stderr.read().decode(errors="replace")
        proc.stderr.close()
        code = os.waitstatus_to_exitcode(status)
        if code not in (0, 1):
            sys.exit(f"bench: {' '.join(argv)} exited {code}\n{err[:2000]}")
        best = min(best, wall)
        peak = max(peak, usage.ru_maxrss)  # KiB on Linux
    return best, peak / 1024.0


def calc_5000():
    """5,000 statements in 50 calc blocks: inputs, arithmetic with units,
    water properties, friction factors, a solve every block, and checks."""
    lines = ["---", "title: Benchmark, 5000 statements", "units: US", "---", ""]
    n = 0
    for b in range(50):
        lines += [f"# Block {b}", "", "```calc"]
        lines.append(f"Q_{b} = {50 + b} gal/min  # flow")
        lines.append(f"D_{b} = {2 + (b % 5) * 0.5} in")
        lines.append(f"T_{b} = {50 + b % 30} degF")
        lines.append(f"w_{b} = water(T_{b})")
        lines.append(f"A_{b} = pi*D_{b}^2/4")
        lines.append(f"V_{b} = Q_{b}/A_{b} as ft/s")
        lines.append(f"Re_{b} = w_{b}.rho*V_{b}*D_{b}/w_{b}.mu")
        lines.append(f"f_{b} = friction_factor(Re_{b}, (0.00005 in)/D_{b})")
        lines.append(f"L_{b} = 100 ft")
        lines.append(f"h_{b} = f_{b}*(L_{b}/D_{b})*V_{b}^2/(2*g) as ft")
        lines.append(f"Ls_{b} = solve L_{b} where f_{b}*(L_{b}/D_{b})*V_{b}^2/(2*g) = 20 ft")
        n += 11
        for k in range(87):
            lines.append(f"x_{b}_{k} = h_{b}*{k + 1} + {k} ft  # derived value {k}")
            n += 1
        lines.append(f"check head {b}: h_{b} <= 100 ft")
        lines.append(f"check velocity {b}: V_{b} <= 10 ft/s")
        n += 2
        lines += ["```", ""]
    path = os.path.join(OUT, "check5000.calc.md")
    with open(path, "w") as f:
        f.write("\n".join(lines) + "\n")
    return path, n


def diff_pair(path):
    """Two revisions of the 5,000-statement calc for `headroom diff`: NEW
    changes two inputs, rewrites one formula, renames one name, moves a
    block of lines and rewords a heading."""
    with open(path) as f:
        old = f.read()
    new = old.replace("Q_7 = 57 gal/min", "Q_7 = 61 gal/min").replace("L_20 = 100 ft", "L_20 = 120 ft")
    new = new.replace("x_30_5 = h_30*6 + 5 ft", "x_30_5 = h_30*7 + 5 ft")
    new = new.replace("x_40_86 = ", "x_40_last = ")
    new = new.replace("# Block 45", "# Block 45, revised")
    lines = new.split("\n")
    i = lines.index("x_10_3 = h_10*4 + 3 ft  # derived value 3")
    lines[i:i + 2] = [lines[i + 1], lines[i]]
    new = "\n".join(lines)
    old_path, new_path = os.path.join(OUT, "diff-old.calc.md"), os.path.join(OUT, "diff-new.calc.md")
    for p, text in ((old_path, old), (new_path, new)):
        with open(p, "w") as f:
            f.write(text)
    return old_path, new_path


def calc_100_sheets(sections=60, name="sheets100"):
    """Prose, a table and calc rows: 60 sections make 144 sheets."""
    lines = ["---", "title: Benchmark, a long report", "units: SI", "paper: a4", "---", ""]
    for s in range(sections):
        lines += [f"# Section {s}", "",
                  "This section carries a paragraph of prose that wraps over several lines so "
                  "that the layout has real text to break, with *emphasis*, **strong words** "
                  "and `code` in it, and an inline value {Q_%d}." % s, "",
                  "| item | value |", "|---|---|", "| one | 1 |", "| two | 2 |", "", "```calc"]
        lines.append(f"Q_{s} = {5 + s} L/s  # flow in line {s}")
        lines.append(f"D_{s} = 80 mm")
        lines.append(f"V_{s} = Q_{s}/(pi*D_{s}^2/4) as m/s  # velocity")
        lines.append(f"Re_{s} = (998 kg/m^3)*V_{s}*D_{s}/(1.0 cP)")
        lines.append(f"f_{s} = friction_factor(Re_{s}, (0.045 mm)/D_{s})")
        for k in range(12):
            lines.append(f"h_{s}_{k} = f_{s}*(({10 + k} m)/D_{s})*V_{s}^2/(2*g) as m  # friction over run {k}")
        lines.append(f"check velocity {s}: V_{s} <= 3 m/s")
        lines += ["```", ""]
    path = os.path.join(OUT, name + ".calc.md")
    with open(path, "w") as f:
        f.write("\n".join(lines) + "\n")
    return path


def package_50():
    """A package of 50 parts of 100 statements each, all using one basis of
    design: every part reads the basis's water and supply pressure."""
    d = os.path.join(OUT, "package50")
    os.makedirs(d, exist_ok=True)
    with open(os.path.join(d, "basis.calc.md"), "w") as f:
        f.write("---\ntitle: Basis\nunits: US\n---\n\n```calc\nw = water(55 degF)\n"
                "p_supply = 80 psi\nV_limit = 8 ft/s\n```\n")
    parts = []
    for p in range(50):
        lines = ["---", f"title: Part {p}", f"number: B-{p}", f"subject: Line {p} of the benchmark",
                 "units: US", "---", "", f"# Line {p}", "", "```calc",
                 'basis = use("basis.calc.md")',
                 f"Q = {40 + p} gal/min", f"D = {2 + (p % 4) * 0.5} in", "A = pi*D^2/4",
                 "V = Q/A as ft/s", "Re = basis.w.rho*V*D/basis.w.mu",
                 "f = friction_factor(Re, (0.00005 in)/D)", "L = 100 ft",
                 "h = f*(L/D)*V^2/(2*g) as ft"]
        for k in range(89):
            lines.append(f"x_{k} = h*{k + 1} + {k} ft  # derived value {k}")
        lines += ["check velocity: V <= basis.V_limit",
                  "check pressure: basis.w.rho*g*h <= basis.p_supply", "```", ""]
        name = f"part{p:02d}.calc.md"
        with open(os.path.join(d, name), "w") as f:
            f.write("\n".join(lines) + "\n")
        parts.append(name)
    index = os.path.join(d, "index.calc.md")
    with open(index, "w") as f:
        f.write("---\ntitle: Benchmark package\nunits: US\nparts:\n" +
                "".join(f"  - {n}\n" for n in parts) + "---\n\nFifty parts.\n")
    return index


def network_2000():
    """A looped grid of 40 x 50 = 2,000 junctions fed from two supplies at
    opposite corners: about 3,900 links, NPS 3 to 8 schedule 40 steel,
    Darcy-Weisbach with Colebrook. Seeded, so every run solves the same
    network."""
    import random
    rnd = random.Random(2000)
    rows, cols = 40, 50
    lines = ["---", "title: bench network", "units: SI", "---", "", "```calc", "w = water(20 degC)"]
    sizes = ["3", "4", "6", "8"]
    for s in sizes:
        lines.append(f'p{s} = pipe("ASME B36.10M", "{s}", "40")')
    lines += ["```", "", "```network grid", "fluid: w", "",
              "| node | elevation | demand | head | x | y |", "|---|---|---|---|---|---|",
              "| R1 | 0 m |  | 80 m | -100 m | 0 m |",
              f"| R2 | 0 m |  | 75 m | {cols * 100 + 100} m | {(rows - 1) * 100} m |"]
    for r in range(rows):
        for c in range(cols):
            lines.append(f"| J{r}_{c} | {rnd.uniform(0, 15):.2f} m | {rnd.uniform(0.01, 0.12):.3f} L/s |  | "
                         f"{c * 100} m | {r * 100} m |")
    lines += ["", "| link | from | to | pipe | length |", "|---|---|---|---|---|",
              "| S1 | R1 | J0_0 | p8 | 100 m |", f"| S2 | R2 | J{rows - 1}_{cols - 1} | p8 | 100 m |"]
    k = 0
    for r in range(rows):
        for c in range(cols):
            for dr, dc in ((0, 1), (1, 0)):
                if r + dr < rows and c + dc < cols:
                    k += 1
                    lines.append(f"| L{k} | J{r}_{c} | J{r + dr}_{c + dc} | p{rnd.choice(sizes)} | "
                                 f"{rnd.uniform(80, 120):.1f} m |")
    lines += ["```", ""]
    path = os.path.join(OUT, "network2000.calc.md")
    with open(path, "w") as f:
        f.write("\n".join(lines))
    return path, rows * cols + 2, k + 2


def network_iterations(path):
    import json
    out = subprocess.run([HEADROOM, "build", path, "--format", "json", "-o", "-"], capture_output=True, text=True)
    try:
        f = json.loads(out.stdout)["values"]["grid"]["fields"]
        return int(f["iterations"]["si"]), f["imbalance"]["si"]
    except (ValueError, KeyError):
        return 0, float("nan")


def pdf_pages(path):
    try:
        out = subprocess.run(["pdfinfo", path], capture_output=True, text=True).stdout
        for line in out.splitlines():
            if line.startswith("Pages:"):
                return int(line.split()[1])
    except OSError:
        pass
    return 0


def paired(a, b, repeat=5):
    """Run a and b alternately `repeat` times; the median wall time of each,
    the median of the per-pair ratios a/b, and the peak memory of each."""
    ta, tb, ratios, ma, mb = [], [], [], 0.0, 0.0
    for _ in range(repeat):
        t1, m1 = run(a, repeat=1)
        t2, m2 = run(b, repeat=1)
        ta.append(t1)
        tb.append(t2)
        ratios.append(t1 / t2)
        ma, mb = max(ma, m1), max(mb, m2)
    med = lambda v: sorted(v)[len(v) // 2]
    return med(ta), med(tb), med(ratios), ma, mb


def build_against_floor(rows):
    """`build` of a 144-sheet report against a bare libharu program writing
    the same pages, fonts and text (bench/pdf_floor.c, its input read out of
    the report by bench/pdf_runs.py)."""
    calc = calc_100_sheets(60, "sheets144")
    pdf = os.path.join(OUT, "sheets144.pdf")
    subprocess.run([HEADROOM, "build", calc, "-o", pdf], check=True, capture_output=True)
    runs = os.path.join(OUT, "sheets144.runs")
    subprocess.run(["/usr/bin/python3", os.path.join(os.path.dirname(__file__), "pdf_runs.py"), pdf, runs],
                   check=True)
    floor_pdf = os.path.join(OUT, "sheets144-floor.pdf")
    th, tf, ratio, mh, mf = paired([HEADROOM, "build", calc, "-o", pdf],
                                   [os.path.join(OUT, "pdf_floor"), runs, floor_pdf])
    with open(runs, encoding="utf-8") as f:
        facts = f.read().splitlines()
    nfonts = sum(1 for l in facts if l.startswith("F "))
    ntext = sum(1 for l in facts if l.startswith("T "))
    pages = pdf_pages(pdf)
    rows.append((f"build, {pages} sheets, {nfonts} fonts, {ntext} text runs", f"{th * 1000:.1f} ms",
                 f"{mh:.1f} MB", "peak <= 25 MB"))
    rows.append(("  same pages, fonts and text, bare libharu", f"{tf * 1000:.1f} ms", f"{mf:.1f} MB",
                 f"ratio {ratio:.2f}x (target <= 1.3x)"))


def main():
    os.makedirs(OUT, exist_ok=True)
    rows = []
    path, n = calc_5000()
    t, m = run([HEADROOM, "check", path])
    t_check = t
    rows.append((f"check, {n} statements", f"{t * 1000:.1f} ms", f"{m:.1f} MB", "< 100 ms, < 64 MB"))
    # The same calc as a Python script with pint, python3-fluids, python3-iapws
    # and scipy, in the same run, for the ratio.
    ts, ms = run(["/usr/bin/python3", os.path.join(os.path.dirname(__file__), "script_equivalent.py")], repeat=3)
    rows.append(("  same calc as a pint + fluids script", f"{ts * 1000:.1f} ms", f"{ms:.1f} MB",
                 f"ratio {ts / t:.0f}x (target >= 30x)"))

    old_path, new_path = diff_pair(path)
    t, m = run([HEADROOM, "diff", old_path, new_path])
    rows.append((f"diff, two revisions of {n} statements", f"{t * 1000:.1f} ms", f"{m:.1f} MB", "< 200 ms"))

    long_calc = calc_100_sheets()
    pdf = os.path.join(OUT, "sheets100.pdf")
    t, m = run([HEADROOM, "build", long_calc, "-o", pdf], repeat=3)
    pages = pdf_pages(pdf)
    size = os.path.getsize(pdf) / 1024.0 if os.path.exists(pdf) else 0
    rows.append((f"build, {pages} sheets ({size:.0f} KB)", f"{t * 1000:.1f} ms", f"{m:.1f} MB", "< 1 s, < 64 MB"))

    build_against_floor(rows)

    index = package_50()
    t, m = run([HEADROOM, "check", index], repeat=3)
    rows.append(("check, package of 50 parts x 100 statements", f"{t * 1000:.1f} ms", f"{m:.1f} MB",
                 "(figure only)"))
    ppdf = os.path.join(OUT, "package50.pdf")
    t, m = run([HEADROOM, "build", index, "-o", ppdf], repeat=2)
    rows.append((f"build, that package ({pdf_pages(ppdf)} sheets)", f"{t * 1000:.1f} ms", f"{m:.1f} MB",
                 "(figure only)"))

    net, nn, nl = network_2000()
    tn, mn = run([HEADROOM, "check", net], repeat=3)
    its, imb = network_iterations(net)
    rows.append((f"network, {nn} nodes, {nl} links, solved", f"{tn * 1000:.1f} ms", f"{mn:.1f} MB",
                 f"< 1 s; {its} iterations, imbalance {imb:.1e} m^3/s; {tn / t_check:.1f}x the {n}-statement check"))

    out = subprocess.run([os.path.join(OUT, "colebrook")], capture_output=True, text=True).stdout.strip()
    per = [l for l in out.splitlines() if "per solve" in l]
    rows.append(("1e6 Colebrook solves", per[0].split(", ")[1] if per else "?", "", "< 0.2 us each"))

    w = [max(len(r[i]) for r in rows + [("job", "time", "peak memory", "target")]) for i in range(4)]
    fmt = "  ".join("{:<%d}" % x for x in w)
    print(fmt.format("job", "time", "peak memory", "target"))
    print(fmt.format(*("-" * x for x in w)))
    for r in rows:
        print(fmt.format(*r))


main()
