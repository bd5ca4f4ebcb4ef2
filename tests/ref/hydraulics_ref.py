"""hydraulics_ref.py - shared driver of the water-, friction- and hydraulics-
reference checks: writes calc statements into a calc file, runs the real
program (`$HEADROOM check FILE --json`, default build/headroom) and returns
the evaluated values and diagnostics, then tallies comparisons against an
outside library with a stated relative tolerance.

Run by /usr/bin/python3 (Debian's interpreter, which sees python3-fluids and
python3-iapws)."""
import json
import os
import subprocess
import sys
import tempfile

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))


def headroom():
    exe = os.environ.get("HEADROOM", "build/headroom")
    if not os.path.isabs(exe):
        exe = os.path.join(ROOT, exe)
    if not os.access(exe, os.X_OK):
        sys.stderr.write("reference check: %s is not built (make)\n" % exe)
        sys.exit(2)
    return exe


def run_calc(statements, title="reference check"):
    """statements: list of 'name = expr' lines. Returns (values, diagnostics)."""
    text = "# %s\n\n```calc\n%s\n```\n" % (title, "\n".join(statements))
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "ref.calc.md")
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
        proc = subprocess.run([headroom(), "check", path, "--json"], stdout=subprocess.PIPE,
                              stderr=subprocess.PIPE, timeout=600)
    if proc.returncode not in (0, 1):
        sys.stderr.write(proc.stderr.decode("utf-8", "replace")[-1500:])
        sys.stderr.write("reference check: headroom exited with %d\n" % proc.returncode)
    try:
        doc = json.loads(proc.stdout.decode("utf-8"))
    except ValueError:
        sys.stderr.write("reference check: no JSON from headroom\n")
        sys.exit(2)
    return doc.get("values", {}), doc.get("diagnostics", [])


def num(x):
    """A float as a calc literal that reads back to the same double."""
    return repr(float(x))


class Tally:
    def __init__(self, name):
        self.name = name
        self.passed = 0
        self.failed = 0
        self.worst = {}

    def check(self, what, got, want, rel, family=None):
        if family is not None and got is not None and want:
            err = abs(got - want) / abs(want)
            self.worst[family] = max(self.worst.get(family, 0.0), err)
        if got is not None and want != 0 and abs(got - want) <= rel * abs(want):
            self.passed += 1
            return True
        if got is not None and want == 0 and got == 0:
            self.passed += 1
            return True
        self.failed += 1
        if self.failed <= 25:
            err = abs(got - want) / abs(want) if got is not None and want else float("nan")
            print("FAIL %s: got %r, want %r (relative error %.3g > %.3g)" % (what, got, want, err, rel))
        return False

    def finish(self):
        for fam in sorted(self.worst):
            print("  %-24s worst relative error %.3g" % (fam, self.worst[fam]))
        print("%s: %d passed, %d failed" % (self.name, self.passed, self.failed))
        sys.exit(1 if self.failed else 0)


def si(values, name, field=None):
    v = values.get(name)
    if v is None:
        return None
    if field is not None:
        v = v.get("fields", {}).get(field)
        if v is None:
            return None
    return v.get("si")
