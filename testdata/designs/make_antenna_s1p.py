#!/usr/bin/env python3
"""Write antenna.s1p: an invented small antenna for the examples and tests.

The antenna is a series R-L-C (radiation plus loss resistance 28 ohm, 6 nH,
resonant at 2.6 GHz), so its impedance at 2.45 GHz is capacitive. It is a
made-up load, not a measurement. Run from the repository root:

    python3 testdata/designs/make_antenna_s1p.py > testdata/designs/antenna.s1p
"""
import cmath
import math

R, L, F_RES = 28.0, 6e-9, 2.6e9
C = 1 / ((2 * math.pi * F_RES) ** 2 * L)
Z0 = 50.0

print("! invented antenna load for stubcraft's examples: series RLC, R = 28 ohm, L = 6 nH, f_res = 2.6 GHz")
print("! written by testdata/designs/make_antenna_s1p.py")
print("# MHz S MA R 50")
for i in range(81):
    f = 1500e6 + i * 25e6
    w = 2 * math.pi * f
    z = complex(R, w * L - 1 / (w * C))
    g = (z - Z0) / (z + Z0)
    print(f"{f / 1e6:.1f} {abs(g):.9f} {math.degrees(cmath.phase(g)):.6f}")
