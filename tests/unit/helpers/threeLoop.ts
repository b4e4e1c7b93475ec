import Decimal from 'decimal.js';
import { numericCalculus } from '../../../shared/engine/diagrams/calculus';
import { type DerivedFlow } from '../../../shared/engine/diagrams/renormalization';
import { CouplingPolynomial } from '../../../shared/engine/models/couplingPolynomial';
import { type ModelSpec } from '../../../shared/engine/models/model';
import { type Real } from '../../../shared/engine/precision/real';
import { q } from '../../../shared/engine/symbolic/rational';

/** ζ(3) to 60 digits (OEIS A002117). */
export const ZETA3 = '1.20205690315959428539973816151144999076498629234049888179227';

/** ζ(3) to 212 digits: mpmath 1.3.0, mp.dps = 215, mp.zeta(3) (its first 60 digits are ZETA3 above). */
export const ZETA3_212 = '1.2020569031595942853997381615114499907649862923404988817922715553418382057863130901864558736093352581461991577952607194184919959986732832137763968372079001614539417829493600667191915755222424942439615639096641033';

/**
 * The short-range O(N) φ⁴ RG functions through three loops in minimal subtraction, d = 4 − ε, in the
 * engine's normalization u = λμ^{−ε}/(16π²) at s = 2 with V = (u/4!)(φ²)² (docs/flows.md, Conventions):
 *   β(u)    = −εu + (N+8)/3 u² − (3N+14)/3 u³ + [33N² + 922N + 2960 + 96ζ(3)(5N+22)]/216 u⁴
 *   γ_φ(u)  = (N+2)/36 u² − (N+2)(N+8)/432 u³
 *   γ_φ²(u) = (N+2)/3 u − 5(N+2)/18 u² + (N+2)(5N+37)/36 u³
 * Recalled from memory of Kleinert & Schulte-Frohlinde, "Critical Properties of φ⁴-Theories" (2001),
 * ch. 11 (their γ_m is half of γ_φ² here: 1/ν = 2 − γ_φ²(u*)); the one- and two-loop terms are checked
 * against the engine's own derivation (tests/unit/fixedpoints/threeLoop.test.ts), and all three
 * together reproduce the published ε³ exponents exactly (checked with sympy while writing the test).
 */
export function onThreeLoopFlow(N: number, digits = 30): DerivedFlow<Real> {
  const calculus = numericCalculus(q(2), digits);
  const { ring } = calculus.ctx;
  const R = Decimal.clone({ precision: calculus.digits + 10 });
  const z3 = new R(ZETA3);
  const real = (x: Decimal.Value) => ring.add(ring.zero(), new R(x) as unknown as Real);
  const poly = (terms: [number, Decimal.Value][]) => new CouplingPolynomial(ring, 1, terms.map(([p, c]) => ({ powers: [p], coeff: real(c) })));
  const b4 = new R(33 * N * N + 922 * N + 2960).plus(z3.times(96 * (5 * N + 22))).div(216);
  const flow = {
    calculus,
    couplings: ['u'],
    loops: 3,
    beta: [poly([[2, new R(N + 8).div(3)], [3, new R(-(3 * N + 14)).div(3)], [4, b4]])],
    gammaPhi: poly([[2, new R(N + 2).div(36)], [3, new R(-(N + 2) * (N + 8)).div(432)]]),
    gammaPhiMatrix: null,
    gammaPhi2: poly([[1, new R(N + 2).div(3)], [2, new R(-5 * (N + 2)).div(18)], [3, new R((N + 2) * (5 * N + 37)).div(36)]]),
    quadratic: null,
    fieldRenormalized: true,
    residues: { first: [], second: [] },
    trail: [],
    checks: [],
  };
  return flow as unknown as DerivedFlow<Real>;
}

/** The published ε³ exponents of the O(N) model (Kleinert & Schulte-Frohlinde 2001, recalled from memory), coefficients of ε⁰ … ε³. */
export function onThreeLoopExponents(N: number): { eta: Decimal[]; nuInv: Decimal[]; omega: Decimal[] } {
  const R = Decimal.clone({ precision: 60 });
  const z3 = new R(ZETA3);
  const n8 = N + 8;
  const pow = (x: number, k: number) => new R(x).pow(k);
  return {
    eta: [new R(0), new R(0), new R(N + 2).div(pow(n8, 2).times(2)), new R((N + 2) * (-N * N + 56 * N + 272)).div(pow(n8, 4).times(8))],
    nuInv: [
      new R(2),
      new R(-(N + 2)).div(n8),
      new R(-(N + 2) * (13 * N + 44)).div(pow(n8, 3).times(2)),
      new R(N + 2).div(pow(n8, 5).times(8)).times(new R(3 * N ** 3 - 452 * N * N - 2672 * N - 5312).plus(z3.times(96 * n8 * (5 * N + 22)))),
    ],
    omega: [new R(0), new R(1), new R(-3 * (3 * N + 14)).div(pow(n8, 2)), new R(33 * N ** 3 + 538 * N * N + 4288 * N + 9568).plus(z3.times(96 * n8 * (5 * N + 22))).div(pow(n8, 4).times(4))],
  };
}

/** A two-loop flow extended by quartic β terms (made up: the checks are internal consistency), loops = 3. */
export function withQuarticTerms(flow: DerivedFlow<Real>, quartic: { powers: number[]; coeff: string }[][]): DerivedFlow<Real> {
  const { ring } = flow.calculus.ctx;
  const k = flow.couplings.length;
  const beta = flow.beta.map((b, i) => b.add(new CouplingPolynomial(ring, k, quartic[i].map((t) => ({ powers: t.powers, coeff: ring.add(ring.zero(), new Decimal(t.coeff) as unknown as Real) })))));
  return { ...flow, loops: 3, beta };
}

/** A model spec naming points by the signs of their couplings (for hand-made flows). */
export const signModel = { classify: (v: readonly number[]) => (v.every((x) => Math.abs(x) < 1e-12) ? 'Gaussian' : `(${v.map((x) => (Math.abs(x) < 1e-12 ? 0 : Math.sign(x))).join(', ')})`) } as unknown as ModelSpec;
