#!/bin/sh
# units-gnu.sh — check `headroom convert` against GNU units.
#
# Reference: GNU units (Debian package `units`, /usr/bin/units), checked with
# GNU Units version 2.22; the version in use is printed on the first line of
# the output. Over 600 conversions cover every unit of the registry, compound
# units (lbf*s/ft^2 -> Pa*s, gal/min -> m^3/s, psi -> ftH2O, m^3/h -> gal/min,
# cSt -> ft^2/s, Btu -> ft*lbf, ...), SI prefixes, UTF-8 spellings,
# temperatures as points (GNU's tempC(x) / tempF(x)) and as differences
# (delta_degF -> K). The cases, the name mapping between the two programs and
# the comparison live in units_cases.py beside this script.
#
# Pass: the two values agree to 1.5e-9 relative (headroom prints 10
# significant digits, up to 5e-10 relative rounding, plus 1e-9 for the
# conversion itself), and headroom shows the target unit as written.
#
#   HEADROOM=build/san/headroom tests/ref/units-gnu.sh
#
# HEADROOM defaults to build/headroom. Prints each failure with both values
# and ends with `units-gnu: N passed, M failed`; exits 1 on any failure.
set -eu

here=$(cd "$(dirname "$0")" && pwd)
HEADROOM=${HEADROOM:-build/headroom}
PYTHON=/usr/bin/python3   # Debian's interpreter (see DESIGN 2.8)

if [ ! -x /usr/bin/units ]; then
    echo "units-gnu: /usr/bin/units not found (Debian package 'units')" >&2
    exit 1
fi
if [ ! -x "$HEADROOM" ]; then
    echo "units-gnu: $HEADROOM is not an executable (set HEADROOM)" >&2
    exit 1
fi
exec "$PYTHON" "$here/units_cases.py" run "$HEADROOM"
