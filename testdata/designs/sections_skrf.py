#!/usr/bin/python3
"""Golden table for synth.SectionsInput: the impedance looking into lossless
series lines and shunt stubs ending in a load, computed with scikit-rf.

Each element is built by scikit-rf as a two-port (DefinedGammaZ0 media with
the element's own characteristic impedance; line, shunt_delay_open,
shunt_delay_short), turned into its ABCD matrix by scikit-rf, and the
matrices are cascaded with numpy. Run: /usr/bin/python3 sections_skrf.py sections-skrf.tsv
(the table goes to the named file: scikit-rf may print a notice on stdout)
"""
import math
import sys
import numpy as np
import skrf
from skrf.media import DefinedGammaZ0

F = 1e9
FREQ = skrf.Frequency(1, 1, 1, unit='GHz')
GAMMA = 1j * 2 * math.pi * F / 299792458.0

# (load, [(kind, end, z0, deg), ...]) from the load toward the source
CASES = [
    (22 - 31j, [("line", "-", 50, 108.0), ("stub", "short", 60, 40.0)]),
    (15 + 10j, [("line", "-", 50, 15.84), ("stub", "open", 50, 52.92)]),
    (120 - 45j, [("stub", "open", 75, 30.0)]),
    (120 - 45j, [("stub", "short", 35, 125.0), ("line", "-", 90, 77.0)]),
    (5 + 80j, [("line", "-", 25, 200.0)]),
    (300 + 0j, [("line", "-", 50, 45.0), ("stub", "open", 50, 90.0), ("line", "-", 50, 30.0)]),
    (40 - 2j, [("line", "-", 70.7, 90.0), ("stub", "short", 50, 90.0)]),
    (10 + 10j, [("line", "-", 20, 33.3), ("stub", "open", 120, 160.0), ("line", "-", 110, 12.5), ("stub", "short", 45, 65.0)]),
]


def abcd(kind, end, z0, deg):
    m = DefinedGammaZ0(FREQ, z0=z0, Z0=z0, gamma=GAMMA)
    if kind == "line":
        n = m.line(deg, unit='deg')
    elif end == "open":
        n = m.shunt_delay_open(deg, unit='deg')
    else:
        n = m.shunt_delay_short(deg, unit='deg')
    return n.a[0]


out = open(sys.argv[1], "w")
print("# synth.SectionsInput golden table: made by testdata/designs/sections_skrf.py with scikit-rf %s (Debian python3-scikit-rf)," % skrf.__version__, file=out)
print("# command: /usr/bin/python3 sections_skrf.py sections-skrf.tsv", file=out)
print("# columns: load_re load_im sections(kind:end:z0_ohm:deg, comma separated, load first) zin_re zin_im", file=out)
for zl, secs in CASES:
    m = np.eye(2, dtype=complex)
    for s in secs:  # the source-side element multiplies on the left
        m = abcd(*s) @ m
    zin = (m[0, 0] * zl + m[0, 1]) / (m[1, 0] * zl + m[1, 1])
    spec = ",".join("%s:%s:%r:%r" % s for s in secs)
    print("%r\t%r\t%s\t%.12g\t%.12g" % (zl.real, zl.imag, spec, zin.real, zin.imag), file=out)
out.close()
