"""bench.py — time headroom on generated calcs and print one table.

Not a test: nothing here fails a build. Every row is a figure measured
beside its floor in the same run: the two commands run alternately (paired
runs), each in a fresh process, and the table shows the median of each and
the median of the paired ratios, with the target beside it. Peak resident
memory is measured by GNU time in a run of its own (see peak_mib). Inputs
are generated here into BUILD/bench/.

To add a row, write one function `row_NAME()` that returns a Row (or a list
of them) and add it to ROWS at the bottom; `Paired` measures a command
against its floor, `solo()` a command alone.
"""
import os
import statistics
import subprocess
import sys
import tempfile
import time

BUILD = sys.argv[1] if len(sys.argv) > 1 else "build"
HEADROOM = os.path.join(BUILD, "headroom")
OUT = os.path.join(BUILD, "bench")
CMARK = os.path.join(OUT, "cmark_parse")
TWO_THREADS = os.path.join(OUT, "two_threads")


class Row:
    """One line of the table: the figure, its floor, their ratio and the
    target the ratio (or figure) is held to."""

    def __init__(self, job, figure, floor="", ratio="", target="", memory=""):
        self.cells = (job, figure, memory, floor, ratio, target)


HEADER = ("job", "figure", "peak memory", "floor", "ratio", "target")


def peak_mib(argv):
    """Peak resident memory (MiB) of one run, measured by GNU time: the
    rusage a Python parent gets for its child starts from the parent's own
    size at fork, so small runs would all read as Python's size."""
    with tempfile.NamedTemporaryFile(mode="r") as out:
        subprocess.run(["/usr/bin/time", "-f", "%M", "-o", out.name] + argv,
                       stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        try:
            return int(out.read().split()[-1]) / 1024.0
        except (ValueError, IndexError):
            return float("nan")


def run_once(argv, cpu=False):
    """Wall time (s) (or, with cpu, user + system CPU time) and peak RSS
    (MiB, see peak_mib) of one fresh process. Its stderr goes
    to a temporary file, not a pipe: a run that warns a lot would otherwise
    block on a full pipe while we wait for it."""
    with tempfile.TemporaryFile() as errf:
        start = time.perf_counter()
        proc = subprocess.Popen(argv, stdout=subprocess.DEVNULL, stderr=errf)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.perf_counter() - start
        if cpu:
            wall = usage.ru_utime + usage.ru_stime
        errf.seek(0)
        err = errf.read().decode(errors="replace")
    code = os.waitstatus_to_exitcode(status)
    if code not in (0, 1):
        sys.exit(f"bench: {' '.join(argv)} exited {code}\n{err[:2000]}")
    return wall, 0.0


class Paired:
    """A figure command and its floor, run alternately `repeat` times, after
    one run of each that is not counted (the first run after a pause pays
    for pages the machine has to find again)."""

    def __init__(self, figure, floor, repeat=5):
        figs, floors, ratios = [], [], []
        run_once(figure)
        run_once(floor)
        for _ in range(repeat):
            t, _ = run_once(figure)
            tf, _ = run_once(floor)
            figs.append(t)
            floors.append(tf)
            ratios.append(t / tf)
        self.peak, self.floor_peak = peak_mib(figure), peak_mib(floor)
        self.figure = statistics.median(figs)
        self.floor = statistics.median(floors)
        self.ratio = statistics.median(ratios)


def solo(argv, repeat=5):
    """Median wall time and peak memory of a command alone."""
    runs = [run_once(argv)[0] for _ in range(repeat)]
    return statistics.median(runs), peak_mib(argv)


def ms(t):
    return f"{t * 1000:.1f} ms"


def mb(m):
    return f"{m:.1f} MB"


# ---- generated inputs --------------------------------------------------------

def calc_statements(blocks, name):
    """100 statements a block: inputs, arithmetic with units, water
    properties, friction factors, a solve every block, and checks."""
    lines = ["---", f"title: Benchmark, {blocks * 100} statements", "units: US", "---", ""]
    n = 0
    for b in range(blocks):
        lines += [f"# Block {b}", "", "```calc"]
        lines.append(f"Q_{b} = {50 + b % 50} gal/min  # flow")
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
    path = os.path.join(OUT, name)
    with open(path, "w") as f:
        f.write("\n".join(lines) + "\n")
    return path, n


def calc_5000():
    return calc_statements(50, "check5000.calc.md")


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


CASE_ROWS = 1000


def calc_cases(rows):
    """A 50-segment path of copper tube, a solve over it (the flow that
    leaves 20 psi at the end) and a cases table of `rows` supply pressures.
    With rows == 0 there is no cases block: one evaluation of the calc."""
    lines = ["---", "title: Benchmark, cases over a path", "units: US", "---", "", "```calc",
             "w = water(60 degF)", "Q = 30 gal/min", "p0 = 80 psi", 'tube = pipe("ASTM B88", "2", "L")',
             "```", "", "```path main", "fluid: w", "start: p0",
             "| segment | flow | pipe | length | rise | fittings |", "|---|---|---|---|---|---|"]
    for i in range(50):
        lines.append(f"| S{i} | Q | tube | {10 + i % 7} ft | {i % 3} ft | 1 elbow 90 std, 1 tee run |")
    lines += ["```", "", "```calc", "Q_max = solve Q where main.p_end = 20 psi",
              "check end pressure: main.p_end >= 20 psi", "```", ""]
    if rows:
        lines += ["```cases", "show: Q_max, main.p_end", "| p0 |", "|---|"]
        lines += [f"| {60 + i * 40.0 / rows:.3f} psi |" for i in range(rows)]
        lines += ["```", ""]
    path = os.path.join(OUT, f"cases{rows}.calc.md")
    with open(path, "w") as f:
        f.write("\n".join(lines))
    return path


def tiny_calc():
    path = os.path.join(OUT, "tiny.calc.md")
    with open(path, "w") as f:
        f.write("```calc\na = 1 m\n```\n")
    return path


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


# ---- rows --------------------------------------------------------------------

SHARED = {}   # figures later rows compare with (one check of the 5k calc)


def row_check_5000():
    path, n = calc_5000()
    p = Paired([HEADROOM, "check", path], [CMARK, path], repeat=21)
    SHARED["check5000"] = (path, n, p.figure)
    return Row(f"check, {n} statements", ms(p.figure), f"cmark-gfm parse {ms(p.floor)}",
               f"{p.ratio:.2f}x", "<= 4x", mb(p.peak))


def row_check_100k():
    path, n = calc_statements(1000, "check100k.calc.md")
    p = Paired([HEADROOM, "check", path], [CMARK, path], repeat=7)
    _, n5, t5 = SHARED["check5000"]
    per = p.peak * 1024.0 / n
    linear = (p.figure / n) / (t5 / n5)
    return [Row(f"check, {n} statements", ms(p.figure), f"cmark-gfm parse {ms(p.floor)}",
                f"{p.ratio:.2f}x", "<= 5x", mb(p.peak)),
            Row("  memory per statement", f"{per:.2f} KB", "", "", "<= 1 KB"),
            Row("  time per statement, 100k / 5k", f"{linear:.2f}", "", "", "linear: about 1")]


def row_json():
    path, n, _ = SHARED["check5000"]
    p = Paired([HEADROOM, "check", path, "--json"], [HEADROOM, "check", path], repeat=21)
    return Row(f"check --json, {n} statements", ms(p.figure), f"check {ms(p.floor)}",
               f"{p.ratio:.2f}x", "<= 1.3x", mb(p.peak))


def row_diff():
    """diff loads its two revisions on two threads. Beside it, the same
    ratio for a bare program (bench/two_threads.c) that runs a check's worth
    of arithmetic on two threads against one: what two threads can give on
    this machine, and so the least diff's ratio can be here."""
    path, n, _ = SHARED["check5000"]
    old, new = diff_pair(path)
    p = Paired([HEADROOM, "diff", old, new], [HEADROOM, "check", new], repeat=21)
    two = Paired([TWO_THREADS, "2"], [TWO_THREADS, "1"], repeat=21)
    return [Row(f"diff, two revisions of {n} statements", ms(p.figure), f"check {ms(p.floor)}",
                f"{p.ratio:.2f}x", "<= 1.2x", mb(p.peak)),
            Row("  bare program, two threads vs one", ms(two.figure), f"one thread {ms(two.floor)}",
                f"{two.ratio:.2f}x", "(the floor of diff's ratio here)")]


def row_diff_renamed():
    """The same, where NEW renames every derived name and rewrites its
    formula: every statement is a rename candidate (a matching that scanned
    every orphan per statement was quadratic here)."""
    path, n, _ = SHARED["check5000"]
    with open(path) as f:
        text = f.read()
    new = os.path.join(OUT, "diff-renamed.calc.md")
    with open(new, "w") as f:
        f.write(text.replace("x_", "y_").replace(" ft  # derived", ".5 ft  # derived"))
    p = Paired([HEADROOM, "diff", path, new], [HEADROOM, "check", new], repeat=15)
    return Row(f"diff, every derived name of {n} renamed", ms(p.figure), f"check {ms(p.floor)}",
               f"{p.ratio:.2f}x", "<= 1.2x", mb(p.peak))


def row_cases():
    """The cases table against 1,000 times one evaluation of the same calc,
    in CPU time (user + system; a 1,000-row run is long enough for the
    machine's other load to swing its wall time): one evaluation is a check
    of the calc without the cases block less the start-up (a check of a
    tiny calc). Each pair is the table's run and the median of five such
    differences taken beside it."""
    path, base, tiny = calc_cases(CASE_ROWS), calc_cases(0), tiny_calc()
    figs, floors, ratios = [], [], []
    for _ in range(3):
        t, _ = run_once([HEADROOM, "check", path], cpu=True)
        one = statistics.median(run_once([HEADROOM, "check", base], cpu=True)[0] -
                                run_once([HEADROOM, "check", tiny], cpu=True)[0] for _ in range(5))
        floor = CASE_ROWS * max(one, 1e-6)
        figs.append(t)
        floors.append(floor)
        ratios.append(t / floor)
    m = peak_mib([HEADROOM, "check", path])
    return [Row(f"cases, {CASE_ROWS} rows, 50-segment path, a solve (CPU)", ms(statistics.median(figs)),
                f"{CASE_ROWS} x one evaluation {ms(statistics.median(floors))}",
                f"{statistics.median(ratios):.2f}x", "<= 1.5x", mb(m)),
            Row("  peak memory of the cases run", mb(m), "", "", "<= 64 MB")]


def row_startup():
    tiny = tiny_calc()
    p = Paired([HEADROOM, "check", tiny], ["/bin/true"], repeat=41)
    return Row("start-up, check of a one-line calc", ms(p.figure), f"/bin/true {ms(p.floor)}",
               f"{p.ratio:.2f}x", "<= 1.5x", mb(p.peak))


def row_colebrook():
    """ns per Colebrook solve in headroom's friction module against the
    two-iteration Clamond (2009) floor program, alternately."""
    def ns(prog):
        out = subprocess.run([os.path.join(OUT, prog)], capture_output=True, text=True).stdout
        for line in out.splitlines():
            if "ns per solve" in line:
                return float(line.split(" ns per solve")[0].split(", ")[-1])
        sys.exit(f"bench: {prog} printed no timing:\n{out}")
    figs, floors = [], []
    for _ in range(5):
        figs.append(ns("colebrook"))
        floors.append(ns("clamond"))
    f, fl = statistics.median(figs), statistics.median(floors)
    ratio = statistics.median(a / b for a, b in zip(figs, floors))
    return Row("Colebrook solve, 1e6 over the chart", f"{f:.1f} ns", f"Clamond, 2 iterations {fl:.1f} ns",
               f"{ratio:.2f}x", "<= 30 ns")


def row_build_sheets():
    long_calc = calc_100_sheets()
    pdf = os.path.join(OUT, "sheets100.pdf")
    t, m = solo([HEADROOM, "build", long_calc, "-o", pdf], repeat=3)
    pages = pdf_pages(pdf)
    size = os.path.getsize(pdf) / 1024.0 if os.path.exists(pdf) else 0
    return Row(f"build, {pages} sheets ({size:.0f} KB)", ms(t), "", "", "(figure only)", mb(m))


def row_build_floor():
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
    p = Paired([HEADROOM, "build", calc, "-o", pdf], [os.path.join(OUT, "pdf_floor"), runs, floor_pdf])
    with open(runs, encoding="utf-8") as f:
        facts = f.read().splitlines()
    nfonts = sum(1 for line in facts if line.startswith("F "))
    ntext = sum(1 for line in facts if line.startswith("T "))
    return [Row(f"build, {pdf_pages(pdf)} sheets, {nfonts} fonts, {ntext} text runs", ms(p.figure),
                f"bare libharu, same pages {ms(p.floor)}", f"{p.ratio:.2f}x", "<= 1.3x", mb(p.peak)),
            Row("  peak memory of that build", mb(p.peak), f"bare libharu {mb(p.floor_peak)}", "", "<= 25 MB")]


def row_package():
    index = package_50()
    t, m = solo([HEADROOM, "check", index], repeat=3)
    ppdf = os.path.join(OUT, "package50.pdf")
    tb, mb_ = solo([HEADROOM, "build", index, "-o", ppdf], repeat=2)
    return [Row("check, package of 50 parts x 100 statements", ms(t), "", "", "(figure only)", mb(m)),
            Row(f"build, that package ({pdf_pages(ppdf)} sheets)", ms(tb), "", "", "(figure only)", mb(mb_))]


def row_network():
    net, nn, nl = network_2000()
    t, m = solo([HEADROOM, "check", net], repeat=3)
    its, imb = network_iterations(net)
    return Row(f"network, {nn} nodes, {nl} links, solved", ms(t), "", "",
               f"(figure only; {its} iterations, imbalance {imb:.1e} m^3/s)", mb(m))


def row_script():
    """The 5k calc as a pint + fluids + iapws + scipy script."""
    path, _, _ = SHARED["check5000"]
    p = Paired(["/usr/bin/python3", os.path.join(os.path.dirname(__file__), "script_equivalent.py")],
               [HEADROOM, "check", path], repeat=3)
    return Row("same 5k calc as a Python script (pint, fluids)", ms(p.figure), f"check {ms(p.floor)}",
               f"{p.ratio:.0f}x", ">= 30x (the script is slower)", mb(p.peak))


ROWS = [row_check_5000, row_check_100k, row_json, row_diff, row_diff_renamed, row_cases, row_startup, row_colebrook,
        row_script, row_build_sheets, row_build_floor, row_package, row_network]


def main():
    os.makedirs(OUT, exist_ok=True)
    only = os.environ.get("BENCH_ONLY")   # e.g. BENCH_ONLY=check_5000,cases
    rows = []
    for fn in ROWS:
        name = fn.__name__[4:]
        if only and name not in only.split(",") and name != "check_5000":
            continue
        got = fn()
        rows += got if isinstance(got, list) else [got]
    cells = [HEADER] + [r.cells for r in rows]
    w = [max(len(c[i]) for c in cells) for i in range(len(HEADER))]
    fmt = "  ".join("{:<%d}" % x for x in w)
    print("paired runs, medians; ratio = figure / floor, median of the pairs")
    print(fmt.format(*HEADER))
    print(fmt.format(*("-" * x for x in w)))
    for c in cells[1:]:
        print(fmt.format(*c))


main()
