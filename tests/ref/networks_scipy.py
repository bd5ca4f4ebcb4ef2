"""networks_scipy.py - ```network blocks of the real program against an
independent solution with Debian's python3-scipy, python3-fluids and
python3-iapws.

Sources (the versions found are printed):
  python3-scipy 1.10      scipy.optimize.root (MINPACK hybrd, Powell's
                          hybrid method) on the junction heads, and
                          scipy.optimize.brentq for each link's flow
  python3-fluids 1.0.22   fluids.friction.Colebrook (exact solution)
  python3-iapws 1.5.x     iapws.IAPWS97 (IF97 region 1 density) and
                          iapws._iapws._Viscosity (IAPWS 2008 viscosity)
                          at T and one standard atmosphere

The reference is a different algorithm from the program's (a gradient
method on flows and heads together, with a sparse Cholesky solve): here the
unknowns are the junction heads alone; for given heads each link's flow is
the root of h(Q) = H_from - H_to found by bracketing (brentq), and the
heads are those that make the continuity residual at every junction zero,
found by Powell's hybrid method. Per link,
  h(Q) = (f*L/D + K) * Q*|Q| / (2*g*A^2),  f = 64/Re below Re 2000, else
         Colebrook(Re, eps/D) (fluids) from Re 4000, and between them the
         straight line in Re from 64/2000 to Colebrook at 4000 that the
         program uses in the transition zone
  h(Q) = 10.67*L*|Q|^1.852/(C^1.852*D^4.87) * sign(Q) + K*Q*|Q|/(2*g*A^2)
         (Hazen-Williams, SI form)
Pipe bores and roughnesses are read from our own pipe() output (they are
checked against fluids.piping in tests/ref/pipes-fluids.sh).

Networks: seeded (random.Random(seed), deterministic) grids of loops with
one or two supplies, demands 0.5-4 L/s, NPS 2-6 schedule 40 steel; one
Hazen-Williams grid; and branched trees solved by a hand march (each link's
flow is the sum of the demands beyond it, heads are marched from the
supply), which needs no solver at all. Every link flow and every node head
must agree to 1e-6 relative (flows relative to the largest flow in the
network, so a loop link that carries almost nothing is still held to
1e-6 of the network's flows).

    networks_scipy.py run HEADROOM
"""
import json
import math
import os
import random
import subprocess
import sys
import tempfile

import fluids
import iapws
import scipy
from fluids.friction import Colebrook
from iapws import IAPWS97
from iapws._iapws import _Viscosity
from scipy.optimize import brentq, root

G = 9.80665
TOL = 1e-6
SIZES = ["2", "3", "4", "6"]


def water(T):
    st = IAPWS97(T=T, P=0.101325)
    return st.rho, _Viscosity(st.rho, T)


def link_h(Q, L, D, eps, K, rho, mu, hw_C=None):
    A = math.pi * D * D / 4
    q = abs(Q)
    minor = K * Q * q / (2 * G * A * A)
    if hw_C is not None:
        return math.copysign(10.67 * L * q ** 1.852 / (hw_C ** 1.852 * D ** 4.87), Q) + minor
    if q == 0:
        return 0.0
    Re = rho * (q / A) * D / mu
    if Re < 2000:
        f = 64 / Re
    elif Re < 4000:  # the transition line of src/network.c
        f = 64 / 2000 + (Colebrook(4000, eps / D) - 64 / 2000) * (Re - 2000) / 2000
    else:
        f = Colebrook(Re, eps / D)
    return (f * L / D + K) * Q * q / (2 * G * A * A)


def headroom():
    return sys.argv[2] if len(sys.argv) > 2 else os.environ.get("HEADROOM", "build/headroom")


def run_doc(text):
    with tempfile.TemporaryDirectory() as d:
        path = os.path.join(d, "net.calc.md")
        with open(path, "w") as f:
            f.write(text)
        proc = subprocess.run([headroom(), "build", path, "--format", "json", "-o", "-"],
                              stdout=subprocess.PIPE, stderr=subprocess.PIPE, timeout=600)
    if proc.returncode not in (0, 1):
        raise RuntimeError(proc.stderr.decode("utf-8", "replace"))
    return json.loads(proc.stdout.decode("utf-8"))


def grid(seed, hw=False, two_supplies=False):
    """A rows x cols grid of junctions, supply R joined to the corner."""
    rnd = random.Random(seed)
    rows, cols = rnd.randint(3, 5), rnd.randint(3, 6)
    nodes, links = [], []
    nodes.append(("R", rnd.uniform(0, 5), None, rnd.uniform(45, 70)))
    for r in range(rows):
        for c in range(cols):
            nodes.append(("J%d_%d" % (r, c), rnd.uniform(0, 10), rnd.uniform(0.5, 4.0), None))
    if two_supplies:
        nodes.append(("S", rnd.uniform(0, 5), None, rnd.uniform(40, 60)))
    links.append(("M1", "R", "J0_0", "6", rnd.uniform(50, 200), rnd.uniform(0, 3)))
    if two_supplies:
        links.append(("M2", "S", "J%d_%d" % (rows - 1, cols - 1), "6", rnd.uniform(50, 200), 0.0))
    k = 0
    for r in range(rows):
        for c in range(cols):
            for dr, dc in ((0, 1), (1, 0)):
                rr, cc = r + dr, c + dc
                if rr < rows and cc < cols:
                    k += 1
                    a, b = "J%d_%d" % (r, c), "J%d_%d" % (rr, cc)
                    if rnd.random() < 0.3:
                        a, b = b, a  # links drawn against the flow too
                    links.append(("P%d" % k, a, b, rnd.choice(SIZES), rnd.uniform(60, 400),
                                  rnd.choice([0.0, 0.0, 0.5, 2.0])))
    return nodes, links, hw


def tree(seed):
    rnd = random.Random(seed)
    nodes = [("R", 0.0, None, rnd.uniform(40, 60))]
    links = []
    n = rnd.randint(6, 14)
    for i in range(1, n + 1):
        parent = "R" if i == 1 else "T%d" % rnd.randint(1, i - 1)
        nodes.append(("T%d" % i, rnd.uniform(0, 8), rnd.uniform(0.3, 3.0), None))
        links.append(("B%d" % i, parent, "T%d" % i, rnd.choice(["3", "4", "6"]), rnd.uniform(20, 150),
                      rnd.choice([0.0, 1.0])))
    return nodes, links, False


def calc_text(nodes, links, hw, T_C, C=130):
    out = ["---", "title: generated network", "units: SI", "---", "", "```calc",
           "w = water(%r degC)" % T_C]
    for s in SIZES:
        out.append('p%s = pipe("ASME B36.10M", "%s", "40")' % (s, s))
    out += ["```", "", "```network net", "fluid: w"]
    if hw:
        out.append("loss: hazen_williams")
    out += ["", "| node | elevation | demand | head |", "|---|---|---|---|"]
    for (nid, z, q, h) in nodes:
        out.append("| %s | %r m | %s | %s |" % (nid, z, "%r L/s" % q if q is not None else "",
                                                 "%r m" % h if h is not None else ""))
    out += ["", "| link | from | to | pipe | length | K |%s" % (" C |" if hw else ""),
            "|---|---|---|---|---|---|%s" % ("---|" if hw else "")]
    for (lid, a, b, size, L, K) in links:
        out.append("| %s | %s | %s | p%s | %r m | %r |%s" % (lid, a, b, size, L, K, " %d |" % C if hw else ""))
    out += ["```", ""]
    return "\n".join(out)


def pipe_dims(doc):
    dims = {}
    for s in SIZES:
        f = doc["values"]["p" + s]["fields"]
        dims[s] = (f["id"]["si"], f["roughness"]["si"])
    return dims


def solve_reference(nodes, links, dims, rho, mu, hw, C=130):
    names = [n[0] for n in nodes]
    fixed = {n[0]: n[3] for n in nodes if n[3] is not None}
    demand = {n[0]: (n[2] or 0.0) / 1000.0 for n in nodes}
    junctions = [n for n in names if n not in fixed]
    idx = {n: i for i, n in enumerate(junctions)}

    def flow(link, H):
        lid, a, b, size, L, K = link
        D, eps = dims[size]
        dh = H[a] - H[b]
        if dh == 0:
            return 0.0
        g = lambda Q: link_h(Q, L, D, eps, K, rho, mu, C if hw else None) - dh
        hi = 1e-3
        while g(math.copysign(hi, dh)) * math.copysign(1, dh) < 0:
            hi *= 2
        lo, up = (0.0, hi) if dh > 0 else (-hi, 0.0)
        return brentq(g, lo, up, xtol=1e-16, rtol=1e-15, maxiter=500)

    def heads(x):
        H = dict(fixed)
        for n in junctions:
            H[n] = x[idx[n]]
        return H

    def residual(x):
        H = heads(x)
        r = [0.0] * len(junctions)
        for link in links:
            Q = flow(link, H)
            if link[2] in idx:
                r[idx[link[2]]] += Q
            if link[1] in idx:
                r[idx[link[1]]] -= Q
        return [r[idx[n]] - demand[n] for n in junctions]

    x0 = [min(fixed.values()) - 5.0] * len(junctions)
    sol = root(residual, x0, method="hybr", options={"xtol": 1e-14, "maxfev": 20000})
    H = heads(sol.x)
    worst = max(abs(v) for v in residual(sol.x))
    Q = {link[0]: flow(link, H) for link in links}
    return H, Q, worst


def march(nodes, links, dims, rho, mu):
    """A tree by hand: flows from the demands beyond, heads from the supply."""
    demand = {n[0]: (n[2] or 0.0) / 1000.0 for n in nodes}
    children = {}
    for link in links:
        children.setdefault(link[1], []).append(link)

    def beyond(node):
        return demand[node] + sum(beyond(l[2]) for l in children.get(node, []))

    H = {n[0]: n[3] for n in nodes if n[3] is not None}
    Q = {}
    stack = [n for n in H]
    while stack:
        a = stack.pop()
        for link in children.get(a, []):
            lid, _, b, size, L, K = link
            D, eps = dims[size]
            Q[lid] = beyond(b)
            H[b] = H[a] - link_h(Q[lid], L, D, eps, K, rho, mu)
            stack.append(b)
    return H, Q


def compare(tag, doc, H_ref, Q_ref, fails):
    net = doc["values"]["net"]["fields"]
    qmax = max(abs(q) for q in Q_ref.values())
    n = 0
    for lid, q in Q_ref.items():
        got = net[lid]["fields"]["Q"]["si"]
        n += 1
        if abs(got - q) > TOL * qmax:
            fails.append("%s link %s: Q %.12g, reference %.12g" % (tag, lid, got, q))
    for nid, h in H_ref.items():
        got = net[nid]["fields"]["head"]["si"]
        n += 1
        if abs(got - h) > TOL * abs(h):
            fails.append("%s node %s: head %.12g, reference %.12g" % (tag, nid, got, h))
    return n


def main():
    if len(sys.argv) < 2 or sys.argv[1] != "run":
        print(__doc__)
        return 2
    print("networks-scipy: scipy %s, fluids %s, iapws %s" % (scipy.__version__, fluids.__version__,
                                                              iapws.__version__))
    fails, checked, networks = [], 0, 0
    cases = [(seed, grid(seed), 15.0) for seed in range(1, 7)]
    cases.append((7, grid(7, two_supplies=True), 40.0))
    cases.append((8, grid(8, hw=True), 15.0))
    for seed, (nodes, links, hw), T_C in cases:
        doc = run_doc(calc_text(nodes, links, hw, T_C))
        if "net" not in doc["values"] or doc["values"]["net"].get("kind") != "record":
            fails.append("grid %d: the program did not solve it: %s" % (seed, doc.get("diagnostics")))
            continue
        rho, mu = water(T_C + 273.15)
        H, Q, worst = solve_reference(nodes, links, pipe_dims(doc), rho, mu, hw)
        if worst > 1e-12:
            fails.append("grid %d: the reference did not converge (residual %g)" % (seed, worst))
            continue
        checked += compare("grid %d%s" % (seed, " (Hazen-Williams)" if hw else ""), doc, H, Q, fails)
        networks += 1
    for seed in range(11, 15):
        nodes, links, hw = tree(seed)
        doc = run_doc(calc_text(nodes, links, hw, 20.0))
        if "net" not in doc["values"] or doc["values"]["net"].get("kind") != "record":
            fails.append("tree %d: the program did not solve it: %s" % (seed, doc.get("diagnostics")))
            continue
        rho, mu = water(293.15)
        H, Q = march(nodes, links, pipe_dims(doc), rho, mu)
        checked += compare("tree %d" % seed, doc, H, Q, fails)
        networks += 1
    for f in fails:
        print("FAIL " + f)
    print("networks-scipy: %d networks, %d flows and heads compared at %g relative" % (networks, checked, TOL))
    print("networks-scipy: %d passed, %d failed" % (checked, len(fails)))
    return 1 if fails else 0


if __name__ == "__main__":
    sys.exit(main())
