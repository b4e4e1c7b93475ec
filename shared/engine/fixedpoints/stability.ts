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

/** The [1/1] Padé approximant of a stability-eigenvalue series λ = a₁ε + a₂ε² at ε, with its poles in (0, ε); null when it does not exist. */
function padeAt(series: LaurentSeries<Real>, eps: Real, isZero: (c: Real) => boolean, digits: number): { value: Real | null; poles: Real[] } | null {
  if (series.order < 2 || isZero(series.coefficient(1))) return null;
  try {
    const pade = padeApproximant([series.coefficient(0), series.coefficient(1), series.coefficient(2)], 1, 1, digits);
    const poles = polesInInterval(pade, 0, eps, digits);
    try {
      return { value: evaluatePade(pade, eps, digits), poles };
    } catch (e) {
      if (e instanceof EngineError) return { value: null, poles };
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

/**
 * IR stability at a physical ε from the eigenvalue series: each eigenvalue's truncated value and its
 * [1/1] Padé approximant must agree in sign; where they do not, that eigenvalue is undecided and a
 * caveat names both values. Stable: all positive; unstable: some eigenvalue negative in both;
 * otherwise undecided (null). Without complete series, or where a series vanishes through its order,
 * the eigenvalues at the numeric root decide.
 */
export function stabilityAt(eigen: (LaurentSeries<Real> | null)[] | null, values: Complex[] | null, eps: Real, isZero: (c: Real) => boolean, digits: number): { stable: boolean | null; caveats: FixedPointCaveat[] } {
  if (!eigen || eigen.some((e) => e === null)) return { stable: values ? signOfValues(values) : null, caveats: [] };
  const caveats: FixedPointCaveat[] = [];
  const signs: Sign[] = (eigen as LaurentSeries<Real>[]).map((series, i) => {
    const truncated = series.evaluate(eps);
    const sign: Sign = isZero(truncated) ? 'zero' : truncated.isPositive() ? 'positive' : 'negative';
    const pade = padeAt(series, eps, isZero, digits);
    if (!pade || sign === 'zero') return sign;
    const padeSign = pade.value === null ? 'pole' : pade.value.isPositive() ? 'positive' : 'negative';
    if (padeSign === sign) return sign;
    const poles = pade.poles.length > 0 ? ` (a pole at ε = ${pade.poles.map(short).join(', ')} lies in (0, ε))` : '';
    const padeText = pade.value === null ? 'has a pole there' : `gives ${short(pade.value)}`;
    caveats.push({ kind: 'stability-sign-disagrees', message: `stability eigenvalue λ${i + 1}: the truncated series gives ${short(truncated)} at ε = ${short(eps)}, its [1/1] Padé approximant ${padeText}${poles}; the signs disagree, so this eigenvalue does not decide stability` });
    return 'undecided';
  });
  if (signs.includes('negative')) return { stable: false, caveats };
  if (signs.includes('undecided')) return { stable: null, caveats };
  // a series that vanishes through its order (a merging point): the eigenvalues at the root decide, if any
  if (signs.includes('zero')) return { stable: values ? signOfValues(values) : null, caveats };
  return { stable: true, caveats };
}
