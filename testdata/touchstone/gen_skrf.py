#!/usr/bin/python3
"""Generate golden two-port networks with scikit-rf for the Go tests.

Run from the repository root:
    /usr/bin/python3 testdata/touchstone/gen_skrf.py
It writes testdata/touchstone/skrf_cascade.s2p (S, RI, ports referred to
50 ohm), whose header records the scikit-rf version and this command.

The cascade, port 1 to port 2, every line given by its characteristic
impedance Z0, effective permittivity and attenuation alpha (Np/m), with
gamma = alpha + j*2*pi*f*sqrt(eeff)/c0:
  1. line    Z0 35 ohm, eeff 2.9, alpha 0,       12 mm
  2. shunt   open stub: line Z0 60 ohm, eeff 3.1, alpha 0.8 Np/m, 9 mm, open end
  3. series  resistor 5 ohm then inductor 1 nH
  4. shunt   resistor 0.3 ohm in series with inductor 3 nH, to ground
  5. line    Z0 50 ohm, eeff 3.0, alpha 1.5 Np/m, 20 mm
The Go test builds the same cascade with physical.ABCD. A line with loss is
given alphaC = alphaD = alpha/2, the distortionless (Heaviside) condition
R/L = G/C, so its characteristic impedance is exactly the real Z0 that
scikit-rf is given here.
"""
import numpy as np

# scikit-rf 0.15.4 still uses the alias np.complex that NumPy 1.24 removed;
# NumPy's own deprecation note says the builtin complex is the same thing.
if not hasattr(np, 'complex'):
    np.complex = complex
import skrf
from skrf.media import DefinedGammaZ0

C0 = 299792458.0
freq = skrf.Frequency(0.5, 4.0, 36, 'ghz')
f = freq.f


def media(eeff, alpha):
    """A medium of propagation constant gamma with 50 ohm ports."""
    gamma = alpha + 1j * 2 * np.pi * f * np.sqrt(eeff) / C0
    return DefinedGammaZ0(frequency=freq, z0=50, gamma=gamma)


def line(z0, eeff, alpha, d):
    """A line of characteristic impedance z0 embedded between 50 ohm ports.

    In scikit-rf 0.15.4 Media.line(z0=..., embed=True) is the documented
    way to get a line whose impedance differs from the port impedance."""
    return media(eeff, alpha).line(d, unit='m', z0=z0, embed=True)


m50 = media(1.0, 0.0)
line1 = line(35, 2.9, 0.0, 12e-3)
stub = m50.shunt(line(60, 3.1, 0.8, 9e-3) ** m50.open())
series = m50.resistor(5) ** m50.inductor(1e-9)
via = m50.shunt(m50.resistor(0.3) ** m50.inductor(3e-9) ** m50.short())
line5 = line(50, 3.0, 1.5, 20e-3)
ntwk = line1 ** stub ** series ** via ** line5
assert np.allclose(ntwk.z0, 50)

with open('testdata/touchstone/skrf_cascade.s2p', 'w') as fh:
    fh.write('! golden cascade for physical/network_test.go\n')
    fh.write('! made by scikit-rf %s, NumPy %s (Debian python3-scikit-rf),\n' % (skrf.__version__, np.__version__))
    fh.write('! command: /usr/bin/python3 testdata/touchstone/gen_skrf.py\n')
    fh.write('# Hz S RI R 50\n')
    for k in range(len(f)):
        s = ntwk.s[k]
        vals = [s[0, 0], s[1, 0], s[0, 1], s[1, 1]]
        fh.write('%.17g ' % f[k] + ' '.join('%.17g %.17g' % (v.real, v.imag) for v in vals) + '\n')

# The same network through scikit-rf's own Touchstone writer, in its DB and
# MA forms (frequency in GHz), and port 1 alone as a one-port: the Go reader
# must decode them to the values above.
ntwk.name = 'skrf_cascade_db'
ntwk.write_touchstone(dir='testdata/touchstone', form='db', skrf_comment=False)
one = ntwk.s11
one.name = 'skrf_s11_ma'
one.write_touchstone(dir='testdata/touchstone', form='ma', skrf_comment=False)

for name in ('skrf_cascade_db.s2p', 'skrf_s11_ma.s1p'):
    path = 'testdata/touchstone/' + name
    with open(path) as fh:
        body = fh.read()
    with open(path, 'w') as fh:
        fh.write('! written by scikit-rf %s Network.write_touchstone, NumPy %s\n' % (skrf.__version__, np.__version__))
        fh.write('! command: /usr/bin/python3 testdata/touchstone/gen_skrf.py\n')
        fh.write(body)
