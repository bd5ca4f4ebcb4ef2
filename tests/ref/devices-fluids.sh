#!/bin/sh
# devices-fluids.sh — paths with devices (PRV, meters by Cv and Kv,
# backflow preventers by a loss curve, pumps) and select_pipe (DESIGN 2.10)
# of the real program against an independent march in Python.
#
# References: python3-fluids 1.0.22 (fluids.friction.Colebrook,
# fluids.piping.nearest_pipe for the ASME B36.10M bores) and python3-iapws
# 1.5.x (IAPWS97 density, iapws._iapws._Viscosity), Debian packages run by
# Debian's /usr/bin/python3; ANSI/ISA-75.01.01 for the flow-coefficient
# relation; exact unit definitions of NIST SP 811. Details in
# devices_fluids.py beside this script.
#
#   HEADROOM=build/san/headroom tests/ref/devices-fluids.sh
#
# Ends with `devices-fluids: N passed, M failed`; exits 1 on any failure.
set -eu
here=$(cd "$(dirname "$0")" && pwd)
cd "$here/../.."
export HEADROOM=${HEADROOM:-build/headroom}
PYTHON=/usr/bin/python3   # Debian's interpreter (see DESIGN 2.8)
if ! "$PYTHON" -c 'import fluids, iapws, numpy' 2>/dev/null; then
    echo "devices-fluids: python3-fluids, python3-iapws or numpy is not importable by $PYTHON" >&2
    echo "devices-fluids: 0 passed, 1 failed"
    exit 1
fi
exec "$PYTHON" "$here/devices_fluids.py"
