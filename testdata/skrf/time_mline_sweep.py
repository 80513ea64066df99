#!/usr/bin/python3
"""Time scikit-rf's vectorised microstrip sweep, for comparison with
physical.BenchmarkSweep: Z0(f), eps_eff(f), alpha (conductor loss with
roughness, and dielectric loss) and beta of one line at 10,001 frequencies
from 0.1 to 20 GHz. Same line as the Go benchmark: W 3 mm on h 1.6 mm,
er 4.4, 35 um copper, 1 um RMS roughness, tan(delta) 0.02.

Run from the repository root:

    /usr/bin/python3 testdata/skrf/time_mline_sweep.py

It uses MLineHJ from make_mline_table.py (scikit-rf 0.15.4 with its three
corrections). Prints the best of several repeats, in milliseconds.
"""

import importlib.util
import os
import timeit

import numpy as np
import skrf

here = os.path.dirname(os.path.abspath(__file__))
spec = importlib.util.spec_from_file_location('mk', os.path.join(here, 'make_mline_table.py'))
mk = importlib.util.module_from_spec(spec)
spec.loader.exec_module(mk)


def sweep(f):
    m = mk.line(f, 3e-3, 1.6e-3, 35e-6, 4.4, 5.8e7, 1e-6)
    m.loss_tangent = 0.02
    z0 = np.real(m.Z0_f)
    eps = np.real(m.ep_reff_f)
    alpha = m.alpha_conductor + m.alpha_dielectric
    beta = m.beta_phase
    return z0, eps, alpha, beta


def main():
    f = np.linspace(0.1e9, 20e9, 10001)
    sweep(f)
    n, rep = 20, 7
    best = min(timeit.repeat(lambda: sweep(f), number=n, repeat=rep)) / n
    print('scikit-rf %s, numpy %s: 10,001-point MLine sweep %.2f ms (best of %d x %d)'
          % (skrf.__version__, np.__version__, best * 1e3, rep, n))


if __name__ == '__main__':
    main()
