# tests/paths/demand_curve.sh — `demand: NAME`, a path's segment flows from
# its fixtures by a curve of demand against load the calc gives (DESIGN 2.11
# with 2.10), sourced by tests/paths/run.
#
# No code's demand table ships (no published copy could be verified), so a
# project enters its adopted code's table as a ```curve block and names it
# in `demand:`. tests/paths/demand_curve.calc.md: the riser of fixtures.calc.md
# (loads R-4 6.4, R-3 11.4, R-2 16.4, R-1 21.4 wsfu from IPC 2018 Table
# E103.3(2), worked in fixtures.sh) on an invented test curve T (1 → 3,
# 5 → 8, 10 → 12, 20 → 18, 40 → 26 gal/min). Asserted:
#   - the segment flows worked by hand, linear between T's rows:
#       R-4  6.4: 8 + (12 - 8)*(6.4 - 5)/(10 - 5)    =  9.12 gal/min
#       R-3 11.4: 12 + (18 - 12)*(11.4 - 10)/(20 - 10) = 12.84
#       R-2 16.4: 12 + (18 - 12)*(16.4 - 10)/(20 - 10) = 15.84
#       R-1 21.4: 18 + (26 - 18)*(21.4 - 20)/(40 - 20) = 18.56
#     (1 gal/min = 231 in^3/min = 6.30902e-5 m^3/s), to 1e-9 in JSON, and in
#     the calc itself segment by segment against separate T() readings of the
#     summed loads (four checks hold);
#   - summing the outlets' demands instead gives T(6.4) + 3*T(5) = 9.12 +
#     3*8 = 33.12 gal/min for R-1, not 18.56 (a check in the calc);
#   - the text report's path table shows load and flow per segment and the
#     method names the curve;
#   - with `interpolate: loglog` the curve is read as a power law between
#     rows: R-4 8*(6.4/5)^(ln(12/8)/ln(10/5)) = 9.242805 gal/min, R-1
#     18*(21.4/20)^(ln(26/18)/ln(40/20)) = 18.657826 gal/min (to 1e-9).
# Bad input (a load outside the curve, a curve of the wrong dimensions, a
# name that is not a curve) is in tests/bad/path_demand_curve.

demand_curve_run() {
    local calc=tests/paths/demand_curve.calc.md
    prun check "$calc" --json
    status_is 0 "demand_curve: the five checks hold"
    cp "$TMP/out" "$TMP/demand_curve.json"
    json_near "$TMP/demand_curve.json" 1e-9 riser.R_4.Q=0.000575382591168 riser.R_3.Q=0.000810078121776 \
        riser.R_2.Q=0.000999348710976 riser.R_1.Q=0.001170954045184 Q_summed=0.002089547304768
    json_near "$TMP/demand_curve.json" 1e-12 riser.R_4.load=6.4 riser.R_1.load=21.4
    prun build "$calc" --format text -o -
    status_is 0 "demand_curve: build --format text"
    if grep -qE '^  R-1 +21\.40 +18\.56 ' "$TMP/out" && grep -qE '^  R-4 +6\.400 +9\.120 ' "$TMP/out"; then ok; else
        no "demand_curve: the path table lacks load and flow for R-1 (21.40, 18.56) and R-4 (6.400, 9.120)"; fi
    if grep -qF 'method: Peak demand of each segment'"'"'s summed fixture load by the curve T (demand against load), linear between its rows' "$TMP/out"; then ok; else
        no "demand_curve: the method does not name the curve T"; fi
    # the same riser on the curve read log-log
    sed 's/^```curve T$/```curve T\ninterpolate: loglog/' "$calc" >"$TMP/demand_loglog.calc.md"
    prun check "$TMP/demand_loglog.calc.md" --json
    status_is 0 "demand_curve: the log-log riser's checks hold"
    cp "$TMP/out" "$TMP/demand_loglog.json"
    json_near "$TMP/demand_loglog.json" 1e-9 riser.R_4.Q=0.0005831303939220423 riser.R_1.Q=0.0011771258877694981
}
