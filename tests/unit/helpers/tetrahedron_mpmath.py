#!/usr/bin/env python3
"""Independent check of the tetrahedron period P(s) (docs/tetrahedron.md) with mpmath 1.3.0.

Method (different from the engine's spectral sum): the two-fold Mellin-Barnes representation
obtained from Schwinger parameters (the x-triangle by Symanzik's formula, then the y-bubble):

  P(s) = 1/(Gamma(a)^4 (2 pi i)^2) ∫∫ du dv  Gamma(-u)^2 Gamma(-v)^2 Gamma(a+u+v)^2 Gamma(a+u) Gamma(a+v)
                                          Gamma(-u-v) / (Gamma(a-u) Gamma(a-v) Gamma(2a+u+v)),   a = s/2,

on the straight contours Re u = Re v = -a/3 (every Gamma argument then has positive real part).
The integrand decays like exp(-pi(|Im u| + |Im v| + |Im u + Im v|)); it is integrated with
mpmath.quad (tanh-sinh) over the plane, split at the origin.

Usage: python3 tests/unit/helpers/tetrahedron_mpmath.py [--small-s] DPS s1 s2 ...
Prints one line "s value seconds" per s (value with DPS-3 significant digits).

--small-s: contours Re u = Re v = -a/4, where the ridge of Gamma(a+u+v)^2 along Im u + Im v = 0 lies a/2
from its poles instead of a/3, and cuts at 0.01, 0.03, 0.1, 0.3, 1, 4.
At s = 0.2 the default contour is off in the 14th digit; this one agrees with the engine to 17.
"""
import sys
import time
import mpmath as mp


def period_mb(s, dps, small_s=False):
    mp.mp.dps = dps
    a = mp.mpf(s) / 2
    c = -a / 4 if small_s else -a / 3
    G = mp.gamma

    def integrand(y1, y2):
        u = mp.mpc(c, y1)
        v = mp.mpc(c, y2)
        return (G(-u) ** 2 * G(-v) ** 2 * G(a + u + v) ** 2 * G(a + u) * G(a + v) * G(-u - v)
                / (G(a - u) * G(a - v) * G(2 * a + u + v))).real

    points = [0, 0.01, 0.03, 0.1, 0.3, 1, 4] if small_s else [0, 0.25, 1, 4]
    cuts = [-mp.inf] + [-p for p in reversed(points[1:])] + points + [mp.inf]
    # the integrand at (y1, y2) and (-y1, -y2) are complex conjugates: integrate y2 >= 0 twice
    half = points + [mp.inf]
    total = mp.quad(integrand, cuts, half)
    return 2 * total / (4 * mp.pi ** 2 * G(a) ** 4)


if __name__ == '__main__':
    args = sys.argv[1:]
    small_s = '--small-s' in args
    args = [a for a in args if a != '--small-s']
    dps = int(args[0])
    for s in args[1:]:
        start = time.time()
        value = period_mb(mp.mpf(s), dps, small_s)
        print(s, mp.nstr(value, dps - 3), round(time.time() - start, 1), flush=True)
