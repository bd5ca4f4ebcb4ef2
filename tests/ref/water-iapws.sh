#!/bin/sh
# water-iapws: headroom's water() against python3-iapws (IF97 and IAPWS-95),
# 1000 states through the real program (see water_iapws.py).
cd "$(dirname "$0")" && exec /usr/bin/python3 water_iapws.py
