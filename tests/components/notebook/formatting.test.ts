import { toCsv } from '../../../components/notebook/csv';
import { cellFieldErrors } from '../../../components/notebook/fieldErrors';
import { asExponents, asFixedPoints, asScan, PADE_PREFIX } from '../../../components/notebook/resultShapes';
import { shortcutFor } from '../../../components/notebook/shortcuts';
import { polynomialTex, seriesTex, shortDecimal } from '../../../components/notebook/texFormat';

// Result excerpts as the engine's exponents / scan / fixedpoints jobs return them (O(1), d = 3, s = 1.75, two loops).
const exponents = {
  eps: '0.5',
  meanField: false,
  fixedPoint: 'Ising',
  series: { nuInv: ['1.75', '-0.33333333333333333333', '-0.14203232574896878531'], eta: ['0.25', '0', '0'] },
  values: { nuInv: '1.547825251896091137', eta: '0.25' },
  pade: { nuInv: '1.5382122795912406939', eta: null },
};

describe('typesetting series', () => {
  it('writes 1/ν = s − ε/3 + … with the order symbol, skipping zero terms', () => {
    // The ε coefficient −(N+2)/(N+8) = −1/3 for N = 1 (Fisher–Ma–Nickel 1972).
    expect(seriesTex(0, [{ expr: 's', latex: 's' }, { expr: '-1/3', latex: '-\\frac{1}{3}' }, { expr: '0', latex: '0' }])).toBe('s - \\frac{1}{3}\\,\\varepsilon + O(\\varepsilon^{3})');
    expect(seriesTex(0, exponents.series.eta)).toBe('0.25 + O(\\varepsilon^{3})');
  });

  it('brackets a symbolic coefficient that is a sum', () => {
    expect(seriesTex(1, [{ expr: 'a + b', latex: 'a + b' }], false)).toBe('\\left(a + b\\right)\\,\\varepsilon');
  });

  it('shortens long decimals in formulas only', () => {
    expect(shortDecimal('-0.33333333333333333333')).toBe('-0.3333333333');
    expect(shortDecimal('1.75')).toBe('1.75');
  });

  it('writes β-functions from the flow job’s monomials', () => {
    expect(polynomialTex([{ monomial: 'eps*u', coeff: '-1' }, { monomial: 'u^2', coeff: '3' }])).toBe('-\\varepsilon\\,u + 3\\,u^{2}');
  });
});

describe('recognising result shapes', () => {
  it('reads exponents with values and keeps the rest aside', () => {
    const shape = asExponents(exponents)!;
    expect(shape.eps).toBe('0.5');
    expect(shape.series.nuInv[1]).toBe('-0.33333333333333333333');
    expect(shape.extra).toEqual({ meanField: false, fixedPoint: 'Ising', pade: exponents.pade });
  });

  it('reads scan points, Padé values and the marks s = d/2 and s*', () => {
    const scan = asScan({
      d: '3',
      marks: { meanFieldEnd: '1.5', sStar: '1.964' },
      points: [
        { s: '1.55', eps: '0.1', flagged: false, values: { nuInv: '1.51', eta: '0.45' }, pade: { nuInv: '1.50', eta: null } },
        { s: '1.65', eps: '0.3', flagged: true, values: { nuInv: '1.53', eta: '0.35' } },
      ],
    })!;
    expect(scan.points.map((p) => p.x)).toEqual([1.55, 1.65]);
    expect(scan.quantities).toEqual(['nuInv', 'eta', `${PADE_PREFIX}nuInv`]);
    expect(scan.meanField).toBe(1.5);
    expect(scan.sStar).toBe(1.964);
    expect(scan.points[1].flagged).toBe(true);
  });

  it('falls back to d/2 from the setup when the scan names no mean-field end', () => {
    expect(asScan({ points: [{ s: '1.6', values: { nu: '0.6' } }] }, '3')!.meanField).toBe(1.5);
  });

  it('reads fixed points with their stability', () => {
    const shape = asFixedPoints({
      eps: '0.5',
      fixedPoints: [{ name: 'Ising', status: 'real', couplings: { u: { series: ['0', '0.333'], value: null } }, stability: { series: [['0', '1']], values: null }, stable: true, notes: [] }],
    })!;
    expect(shape.points[0]).toMatchObject({ name: 'Ising', stable: true, stabilityValues: null, couplings: [{ name: 'u', value: null }] });
  });

  it('says null to shapes it does not know', () => {
    expect(asExponents({ something: 1 })).toBeNull();
    expect(asScan({ points: 'many' })).toBeNull();
    expect(asFixedPoints([1, 2])).toBeNull();
  });
});

describe('field messages from the shared cell schema', () => {
  it('points at the field that is wrong', () => {
    const errors = cellFieldErrors('Setup', { kind: 'setup', model: { preset: 'on', N: Number.NaN }, d: 'three', loops: 2, digits: 3 });
    expect(errors.label).toMatch(/lower-case word/);
    expect(errors.d).toBe('Enter a decimal number, e.g. 1.75');
    expect(errors['model.N']).toBeDefined();
    expect(errors.digits).toBe('At least 5 digits');
  });

  it('has nothing to say about a good cell', () => {
    expect(cellFieldErrors('setup', { kind: 'setup', model: { preset: 'on', N: 'N' }, loops: 2, digits: 30 })).toEqual({});
  });
});

describe('keyboard shortcuts', () => {
  const press = (key: string, extra: Partial<{ code: string; altKey: boolean; shiftKey: boolean; ctrlKey: boolean }> = {}) => ({ key, altKey: false, shiftKey: false, ctrlKey: false, metaKey: false, ...extra });
  it('maps Alt chords even while typing, plain keys only outside fields', () => {
    expect(shortcutFor(press('®', { code: 'KeyR', altKey: true }), true)).toBe('runCell');
    expect(shortcutFor(press('R', { code: 'KeyR', altKey: true, shiftKey: true }), false)).toBe('runAll');
    expect(shortcutFor(press('n', { code: 'KeyN', altKey: true }), false)).toBe('addCell');
    expect(shortcutFor(press('?'), false)).toBe('help');
    expect(shortcutFor(press('?'), true)).toBeNull();
    expect(shortcutFor(press('ArrowRight'), false)).toBe('next');
    expect(shortcutFor(press('r', { code: 'KeyR', ctrlKey: true, altKey: true }), false)).toBeNull();
  });
});

describe('CSV', () => {
  it('quotes what needs quoting (RFC 4180)', () => {
    expect(toCsv(['quantity', 'value'], [['1/ν', '1.5'], ['a, "b"', 'x']])).toBe('quantity,value\r\n1/ν,1.5\r\n"a, ""b""",x\r\n');
  });
});
