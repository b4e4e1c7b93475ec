import { evaluatePade, padeApproximant, polesInInterval } from '../pade';
import { type Real, EngineError } from '../precision';
import { type LaurentSeries } from '../series';
import { type Complex } from '../linalg';

export interface FixedPointCaveat {
  kind: 'complex-at-eps' | 'stability-sign-disagrees' | 'degenerate-one-loop' | 'complex-one-loop';
  message: string;
}

const short = (x: Real) => x.toSignificantDigits(6).toString();

type Sign = 'positive' | 'negative' | 'zero' | 'undecided';

/**
 * The [n−1/1] Padé approximant of a stability-eigenvalue series λ = a₁ε + … + a_nε^n at ε ([1/1] at two
 * loops, [2/1] at three), with its poles in (0, ε); null when it does not exist.
 */
function padeAt(series: LaurentSeries<Real>, eps: Real, isZero: (c: Real) => boolean, digits: number): { value: Real | null; poles: Real[]; L: number } | null {
  if (series.order < 2 || isZero(series.coefficient(1))) return null;
  const n = series.order;
  try {
    const pade = padeApproximant(Array.from({ length: n + 1 }, (_, m) => series.coefficient(m)), n - 1, 1, digits);
    const poles = polesInInterval(pade, 0, eps, digits);
    try {
      return { value: evaluatePade(pade, eps, digits), poles, L: n - 1 };
    } catch (e) {
      if (e instanceof EngineError) return { value: null, poles, L: n - 1 };
      throw e;
    }
  } catch (e) {
    if (e instanceof EngineError) return null;
    throw e;
  }
}

function signOfValues(values: Complex[]): boolean | null {
  const size = Math.max(...values.map((z) => Math.abs(z.re)), 1e-300);
  if (values.some((z) => z.re < -1e-12 * size)) return false;
  return values.every((z) => z.re > 1e-12 * size) ? true : null;
}

/** The root's eigenvalues paired with the series by rank (both ascending): the i-th smallest belongs to the i-th smallest. */
function rootValueFor(truncated: Real[], values: Complex[] | null): (number | null)[] {
  if (!values || values.length !== truncated.length) return truncated.map(() => null);
  const byValue = (order: number[], at: (i: number) => number) => order.sort((i, j) => at(i) - at(j));
  const seriesOrder = byValue(truncated.map((_, i) => i), (i) => Number(truncated[i].toString()));
  const rootOrder = byValue(values.map((_, i) => i), (i) => values[i].re);
  const paired: (number | null)[] = truncated.map(() => null);
  seriesOrder.forEach((i, rank) => (paired[i] = values[rootOrder[rank]].re));
  return paired;
}

const signOfNumber = (x: number, size: number): Sign => (Math.abs(x) <= 1e-12 * size ? 'zero' : x > 0 ? 'positive' : 'negative');

/**
 * IR stability at a physical ε. Each eigenvalue's truncated series, its [n−1/1] Padé approximant and
 * (given `values`, the eigenvalues at the real root of the truncated β) its value at the root must
 * agree in sign; where they do not, that eigenvalue is undecided and a caveat names every value.
 * Stable: all positive; unstable: some eigenvalue negative throughout; otherwise undecided (null).
 * Without complete series, or where a series vanishes through its order, the eigenvalues at the
 * numeric root decide.
 */
export function stabilityAt(eigen: (LaurentSeries<Real> | null)[] | null, values: Complex[] | null, eps: Real, isZero: (c: Real) => boolean, digits: number): { stable: boolean | null; caveats: FixedPointCaveat[] } {
  if (!eigen || eigen.some((e) => e === null)) return { stable: values ? signOfValues(values) : null, caveats: [] };
  const caveats: FixedPointCaveat[] = [];
  const series = eigen as LaurentSeries<Real>[];
  const truncatedValues = series.map((s) => s.evaluate(eps));
  const atRoot = rootValueFor(truncatedValues, values);
  const size = Math.max(...(values ?? []).map((z) => Math.abs(z.re)), 1e-300);
  const signs: Sign[] = series.map((s, i) => {
    const truncated = truncatedValues[i];
    const sign: Sign = isZero(truncated) ? 'zero' : truncated.isPositive() ? 'positive' : 'negative';
    if (sign === 'zero') return sign;
    const pade = padeAt(s, eps, isZero, digits);
    const padeSign = !pade ? sign : pade.value === null ? 'pole' : pade.value.isPositive() ? 'positive' : 'negative';
    const root = atRoot[i];
    const rootSign = root === null ? sign : signOfNumber(root, size);
    if (padeSign === sign && (rootSign === sign || rootSign === 'zero')) return sign;
    caveats.push({ kind: 'stability-sign-disagrees', message: disagreementMessage(i, truncated, pade, root, eps) });
    return 'undecided';
  });
  if (signs.includes('negative')) return { stable: false, caveats };
  if (signs.includes('undecided')) return { stable: null, caveats };
  // a series that vanishes through its order (a merging point): the eigenvalues at the root decide, if any
  if (signs.includes('zero')) return { stable: values ? signOfValues(values) : null, caveats };
  return { stable: true, caveats };
}

function disagreementMessage(i: number, truncated: Real, pade: { value: Real | null; poles: Real[]; L: number } | null, root: number | null, eps: Real): string {
  const parts = [`the truncated series gives ${short(truncated)} at ε = ${short(eps)}`];
  if (pade) {
    const poles = pade.poles.length > 0 ? ` (a pole at ε = ${pade.poles.map(short).join(', ')} lies in (0, ε))` : '';
    parts.push(`its [${pade.L}/1] Padé approximant ${pade.value === null ? 'has a pole there' : `gives ${short(pade.value)}`}${poles}`);
  }
  if (root !== null) parts.push(`the eigenvalue at the root of the truncated β is ${Number(root.toPrecision(6))}`);
  return `stability eigenvalue λ${i + 1}: ${parts.join(', ')}; the signs disagree, so this eigenvalue does not decide stability`;
}
