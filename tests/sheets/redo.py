#!/usr/bin/python3
"""tests/sheets/redo.py — re-do every substituted equation of a report from
the numbers it prints, as a plan reviewer with a calculator would.

Usage: redo.py LISTING.txt SHEETS.txt NAME

LISTING.txt is the text listing (`build --format text`), whose rows are the
report model's rows in one line each: `name = formula = substituted =
result`, for a solve `at x = root: lhs = rhs = value = value`, and for a
published method a call applied `with the values used: lhs = formula =
substituted = result`. SHEETS.txt
is pdftotext of the PDF of the same calc. For every row whose substituted
middle is arithmetic on printed quantities (a method call cannot be re-done
by hand and is counted apart), the middle is evaluated here from the printed
numbers: every unit is turned into its SI factor by GNU units (Debian's
`units`, a reference no one here wrote), the arithmetic by Python. The row is
true when the printed result lies within what the printed inputs can give:
half a unit of the result's last printed digit, plus the spread the
rounding of every printed input (half a unit of its last digit) causes.
Every number of the row must also be printed on the sheets (the PDF and the
listing render one model).

Prints one line per false row and a summary line
`NAME: T true, F false, M method calls, S not on the sheets`; exit 1 when
anything is false or missing.

With REDO_UNITS_CACHE set to a file, the factors GNU units gave are kept in
it (JSON) from one run to the next, so a suite that re-does many reports
asks units once for each distinct unit."""
import json
import math
import os
import re
import subprocess
import sys

FUNCS = {"sqrt": math.sqrt, "log10": math.log10, "ln": math.log, "exp": math.exp,
         "min": min, "max": max, "abs": abs}
_factor = {}
_asked = False  # a factor not in the cache file was asked of GNU units
VERBOSE = False


def cache_load():
    path = os.environ.get("REDO_UNITS_CACHE")
    if path and os.path.exists(path):
        with open(path, encoding="utf-8") as f:
            _factor.update(json.load(f))


def cache_save():
    path = os.environ.get("REDO_UNITS_CACHE")
    if path and _asked:
        with open(path + ".tmp", "w", encoding="utf-8") as f:
            json.dump(_factor, f)
        os.replace(path + ".tmp", path)


def si_factor(unit):
    """The SI factor of a unit by GNU units; None when it has none."""
    global _asked
    if unit in _factor:
        return _factor[unit]
    _asked = True
    u = unit
    # gauge and absolute pressure marks (DESIGN 2.9) are not units
    u = re.sub(r"\b(kPa|psi|Pa|MPa|bar)[ag]\b", r"\1", u)
    u = u.replace("degC", "K").replace("degF", "degR").replace("gpm", "(gal/min)")
    try:
        out = subprocess.run(["units", "-t", "-d", "15", u], capture_output=True, text=True,
                             timeout=10).stdout.strip()
    except (OSError, subprocess.SubprocessError):
        out = ""
    f = None
    m = re.match(r"^([-+0-9.eE]+)", out.split(" = ")[-1].strip()) if out else None
    if m:
        try:
            f = float(m.group(1))
        except ValueError:
            f = None
    elif out and not re.match(r"^[-+0-9.]", out.split(" = ")[-1].strip()):
        f = 1.0  # "1 kg / m s" form without a leading number is rare; a bare unit
    _factor[unit] = f
    return f


NUM = r"-?\d+(?:\.\d+)?(?:e[-+]?\d+)?"
UNIT = r"[A-Za-z°][A-Za-z0-9_°]*(?:\^-?\d+)?(?:[*/·](?:\(?[A-Za-z][A-Za-z0-9_]*(?:\^-?\d+)?\)?(?:\^-?\d+)?))*"


def split_top(s, sep):
    """Split at `sep` outside parentheses and quotes."""
    parts, depth, q, start, i = [], 0, False, 0, 0
    while i < len(s):
        c = s[i]
        if c == '"':
            q = not q
        elif not q and c == "(":
            depth += 1
        elif not q and c == ")":
            depth -= 1
        elif not q and depth == 0 and s.startswith(sep, i):
            parts.append(s[start:i])
            start = i + len(sep)
            i = start
            continue
        i += 1
    parts.append(s[start:])
    return parts


def half_unit(text):
    """Half a unit of the last printed digit of a number as printed."""
    m = re.match(r"^-?(\d+)(?:\.(\d+))?(?:e([-+]?\d+))?$", text)
    if not m:
        return 0.0
    dec = len(m.group(2) or "")
    exp = int(m.group(3) or 0)
    return 0.5 * 10.0 ** (exp - dec)


class NotArithmetic(Exception):
    pass


def tokens_of(expr):
    """The expression as Python with every printed quantity a placeholder;
    returns (python text, [(number text, si factor)])."""
    out, nums, i = [], [], 0
    qty = re.compile(r"(%s)(?: (%s))?" % (NUM, UNIT))
    while i < len(expr):
        c = expr[i]
        if c.isspace():
            i += 1
            continue
        if c.isdigit() or (c == "-" and i + 1 < len(expr) and expr[i + 1].isdigit() and
                           (not out or out[-1] in "(*/+-^,")):
            m = qty.match(expr, i)
            num, unit = m.group(1), m.group(2)
            end = m.end()
            while unit and unit.count(")") > unit.count("("):
                unit = unit[:-1]   # the closing parenthesis is the expression's
                end -= 1
            f = 1.0
            if unit:
                f = si_factor(unit)
                if f is None:
                    raise NotArithmetic("unit " + unit)
            nums.append((num, f))
            out.append("(V[%d])" % (len(nums) - 1))
            i = end
            continue
        if c.isalpha() or c == "_":
            m = re.match(r"[A-Za-z_][A-Za-z0-9_]*", expr[i:])
            word = m.group(0)
            if word == "pi":
                out.append("math.pi")
            elif word in FUNCS and expr[i + len(word):i + len(word) + 1] == "(":
                out.append("F['%s']" % word)
            else:
                raise NotArithmetic(word)
            i += len(word)
            continue
        if c == "^":
            out.append("**")
        elif c == "·":
            out.append("*")
        elif c in "()+-*/,":
            out.append(c)
        else:
            raise NotArithmetic(c)
        i += 1
    return "".join(out), nums


def evaluate(py, values):
    return eval(py, {"math": math, "F": FUNCS, "V": values, "__builtins__": {}})


def redo(middle, result):
    """True/False for the row, or None when it is not arithmetic."""
    py, nums = tokens_of(middle)
    m = re.match(r"^(%s)(?: (.+))?$" % NUM, result.strip())
    if not m:
        raise NotArithmetic("result " + result)
    rnum, runit = m.group(1), m.group(2)
    rf = si_factor(runit) if runit else 1.0
    if rf is None:
        raise NotArithmetic("unit " + runit)
    vals = [float(n) * f for n, f in nums]
    got = evaluate(py, vals) / rf
    # the spread the rounding of the printed inputs can cause
    spread = 0.0
    for k, (n, f) in enumerate(nums):
        h = half_unit(n)
        if h == 0:
            continue
        v2 = list(vals)
        v2[k] = (float(n) + h) * f
        spread += abs(evaluate(py, v2) / rf - got)
    tol = half_unit(rnum) + spread + 1e-12 * abs(got)
    return abs(got - float(rnum)) <= tol, got, tol


def sheet_text(path):
    t = open(path, encoding="utf-8").read()
    t = t.replace("−", "-").replace("\u2009", " ")
    # ×10ⁿ as pdftotext gives it ("1.235×10 -6" or "×10⁻⁶") -> e-notation
    sup = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")
    t = re.sub(r"×10 ?([-]?\d+|[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)", lambda m: "e" + m.group(1).translate(sup), t)
    return t


def main():
    global VERBOSE
    VERBOSE = "-v" in sys.argv
    cache_load()
    listing, sheets, name = [a for a in sys.argv[1:] if a != "-v"][:3]
    sheet = sheet_text(sheets)
    sheet_nums = set(re.findall(r"-?\d+(?:\.\d+)?(?:e-?\d+)?", sheet))
    true = false = calls = missing = 0
    for raw in open(listing, encoding="utf-8"):
        line = raw.rstrip("\n")
        code = split_top(line, "   #")[0].strip()
        # a method's formula with the values one call used (the model's uses)
        if code.startswith("with the values used: "):
            code = code[len("with the values used: "):]
        rows = []
        m = re.match(r"^([A-Za-z_][A-Za-z0-9_]*) = (.*)$", code)
        if m and " solve " not in code[:len(m.group(1)) + 9]:
            parts = split_top(m.group(2), " = ")
            if len(parts) == 3:
                rows.append((m.group(1), parts[1], parts[2]))
        # a check or finding: "check LABEL: formula : substituted : lhs OP rhs : verdict"
        m = re.match(r"^(?:check|finding) ([^:]*): (.*)$", code)
        if m:
            parts = split_top(m.group(2), " : ")
            if len(parts) == 4:
                rel = re.compile(r" (<=|>=|<|>|==|!=) ")
                sub_sides = [p for p in rel.split(parts[1]) if not rel.fullmatch(" " + p + " ")]
                val_sides = [p for p in rel.split(parts[2]) if not rel.fullmatch(" " + p + " ")]
                if len(sub_sides) == 2 and len(val_sides) == 2:
                    rows.append((m.group(1) + " (left side)", sub_sides[0], val_sides[0]))
                    rows.append((m.group(1) + " (right side)", sub_sides[1], val_sides[1]))
        m = re.match(r"^at ([A-Za-z_][A-Za-z0-9_]*) = [^:]*: (.*); residual", code)
        if m:
            parts = split_top(m.group(2), " = ")
            if len(parts) == 4:
                rows.append((m.group(1) + " (left side at the root)", parts[0], parts[2]))
                rows.append((m.group(1) + " (right side at the root)", parts[1], parts[3]))
        for sym, middle, result in rows:
            try:
                ok, got, tol = redo(middle, result)
            except NotArithmetic as e:
                calls += 1
                if VERBOSE:
                    print("  (not arithmetic: %s) %s = %s" % (e, sym, middle))
                continue
            except (ZeroDivisionError, ValueError, OverflowError, SyntaxError, TypeError) as e:
                print("  %s: %s cannot be re-done (%s)" % (name, code, e))
                false += 1
                continue
            if ok:
                true += 1
            else:
                false += 1
                print("  FALSE %s: %s = %s = %s; the printed numbers give %.6g (allowed %.3g)"
                      % (name, sym, middle, result, got, tol))
            for n in re.findall(NUM, middle + " " + result):
                if n not in sheet_nums and n.lstrip("-") not in sheet_nums and half_unit(n) != 0:
                    missing += 1
                    print("  NOT ON THE SHEETS %s: %s in %s = %s" % (name, n, sym, middle))
    cache_save()
    print("%s: %d true, %d false, %d method calls, %d not on the sheets" % (name, true, false, calls, missing))
    sys.exit(1 if false or missing else 0)


if __name__ == "__main__":
    main()
