# tests/paths/demand_illinois.sh — hunter() under `code: Illinois 2014`, the
# Illinois Plumbing Code's Appendix A, Table N (demand against load for flush
# tank systems, 77 Ill. Adm. Code 890, as the state publishes it; every row
# is checked in tests/unit/test_demand.c), through the real program; sourced
# by tests/paths/run.
#
# tests/paths/demand_illinois.calc.md, worked by hand from Table N's rows:
#   hunter(17):           11.6 + (14 - 11.6)*(17 - 16)/(20 - 16)     = 12.2 gal/min
#   hunter(6*17 = 102):   43.5 + (48 - 43.5)*(102 - 100)/(120 - 100) = 43.95 gal/min
#   hunter(2000):         the last row, 320 gal/min
#   6*hunter(17) = 73.2 gal/min: summing the floors' demands overstates the
#     riser's 43.95 (both of the calc's checks hold)
# (1 gal/min = 231 in^3/min = 6.30901964e-5 m^3/s), to 1e-9 in JSON; the
# method cites the code and Table N; the text report shows the riser's row
# and the rows read.

demand_illinois_run() {
    local calc=tests/paths/demand_illinois.calc.md
    prun check "$calc" --json
    status_is 0 "demand_illinois: both checks hold"
    cp "$TMP/out" "$TMP/demand_illinois.json"
    json_near "$TMP/demand_illinois.json" 1e-9 Q_floor=0.000769700396080 Q_riser=0.002772814131780 \
        Q_top=0.020188862848000 Q_summed=0.004618202376480
    if grep -qF '"reference": "Illinois Plumbing Code, 77 Ill. Adm. Code 890, as amended at 38 Ill. Reg. 9940, effective April 24, 2014 (Illinois Department of Public Health), Appendix A, Table N' "$TMP/demand_illinois.json"
    then ok; else no "demand_illinois: the method does not cite the Illinois code's Table N"; fi
    if grep -qF '"code": "Illinois 2014"' "$TMP/demand_illinois.json"; then ok; else
        no "demand_illinois: the JSON meta lacks code Illinois 2014"; fi
    prun build "$calc" --format text -o -
    status_is 0 "demand_illinois: build --format text"
    if grep -qF 'Q_riser = hunter(L_riser, system="flush tank") = hunter(102.0, system="flush tank") = 43.95 gal/min' "$TMP/out"
    then ok; else no "demand_illinois: the text report lacks the riser's 43.95 gal/min row"; fi
    if grep -qF 'linear between the rows L₁ = 100 wsfu, Q₁ = 43.5 gal/min and L₂ = 120 wsfu, Q₂ = 48 gal/min' "$TMP/out"; then ok; else
        no "demand_illinois: the method does not name the rows read"; fi
}
