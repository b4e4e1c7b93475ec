#!/usr/bin/env python3
"""High-precision evaluation of the tetrahedron period P(s) from its spectral sum, with mpmath 1.3.0.

The formula (docs/tetrahedron.md, "Method: the spectral sum"):

  P(s) = Gamma(s)/pi * sum_{l>=0} dim_l * I_l,       I_l = int_0^inf R_l(t)^3 dt,
  R_l(t) = |Gamma(l/2 + s/4 + i t)|^2 / |Gamma(l/2 + 3s/4 + i t)|^2,
  dim_l = (l + lam)/lam * (2 lam)_l / l!,  lam = s - 1   (dim_0 = 1; at lam = 0: dim_l = 2 for l >= 1).

How it is computed here, in plain words:

1. Each I_l is integrated numerically with mpmath.quad (tanh-sinh).  R_l(t)^3 is evaluated as
   |Gamma(a + i t) / Gamma(b + i t)|^6 with mpmath.gamma, which keeps full relative accuracy even at
   very large t (the log-gamma difference would cancel catastrophically there).  The t-range is split
   at c = (l+s)/2 and 4c.  On [4c, inf) the integrand falls off only like t^(-3s) (t^(-1.5) at
   s = 1/2), so that piece is mapped to v in (0, 1] by t = 4c * v^(-k), k = 2/(3s-1), which turns
   the slow algebraic decay into an integrand vanishing like v at v = 0 (nodes with v < 10^-(dps+10)
   contribute below 10^-(2 dps) and are dropped).
2. The terms l = 0 .. L-1 are summed directly (dim_l from the rising factorial; terms with dim_l = 0,
   e.g. l >= 2 at s = 1/2, are skipped).
3. The tail sum_{l>=L} f(l), f(l) = dim_l I_l, is obtained from the known form of the large-l
   behaviour, f(l) = V^(-s-1) g(V^-2) with V = l + s - 1 and g smooth at 0 (an expansion in even
   inverse powers of V).  f is evaluated at Q+1 real (in general non-integer) values of l, chosen
   so that y = (V_L/V)^2 sits at the Chebyshev points of (0, 1]; dim at real l is
   2 (l+lam) Gamma(l+2 lam) / (Gamma(2 lam + 1) Gamma(l+1)).  A degree-Q polynomial p(y) is
   fitted through g at those points (one linear solve at working precision), and the tail is summed
   in closed form, sum_{l>=L} V^(-s-1) p((V_L/V)^2) = sum_q p_q V_L^(2q) zeta(s+1+2q, L+s-1), with
   mpmath.zeta (Hurwitz).  Where 1/Gamma(2 lam + 1) = 0 (s = 1/2) the tail vanishes identically.

Every s is computed twice, with settings A and B that differ in working precision, in L and in Q
(see SETTINGS).  The printed value is B's; "digits_agreeing" is floor(-log10 |A - B| / |B|), an
honest estimate of the accuracy of A (B should be at least as good).  At s = 2 the result must be
6 zeta(3).

Independent of the engine's implementation (shared/engine/special/tetrahedron.ts): no Stirling
series, no Bernoulli numbers, no asymptotic coefficients computed analytically, no exp-sinh rule.
The Gamma functions, the quadrature (tanh-sinh with its own error control), the Hurwitz zeta and
the linear algebra are mpmath's; the tail coefficients come from a numerical fit, not from a formula.
Only the spectral formula itself is shared with the engine.

Usage (from the repository root):

  nice python3 tests/unit/helpers/tetrahedron_spectral_mpmath.py DPS s1 s2 ...

prints one line per s:  "s value digits_agreeing seconds", value with DPS significant digits,
seconds = CPU seconds of both runs.  Domain: 1/3 < s <= 2 (I_l diverges for 3s <= 1); with
--continued as the first argument every I_l is its analytic continuation (integral_l_continued),
which also covers 0 < s < 1/3 (not s = 1/3).
"""
import sys
import time
import mpmath as mp


def settings(dps):
    """(working dps, L, Q) for the two runs A and B at target precision dps."""
    return [
        (dps + 10, max(30, dps), max(10, (dps * 3) // 8 + 2)),
        (dps + 20, max(40, (dps * 3) // 2), max(12, dps // 2 + 2)),
    ]


def integral_l(l, s):
    """I_l = int_0^inf R_l(t)^3 dt at real l >= 0 (current mp precision)."""
    l = mp.mpf(l)
    a = l / 2 + s / 4
    b = l / 2 + 3 * s / 4

    def r3(t):
        return abs(mp.gamma(mp.mpc(a, t)) / mp.gamma(mp.mpc(b, t))) ** 6

    c = (l + s) / 2
    big = 4 * c
    k = 2 / (3 * s - 1)
    cut = mp.mpf(10) ** (-mp.mp.dps - 10)

    def far(v):  # t = big * v^(-k), dt = k t / v dv
        if v < cut:
            return mp.mpf(0)
        t = big * v ** (-k)
        return r3(t) * k * t / v

    near = mp.quad(r3, [0, c, big])
    return near + mp.quad(far, [0, 1])


def integral_l_continued(l, s):
    """The analytic continuation of I_l below s = 1/3: int_0^inf (R_l^3 - (1+t^2)^(-3s/2)) dt + K(s),
    K(s) = sqrt(pi) Gamma((3s-1)/2) / (2 Gamma(3s/2)) (the continued int_0^inf (1+t^2)^(-3s/2) dt).
    The difference decays like t^(-3s-2); at large t it is a cancellation of two terms ~t^(-3s), so
    small s needs a generous DPS (at s = 0.2 and DPS 30 the result moves in the 9th digit with L)."""
    l = mp.mpf(l)
    a = l / 2 + s / 4
    b = l / 2 + 3 * s / 4

    def diff(t):
        return abs(mp.gamma(mp.mpc(a, t)) / mp.gamma(mp.mpc(b, t))) ** 6 - (1 + t * t) ** (-3 * s / 2)

    c = (l + s) / 2
    big = 4 * c
    k = 2 / (3 * s + 1)
    cut = mp.mpf(10) ** (-mp.mp.dps - 10)

    def far(v):
        if v < cut:
            return mp.mpf(0)
        t = big * v ** (-k)
        return diff(t) * k * t / v

    K = mp.sqrt(mp.pi) * mp.gamma((3 * s - 1) / 2) / (2 * mp.gamma(3 * s / 2))
    return mp.quad(diff, [0, c, big]) + mp.quad(far, [0, 1]) + K


def dim_int(l, lam):
    if l == 0:
        return mp.mpf(1)
    if lam == 0:
        return mp.mpf(2)
    return (l + lam) / lam * mp.rf(2 * lam, l) / mp.factorial(l)


def dim_real(l, lam):
    """dim_l continued to real l (> 0), 2 (l+lam) Gamma(l+2lam) / (Gamma(2lam+1) Gamma(l+1))."""
    return 2 * (l + lam) * mp.rgamma(2 * lam + 1) * mp.exp(mp.loggamma(l + 2 * lam) - mp.loggamma(l + 1))


def period(s, dps, L, Q):
    mp.mp.dps = dps
    s = mp.mpf(s)
    lam = s - 1
    head = mp.mpf(0)
    for l in range(L):
        d = dim_int(l, lam)
        if d != 0:
            head += d * integral_l(l, s)
    tail = mp.mpf(0)
    if mp.rgamma(2 * lam + 1) != 0:
        VL = L + lam
        ys = [(1 + mp.cos((2 * j + 1) * mp.pi / (2 * Q + 2))) / 2 for j in range(Q + 1)]
        gs = []
        for y in ys:
            V = VL / mp.sqrt(y)
            l = V - lam
            gs.append(dim_real(l, lam) * integral_l(l, s) * V ** (s + 1))
        A = mp.matrix([[y ** q for q in range(Q + 1)] for y in ys])
        coef = mp.lu_solve(A, mp.matrix(gs))
        for q in range(Q + 1):
            tail += coef[q] * VL ** (2 * q) * mp.zeta(s + 1 + 2 * q, VL)
    return mp.gamma(s) / mp.pi * (head + tail)


def main():
    global integral_l
    args = sys.argv[1:]
    if args and args[0] == '--continued':
        # every I_l through its continuation (needed for s <= 1/3, equal to the plain one above)
        integral_l = integral_l_continued
        args = args[1:]
    dps = int(args[0])
    for s in args[1:]:
        start = time.process_time()
        values = [period(s, wdps, L, Q) for (wdps, L, Q) in settings(dps)]
        mp.mp.dps = dps + 20
        diff = abs(values[0] - values[1])
        agree = int(mp.floor(-mp.log10(diff / abs(values[1])))) if diff != 0 else dps + 10
        print(s, mp.nstr(values[1], dps), agree, round(time.process_time() - start, 1), flush=True)


if __name__ == '__main__':
    main()
