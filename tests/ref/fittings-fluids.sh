#!/bin/sh
# fittings-fluids.sh — check k_fitting() against python3-fluids.
#
# Reference: python3-fluids 1.0.22 (Debian package python3-fluids, module
# fluids.fittings), run by Debian's /usr/bin/python3. Over 5000 cases in five
# families (Crane f_T, Crane L/D, Crane entrances/exit/changes of bore,
# Hooper 2-K, Darby 3-K), each with its own stated tolerance; the cases, the
# tolerances and the reasons for them are in fittings_fluids.py beside this
# script. The program itself evaluates generated calc files
# (`$HEADROOM check FILE --json`); a program that does not run fails.
#
#   HEADROOM=build/san/headroom tests/ref/fittings-fluids.sh
#
# Prints each failure and ends with `fittings-fluids: N passed, M failed`;
# exits 1 on any failure.
set -eu

here=$(cd "$(dirname "$0")" && pwd)
HEADROOM=${HEADROOM:-build/headroom}
PYTHON=/usr/bin/python3   # Debian's interpreter (see DESIGN 2.8)

if ! "$PYTHON" -c 'import fluids' 2>/dev/null; then
    echo "fittings-fluids: python3-fluids is not importable by $PYTHON" >&2
    exit 1
fi

exec "$PYTHON" "$here/fittings_fluids.py" run "$HEADROOM"
