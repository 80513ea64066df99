#!/usr/bin/python3
"""Write mline_stock.tsv: microstrip values from scikit-rf's MLine as shipped.

The corrected table (make_mline_table.py) patches three terms of scikit-rf
0.15.4. This one patches nothing: it keeps to zero copper thickness, where
two of those terms vanish, and records only the static Z0, the static
eps_eff and the dispersive eps_eff(f), which the third (the Z0 dispersion
term R8) does not touch. It is therefore a check of our closed forms by the
library exactly as Debian ships it. Run from the repository root:

    /usr/bin/python3 testdata/skrf/make_mline_stock_table.py
"""

import itertools
import os
import platform
import sys

import numpy as np

if not hasattr(np, 'complex'):  # scikit-rf 0.15.4 uses the removed alias
    np.complex = complex

import skrf
from skrf.media.mline import MLine


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = os.path.join(here, 'mline_stock.tsv')
    us = [0.1, 0.25, 0.5, 1.0, 2.0, 4.0, 10.0]
    ers = [2.2, 3.5, 4.4, 6.15, 10.0]
    hs = [0.254e-3, 0.8e-3, 1.6e-3]
    fhs = [0.05, 2.0, 6.0]  # f*h, GHz*mm
    rows = []
    for u, er, h in itertools.product(us, ers, hs):
        f = np.array([fh * 1e6 / h for fh in fhs])
        m = MLine(frequency=skrf.Frequency.from_f(f, unit='hz'), w=u * h, h=h, t=0.0,
                  ep_r=er, tand=0.0, rho=1.7e-8, rough=0.0,
                  diel='frequencyinvariant', disp='kirschningjansen')
        z0s = np.broadcast_to(np.real(m.Z0), f.shape)
        e0s = np.broadcast_to(np.real(m.ep_reff), f.shape)
        eff = np.real(m.ep_reff_f)
        for i in range(len(f)):
            rows.append((er, h, u * h, f[i], z0s[i], e0s[i], eff[i]))
    with open(out, 'w') as fp:
        fp.write('# Microstrip values from scikit-rf %s skrf.media.MLine as shipped (no patches), numpy %s, Python %s (%s).\n'
                 % (skrf.__version__, np.__version__, platform.python_version(), sys.executable))
        fp.write('# Command (from the repository root): /usr/bin/python3 testdata/skrf/make_mline_stock_table.py\n')
        fp.write('# Zero copper thickness; only Z0 static, eps_eff static and eps_eff(f) (disp=kirschningjansen).\n')
        fp.write('# SI units: er h_m w_m f_Hz z0_static eps_static eps_f\n')
        fp.write('\t'.join(['er', 'h', 'w', 'f', 'z0_static', 'eps_static', 'eps_f']) + '\n')
        for r in rows:
            fp.write('\t'.join('%.10g' % v for v in r) + '\n')
    print('wrote %d rows to %s' % (len(rows), out))


if __name__ == '__main__':
    main()
