#!/usr/bin/env bash
# bench-sheets.sh — a benchmark, not a test: generate a calc of about 100
# sheets (numbered sections of prose, chains of definitions with fractions,
# powers and roots, checks) and time `headroom build` to PDF. Target: under
# 1 s on the project machine. Prints sheets, seconds and peak memory.
set -eu
cd "$(dirname "$0")/../.."
HEADROOM=${HEADROOM:-build/headroom}
SECTIONS=${SECTIONS:-100}
T=$(mktemp -d)
trap 'rm -rf "$T"' EXIT
f="$T/big.calc.md"
{
    printf -- '---\ntitle: Generated benchmark package\nproject: Benchmark\nnumber: B-100\nrevision: A\ndate: 2024-01-01\nprepared: Bench\nchecked: Mark\nstatus: preliminary\n---\n\n'
    for ((s = 1; s <= SECTIONS; s++)); do
        printf '# Section %d\n\nThis section repeats a riser calculation with a different flow so that the\nreport runs to many sheets. The **velocity** and the *head loss* are computed\nfor each case.\n\n```calc\n' "$s"
        printf 'Q_%d = %d gal/min   # design flow\n' "$s" $((40 + s))
        printf 'D_%d = 2.067 in     # bore\n' "$s"
        printf 'A_%d = pi * D_%d^2 / 4   # area\n' "$s" "$s"
        printf 'V_%d = Q_%d / A_%d as ft/s   # velocity\n' "$s" "$s" "$s"
        printf 'h_%d = 0.02 * 100 ft / D_%d * V_%d^2 / (2 * g) as ft   # friction loss\n' "$s" "$s" "$s"
        printf 'r_%d = sqrt(h_%d / (1 ft)) * (1 + V_%d / (10 ft/s))   # a root and a fraction\n' "$s" "$s" "$s"
        printf 'check velocity %d: V_%d <= 12 ft/s   # velocity limit\n' "$s" "$s"
        printf '```\n\n'
    done
} >"$f"
/usr/bin/time -f '%e s, %M KiB peak' -o "$T/time" "$HEADROOM" build "$f" -o "$T/big.pdf" >/dev/null
echo "sheets: $(pdfinfo "$T/big.pdf" 2>/dev/null | sed -n 's/^Pages: *//p'); $(cat "$T/time")"
