#!/bin/sh
# hydraulics-hand: Hazen-Williams, pump operating points, Joukowsky surge and
# PVC ratings through the real program against forms worked in Python.
cd "$(dirname "$0")" && exec /usr/bin/python3 hydraulics_hand.py
