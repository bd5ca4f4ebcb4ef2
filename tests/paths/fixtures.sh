# tests/paths/fixtures.sh — a fixtures column (DESIGN 2.11), sourced by
# tests/paths/run.
#
# tests/paths/fixtures.calc.md: a four-segment riser whose fixtures cell
# lists what each outlet takes off. Asserted:
#   - each segment's load is the sum of the loads downstream of its inlet,
#     checked in the calc itself against separate wsfu() sums (four checks
#     that hold, exit 0), and here to the values worked by hand from IPC
#     2018, Appendix E, Table E103.3(2): a bathroom group with a flush tank
#     3.6 wsfu, a private kitchen sink 1.4, laundry trays 1.4; one floor 5.0,
#     the top floor 6.4: R-4 6.4, R-3 11.4, R-2 16.4, R-1 21.4 wsfu;
#   - the text report has the load column and the fixture schedule (kind,
#     count, load each, total) with the row used cited;
#   - summing would differ: a demand table is concave in the load, so the
#     flows of separate loads added are not the flow of the summed load —
#     shown on a hand table in tests/unit/test_demand.c
#     (test_interpolation_by_hand), since no code's demand table ships;
#   - a changed fixture count is an input change for `headroom diff`.

fixtures_run() {
    local calc=tests/paths/fixtures.calc.md
    prun check "$calc" --json
    status_is 0 "fixtures: the four load checks hold"
    cp "$TMP/out" "$TMP/fixtures.json"
    json_near "$TMP/fixtures.json" 1e-12 riser.R_4.load=6.4 riser.R_3.load=11.4 \
        riser.R_2.load=16.4 riser.R_1.load=21.4
    prun build "$calc" --format text -o -
    status_is 0 "fixtures: build --format text"
    if grep -q '^  segment  *load  *Q ' "$TMP/out"; then ok; else no "fixtures: no load column in the text path table"; fi
    if grep -qE '^    R-4 +1 laundry tray +x +1\.400 += +1\.400$' "$TMP/out"; then ok; else
        no "fixtures: the schedule lacks 'R-4 1 laundry tray x 1.400 = 1.400'"; fi
    if grep -qF 'Water supply fixture units of a laundry trays (Private, Faucet): 1 cold, 1 hot, 1.4 total' "$TMP/out"; then ok; else
        no "fixtures: the laundry trays row is not cited"; fi
    # a changed fixture count is an input change
    sed 's/| 1 bathroom group flush tank, 1 kitchen sink, 1 laundry tray |/| 2 bathroom group flush tank, 1 kitchen sink, 1 laundry tray |/' \
        "$calc" >"$TMP/fixtures-b.calc.md"
    cp "$calc" "$TMP/fixtures-a.calc.md"
    prun diff "$TMP/fixtures-a.calc.md" "$TMP/fixtures-b.calc.md"
    if grep -qF '  riser.R_4.fixtures = "1 bathroom group flush tank, 1 kitchen sink, 1 laundry tray" → "2 bathroom group flush tank, 1 kitchen sink, 1 laundry tray"  [line 24]' "$TMP/out" &&
        grep -q '^inputs (1):$' "$TMP/out" && grep -qF 'riser.R_1: load (+16.8 %); from riser.R_4.fixtures' "$TMP/out"; then ok; else
        no "fixtures: diff does not report the changed fixture count as an input (exit $rc)"; sed 's/^/    | /' "$TMP/out" | head -20; fi
    status_is 1 "fixtures: diff of two revisions that differ exits 1"
}
