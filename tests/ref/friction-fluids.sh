#!/bin/sh
# friction-fluids: headroom's friction factors against python3-fluids 1.0.22,
# 5 x 1000 points through the real program (see friction_fluids.py).
cd "$(dirname "$0")" && exec /usr/bin/python3 friction_fluids.py
