#!/bin/sh
# pipes-fluids.sh — check pipe() dimensions and roughness() against
# python3-fluids.
#
# Reference: python3-fluids 1.0.22 (Debian package python3-fluids, modules
# fluids.piping and fluids.friction), run by Debian's /usr/bin/python3.
# Every row of ASME B36.10M, ASTM D1785, F441 and D2241 that fluids also
# tabulates, each asked in four spellings; tolerances (steel: wall 0.005 mm,
# od 0.05 mm, 0.5 mm above NPS 16, where fluids keeps the standard's rounded
# metric columns; 1e-9 m for the plastics) and what fluids lacks (ASTM B88,
# F876) are in pipes_fluids.py beside this script. Bad input (unknown size,
# class, standard) must exit 2 with `file:line:col: error:` at the argument.
# The program itself evaluates generated calc files (`$HEADROOM check FILE
# --json`); a program that does not run fails.
#
#   HEADROOM=build/san/headroom tests/ref/pipes-fluids.sh
#
# Prints each failure and ends with `pipes-fluids: N passed, M failed`;
# exits 1 on any failure.
set -eu

here=$(cd "$(dirname "$0")" && pwd)
HEADROOM=${HEADROOM:-build/headroom}
PYTHON=/usr/bin/python3   # Debian's interpreter (see DESIGN 2.8)

if ! "$PYTHON" -c 'import fluids' 2>/dev/null; then
    echo "pipes-fluids: python3-fluids is not importable by $PYTHON" >&2
    exit 1
fi
exec "$PYTHON" "$here/pipes_fluids.py" run "$HEADROOM"
