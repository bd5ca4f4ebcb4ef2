"""fittings_route.py — run headroom expressions for the reference checks
tests/ref/fittings-fluids.sh and tests/ref/pipes-fluids.sh.

Two routes to the same numbers:

  cli    the real program: the expressions become statements `NAME = EXPR`
         in ```calc fences of generated calc files, `HEADROOM check FILE
         --json` evaluates them, and the values are read from the JSON
         (values.NAME.si, or values.NAME.fields.FIELD.si for a record;
         DESIGN 2.5).
  probe  while the program cannot run a calc file, a small C driver
         (fittings_probe.c) is compiled against src/methods and asked the
         same questions line by line.

The route is `cli` when HEADROOM runs (`HEADROOM --version` exits 0),
otherwise `probe`; HEADROOM_ROUTE=cli|probe forces one. The route taken is
printed, so a run never hides which one it used.
"""

import json
import os
import subprocess
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))


def choose(headroom):
    forced = os.environ.get("HEADROOM_ROUTE")
    if forced in ("cli", "probe"):
        return forced
    try:
        r = subprocess.run([headroom, "--version"], capture_output=True, timeout=60)
        return "cli" if r.returncode == 0 else "probe"
    except (OSError, subprocess.SubprocessError):
        return "probe"


def run_cli(headroom, statements, chunk=400):
    """statements: list of (name, expr). Returns {name: json value entry},
    and a list of problems (exit statuses, diagnostics) to report."""
    values, problems = {}, []
    with tempfile.TemporaryDirectory() as tmp:
        for start in range(0, len(statements), chunk):
            part = statements[start:start + chunk]
            path = os.path.join(tmp, "ref%04d.calc.md" % (start // chunk))
            with open(path, "w", encoding="utf-8") as f:
                f.write("# generated reference cases\n\n```calc\n")
                for name, expr in part:
                    f.write("%s = %s\n" % (name, expr))
                f.write("```\n")
            r = subprocess.run([headroom, "check", path, "--json"], capture_output=True,
                               text=True, timeout=1800)
            if r.returncode not in (0, 1):
                problems.append("%s: exit status %d: %s" % (os.path.basename(path), r.returncode,
                                                             r.stderr.strip()[:2000]))
            try:
                doc = json.loads(r.stdout)
            except ValueError:
                problems.append("%s: output is not JSON: %s" % (os.path.basename(path),
                                                                r.stdout[:500]))
                continue
            for d in doc.get("diagnostics", []):
                if d.get("severity") == "error":
                    problems.append("%s:%s:%s: %s" % (os.path.basename(path), d.get("line"),
                                                      d.get("col"), d.get("message")))
            values.update(doc.get("values", {}))
    return values, problems


def build_probe():
    tmp = tempfile.mkdtemp(prefix="headroom-probe-")
    exe = os.path.join(tmp, "probe")
    src = [os.path.join(HERE, "fittings_probe.c")] + [
        os.path.join(ROOT, "src", "methods", n) for n in ("fittings.c", "pipes.c", "roughness.c")]
    cmd = [os.environ.get("CC", "cc"), "-std=c11", "-O1", "-g", "-fsanitize=address,undefined",
           "-I" + os.path.join(ROOT, "include"), "-I" + os.path.join(ROOT, "src")] + src + [
               "-lm", "-o", exe]
    subprocess.run(cmd, check=True)
    return exe


def run_probe(lines):
    exe = build_probe()
    r = subprocess.run([exe], input="\n".join(lines) + "\n", capture_output=True, text=True,
                       check=True)
    out = r.stdout.splitlines()
    if len(out) != len(lines):
        raise RuntimeError("probe answered %d of %d lines" % (len(out), len(lines)))
    return out


def si(entry, field=None):
    """The SI value of a JSON value entry (or of one of its fields)."""
    if entry is None:
        return None
    if field is not None:
        entry = entry.get("fields", {}).get(field)
        if entry is None:
            return None
    v = entry.get("si")
    return float(v) if v is not None else None
