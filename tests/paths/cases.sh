# tests/paths/cases.sh — a 30-row cases table, sourced by tests/paths/run.
#
# tests/paths/cases.calc.md runs a three-segment copper riser (the path of
# DESIGN 2.2a's example) over 30 rows of Q, p0 and T; row 17 is supplied at
# 35 psi and must fail `end pressure` (p_end >= 25 psi), every other row
# holds both checks. What is asserted:
#   - the JSON has one cases table with 30 rows, each with the three shown
#     values and both check verdicts;
#   - each row equals an ordinary evaluation of the calc with that row's
#     values written into the calc block (30 separate runs of
#     `check --json`), to 1e-12 relative: p_end, V_max and w.rho, and the
#     verdict and utilisation of each check — so every row really was
#     re-evaluated with its own inputs, the water record included;
#   - exactly row 17 (its source line) fails, only `end pressure`, and
#     rows_failing is 1; the text report says "30 rows, 1 with a failing
#     check" and marks case 17 alone with FAILS: [end pressure];
#   - the main evaluation (Q = 60 gal/min, p0 = 80 psi) holds, exit 0.
# The physics of a path is checked elsewhere (tests/ref/paths-fluids.sh,
# tests/paths/worked.sh); this is the machinery of cases.

cases_run() {
    local calc=tests/paths/cases.calc.md
    prun check "$calc" --json
    # The main evaluation holds, but a check fails in one case row, and a
    # check failing anywhere makes `check` exit 1 (DESIGN 2.5).
    status_is 1 "cases: check --json exits 1 for the failing case row"
    cp "$TMP/out" "$TMP/cases.json"
    local rows_dir="$TMP/case-rows"
    mkdir -p "$rows_dir"
    # One calc per row with the row's values as the inputs.
    "$PY" - "$calc" "$rows_dir" <<'PYEOF'
import re, sys
src, out = sys.argv[1], sys.argv[2]
text = open(src, encoding="utf-8").read()
table = text[text.index("```cases"):]
rows = [l for l in table.splitlines() if l.startswith("| ") and "gal/min" in l]
for i, l in enumerate(rows):
    q, p0, t = [c.strip() for c in l.strip().strip("|").split("|")]
    body = text[:text.index("```cases")]
    for old, new in (("T = 60 degF", "T = " + t), ("p0 = 80 psi", "p0 = " + p0),
                     ("Q = 60 gal/min", "Q = " + q)):
        assert body.count(old + "\n") == 1, old
        body = body.replace(old + "\n", new + "\n")
    open("%s/row%02d.calc.md" % (out, i + 1), "w", encoding="utf-8").write(body)
assert len(rows) == 30, len(rows)
PYEOF
    local r
    for r in "$rows_dir"/row*.calc.md; do
        timeout 20 "$H" check "$r" --json >"${r%.calc.md}.json" 2>"${r%.calc.md}.err"
        if grep -aqE 'AddressSanitizer|LeakSanitizer|runtime error' "${r%.calc.md}.err"; then
            no "sanitizer report from: headroom check $r"
        fi
    done
    "$PY" - "$TMP/cases.json" "$rows_dir" "$calc" >"$TMP/cases.result" <<'PYEOF'
import json, sys
doc = json.load(open(sys.argv[1]))
rows_dir, calc = sys.argv[2], sys.argv[3]
src_lines = open(calc, encoding="utf-8").read().splitlines()
ok = bad = 0
def check(cond, what):
    global ok, bad
    if cond:
        ok += 1
    else:
        bad += 1
        print("FAIL: cases: " + what)
def near(a, b, rel=1e-12):
    return a is not None and b is not None and abs(a - b) <= rel * abs(b)
check(len(doc.get("cases", [])) == 1, "one cases table in the JSON")
ct = doc["cases"][0]
rows = ct.get("rows", [])
check(len(rows) == 30, "30 rows in the JSON, found %d" % len(rows))
check(ct.get("inputs") == ["Q", "p0", "T"], "inputs Q, p0, T: %r" % ct.get("inputs"))
check(ct.get("rows_failing") == 1, "rows_failing is 1, found %r" % ct.get("rows_failing"))
failing_line = next(i + 1 for i, l in enumerate(src_lines) if l.startswith("| 52 gal/min | 35 psi"))
for i, row in enumerate(rows):
    n = i + 1
    ref = json.load(open("%s/row%02d.json" % (rows_dir, n)))
    vals = ref["values"]
    want = {"riser.p_end": vals["riser"]["fields"]["p_end"]["si"],
            "riser.V_max": vals["riser"]["fields"]["V_max"]["si"],
            "w.rho": vals["w"]["fields"]["rho"]["si"]}
    shown = row.get("shown", {})
    for k, v in want.items():
        got = shown.get(k, {}).get("si")
        check(near(got, v), "row %d %s = %r, the row evaluated alone gives %r" % (n, k, got, v))
    by_label = {c["label"]: c for c in row.get("checks", [])}
    check(len(by_label) == 2, "row %d carries 2 check verdicts" % n)
    for c in ref["checks"]:
        rc = by_label.get(c["label"], {})
        check(rc.get("holds") == c["holds"], "row %d check %s holds=%r, alone %r" % (n, c["label"], rc.get("holds"), c["holds"]))
        check(near(rc.get("utilization"), c["utilization"]), "row %d check %s utilisation" % (n, c["label"]))
    fails = [l for l, c in by_label.items() if not c.get("holds")]
    if n == 17:
        check(fails == ["end pressure"], "row 17 fails exactly 'end pressure', found %r" % fails)
        check(row.get("line") == failing_line, "row 17 at line %d, JSON says %r" % (failing_line, row.get("line")))
        # the independent verdict: p_end below 25 psi
        check(want["riser.p_end"] < 25 * 6894.757293168361, "row 17 p_end is below 25 psi")
    else:
        check(fails == [], "row %d holds every check, found failing %r" % (n, fails))
    check(row.get("failing") == len(fails), "row %d failing count" % n)
print("result %d %d" % (ok, bad))
PYEOF
    grep -v '^result ' "$TMP/cases.result"
    local rp rf
    read -r _ rp rf < <(grep '^result ' "$TMP/cases.result" || echo "result 0 1")
    passed=$((passed + rp)); failed=$((failed + rf))

    prun build "$calc" --format text -o -
    status_is 0 "cases: build --format text"
    line_is "cases: 30 rows, 1 with a failing check"
    line_is "case 17: Q = 52 gal/min; p0 = 35 psi; T = 152 degF; riser.p_end = 15.85 psi; riser.V_max = 5.391 ft/s; w.rho = 61.16 lbm/ft^3; FAILS: [end pressure]"
    local nfail nhold
    nfail=$(grep -c '^  case [0-9]*: .*FAILS' "$TMP/out")
    nhold=$(grep -c '^  case [0-9]*: .*; all checks hold$' "$TMP/out")
    if [ "$nfail" -eq 1 ] && [ "$nhold" -eq 29 ]; then ok; else no "cases text: $nfail failing and $nhold holding rows, expected 1 and 29"; fi
}
