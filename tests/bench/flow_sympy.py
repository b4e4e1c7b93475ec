"""Reference timings for the flow benchmark (sympy / mpmath), called by flow.bench.ts.

(a) the two-loop O(N) derivation symbolic in N and s: G-function Laurent expansions, subtraction of
    subdivergences, pole parts, β and γ_φ², fixed point and the 1/ν, ω series;
(b) 1000 values of the closed-form 1/ν and ω series at 30 digits with mpmath.
Prints one JSON line.
"""
import json, sys, time
import sympy as sp
import mpmath

def derivation():
    s, eps, N, u = sp.symbols('s eps N u')
    d = 2 * s - eps
    def G(a, b):
        return sp.gamma(d/2 - a) * sp.gamma(d/2 - b) * sp.gamma(a + b - d/2) / (sp.gamma(a) * sp.gamma(b) * sp.gamma(d - a - b))
    a = s / 2
    B = sp.gamma(s) * G(a, a)
    I2 = sp.gamma(s)**2 * G(a, a) * G(a + s - d/2, a)
    Bs = sp.series(B, eps, 0, 2).removeO()
    KB = sp.series(B, eps, 0, 0).removeO()
    I2s = sp.series(I2, eps, 0, 1).removeO()
    Rbar = sp.expand(I2s - KB * Bs)
    pole1 = sp.simplify(Rbar.coeff(eps, -1))
    w1 = -(N + 8) / sp.Integer(6)
    wV = (5 * N + 22) / sp.Integer(9)
    beta = -eps * u + 2 * (-w1 * KB.coeff(eps, -1)) * u**2 / 2 + 2 * (-wV * pole1) * u**3
    beta = sp.expand(beta)
    m1 = -(N + 2) / sp.Integer(6)
    mV = (N + 2) / sp.Integer(6)
    gphi2 = 1 * (-m1 * KB.coeff(eps, -1)) * u + 2 * (-mV * pole1) * u**2
    c2 = beta.coeff(u, 2); c3 = beta.coeff(u, 3)
    ustar = eps / c2 - c3 / c2**3 * eps**2
    nuinv = sp.series(s - gphi2.subs(u, ustar), eps, 0, 3).removeO()
    omega = sp.series(sp.diff(beta, u).subs(u, ustar), eps, 0, 3).removeO()
    return sp.simplify(nuinv.coeff(eps, 2)), sp.simplify(omega.coeff(eps, 2))

def scan(points, digits):
    mpmath.mp.dps = digits
    out = []
    N = 1
    for i in range(points):
        s = mpmath.mpf('1.55') + (mpmath.mpf('1.95') - mpmath.mpf('1.55')) * i / (points - 1)
        e = 2 * s - 3
        A = mpmath.psi(0, 1) - 2 * mpmath.psi(0, s / 2) + mpmath.psi(0, s)
        nuinv = s - mpmath.mpf(N + 2) / (N + 8) * e - mpmath.mpf((N + 2) * (7 * N + 20)) / (N + 8)**3 * A * e**2
        omega = e - mpmath.mpf(2 * (5 * N + 22)) / (N + 8)**2 * A * e**2
        out.append((nuinv, omega))
    return out

t0 = time.perf_counter(); nu2, om2 = derivation(); t1 = time.perf_counter()
points = int(sys.argv[1]) if len(sys.argv) > 1 else 1000
t2 = time.perf_counter(); values = scan(points, 30); t3 = time.perf_counter()
print(json.dumps({"derivation_s": t1 - t0, "scan_s": t3 - t2, "nuInv2": str(nu2), "sample": [str(values[0][0]), str(values[0][1])]}))
