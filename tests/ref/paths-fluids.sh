#!/bin/sh
# paths-fluids.sh — ```path blocks (DESIGN 2.2a) of the real program against
# an independent computation.
#
# References: python3-fluids 1.0.22 (fluids.friction Colebrook, Swamee_Jain_1976,
# Haaland; fluids.fittings Crane functions and ft_Crane) and python3-iapws
# 1.5.x (IAPWS97 density, iapws._iapws._Viscosity), both Debian packages run
# by Debian's /usr/bin/python3; exact unit definitions of NIST SP 811. Pipe
# bores and roughness come from our own pipe() output (checked against
# fluids.piping in pipes-fluids.sh). Our Crane f_T is the fully rough
# Colebrook limit at eps = 0.0018 in, not fluids' ft_Crane: the reference
# computes it from that formula, and compares it with ft_Crane at 2 %.
# 220 seeded random paths (US and SI documents, steel/copper/PVC, size
# changes, Hazen-Williams with the same 10.67/1.852/4.8704 constants as
# src/methods/friction.c, Swamee-Jain, Haaland); p_end and p_min to 1e-6
# relative. Details in paths_fluids.py beside this script.
#
#   HEADROOM=build/san/headroom tests/ref/paths-fluids.sh
#
# Ends with `paths-fluids: N passed, M failed`; exits 1 on any failure.
set -eu
here=$(cd "$(dirname "$0")" && pwd)
cd "$here/../.."
export HEADROOM=${HEADROOM:-build/headroom}
PYTHON=/usr/bin/python3   # Debian's interpreter (see DESIGN 2.8)
if ! "$PYTHON" -c 'import fluids, iapws' 2>/dev/null; then
    echo "paths-fluids: python3-fluids or python3-iapws is not importable by $PYTHON" >&2
    echo "paths-fluids: 0 passed, 1 failed"
    exit 1
fi
exec "$PYTHON" "$here/paths_fluids.py"
