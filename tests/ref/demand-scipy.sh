#!/bin/sh
# demand-scipy.sh — check the peak demand model (src/methods/demand.c:
# peak_exact, peak_normal) against python3-scipy.
#
# Reference: python3-scipy (Debian package python3-scipy; scipy.stats.binom
# for the exact binomial case, scipy.stats.norm for the normal
# approximation), run by Debian's /usr/bin/python3. Cases, tolerances and
# reasons are in demand_scipy.py beside this script. The model is reached
# through demand_probe.c, since no fixture probability table is shipped for
# peak_demand() to use from a calc file.
#
# Prints each failure and ends with `demand-scipy: N passed, M failed`;
# exits 1 on any failure.
set -eu
here=$(cd "$(dirname "$0")" && pwd)
PYTHON=/usr/bin/python3
if ! "$PYTHON" -c 'import scipy.stats' 2>/dev/null; then
    echo "demand-scipy: python3-scipy is not importable by $PYTHON" >&2
    exit 1
fi
exec "$PYTHON" "$here/demand_scipy.py"
