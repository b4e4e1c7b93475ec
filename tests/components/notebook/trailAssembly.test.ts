import { assemblePoles, samePolynomial } from '../../../components/notebook/outputs/trailAssembly';
import type { TrailEntry } from '../../../shared/jobs/contract';

const graph = (over: Partial<TrailEntry>): TrailEntry => ({
  graph: 'g', title: 't', function: 'vertex', loops: 1, sign: -1, symmetryFactor: '1/2', labellings: 3, weight: [], integral: '', rearrangement: '',
  laurent: { lowest: -1, coeffs: [] }, counterterms: [], subtracted: { lowest: -1, coeffs: [] }, pole: { lowest: -1, coeffs: [] }, ...over,
});

test('one-loop O(3) bubble: the simple pole gives β_u = −εu + (N+8)/3 u² = 11/3 u² (docs/physics.md §5)', () => {
  // weight −(N+8)/6 = −11/6 at N = 3, pole 2/ε (§1): a₁ = −(−11/6)·2 = 11/3
  const trail = [graph({ weight: [{ monomial: 'u^2', projections: { u: '-11/6' } }], pole: { lowest: -1, coeffs: ['2'] } })];
  const sum = assemblePoles(trail, 'vertex', 'u', 'loops')!;
  expect(samePolynomial(sum.derived, [{ monomial: 'u^2', coeff: '3.6666666666666666667' }])).toBe(true);
});

test('two-loop simple poles count twice in β (Σ_L L a₁⁽ᴸ⁾), and a symbolic weight does not assemble', () => {
  // invented numbers: a₁⁽²⁾ = −(1/2)·3 = −3/2, so β's u³ coefficient is 2·(−3/2) = −3
  const trail = [graph({ loops: 2, weight: [{ monomial: 'u^3', projections: { u: '1/2' } }], pole: { lowest: -2, coeffs: ['5', '3'] } })];
  expect(samePolynomial(assemblePoles(trail, 'vertex', 'u', 'loops')!.derived, [{ monomial: 'u^3', coeff: '-3' }])).toBe(true);
  expect(assemblePoles([graph({ weight: [{ monomial: 'u^2', projections: { u: '(N+8)/6' } }] })], 'vertex', 'u', 'loops')).toBeNull();
});
