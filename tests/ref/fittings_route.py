"""fittings_route.py — run headroom expressions for the reference checks
tests/ref/fittings-fluids.sh and tests/ref/pipes-fluids.sh.

The expressions become statements `NAME = EXPR` in ```calc fences of
generated calc files, `HEADROOM check FILE --json` evaluates them, and the
values are read from the JSON (values.NAME.si, or values.NAME.fields.FIELD.si
for a record; DESIGN 2.5). There is no other route: a program that does not
run fails the check.
"""

import json
import os
import subprocess
import tempfile


def require_cli(headroom):
    """Exit with a message unless HEADROOM runs (`HEADROOM --version`)."""
    try:
        r = subprocess.run([headroom, "--version"], capture_output=True, timeout=60)
        if r.returncode == 0:
            return
        why = "exit status %d" % r.returncode
    except (OSError, subprocess.SubprocessError) as e:
        why = str(e)
    raise SystemExit("%s --version failed (%s): the reference check needs the program" %
                     (headroom, why))


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
