#!/bin/sh
# networks-scipy.sh — check ```network blocks against an independent solve.
#
# Reference: python3-scipy (scipy.optimize.root, brentq), python3-fluids
# (Colebrook) and python3-iapws (water), run by Debian's /usr/bin/python3;
# seeded looped grids against a Newton-type solve of junction continuity,
# branched trees against a hand march. See networks_scipy.py beside this
# script for the method, the networks and the tolerance (1e-6 relative).
#
#   HEADROOM=build/san/headroom tests/ref/networks-scipy.sh
#
# Ends with `networks-scipy: N passed, M failed`; exits 1 on any failure.
set -eu

here=$(cd "$(dirname "$0")" && pwd)
HEADROOM=${HEADROOM:-build/headroom}
PYTHON=/usr/bin/python3   # Debian's interpreter (see DESIGN 2.8)

if ! "$PYTHON" -c 'import scipy, fluids, iapws' 2>/dev/null; then
    echo "networks-scipy: python3-scipy, python3-fluids or python3-iapws is not importable by $PYTHON" >&2
    exit 1
fi

exec "$PYTHON" "$here/networks_scipy.py" run "$HEADROOM"
