#!/bin/sh
# npsh-iapws: headroom's npsh_available() against NPSHa worked from
# python3-iapws properties and the standard atmosphere (see npsh_iapws.py).
cd "$(dirname "$0")" && exec /usr/bin/python3 npsh_iapws.py
