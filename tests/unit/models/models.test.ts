import { test } from 'node:test';
import assert from 'node:assert/strict';
import { onFamily, customModel, onModel, cubicModel } from '../../../shared/engine/models/index';
import { BUBBLE, CHAIN, MASS_BUBBLE, MASS_CHAIN, MASS_VERTEX, SUNSET, VERTEX_CORRECTED, graphWeight, symmetryData } from '../../../shared/engine/diagrams/index';
import { polyAdd, polyEquals, polyMul, type Poly } from '../../../shared/engine/symbolic/polynomial';
import { q } from '../../../shared/engine/symbolic/rational';
import { polyScale } from '../../../shared/engine/symbolic/polynomial';
import { N, lin, num } from '../helpers/flow';

const only = (g: Parameters<typeof graphWeight>[1]): Poly => {
  const w = graphWeight(onFamily, g);
  assert.equal(w.terms.length, 1);
  return w.terms[0].values[0];
};

test('O(N) tensor weights computed from contractions, symbolic in N (docs/physics.md §5)', () => {
  assert.ok(polyEquals(only(BUBBLE), polyScale(lin(1, 8), q(-1, 6))), 'one loop −(N+8)/6 (sign from e^{−S})');
  const chainExpected = polyScale(polyAdd(polyAdd(polyMul(N, N), polyScale(N, q(6))), num(20)), q(1, 36));
  assert.ok(polyEquals(only(CHAIN), chainExpected), 'chain (N²+6N+20)/36');
  assert.ok(polyEquals(only(VERTEX_CORRECTED), polyScale(lin(5, 22), q(1, 9))), 'vertex-corrected (5N+22)/9');
  assert.ok(polyEquals(only(MASS_BUBBLE), polyScale(lin(1, 2), q(-1, 6))), 'φ² one loop −(N+2)/6');
  assert.ok(polyEquals(only(MASS_CHAIN), polyScale(polyMul(lin(1, 2), lin(1, 2)), q(1, 36))), 'φ² chain ((N+2)/6)²');
  assert.ok(polyEquals(only(MASS_VERTEX), polyScale(lin(1, 2), q(1, 6))), 'φ² vertex type (N+2)/6');
  // sunset: (1/6) λ_acde λ_bcde = (N+2)/18 δ_ab for the O(N) tensor; common practice
  assert.ok(polyEquals(only(SUNSET), polyScale(lin(1, 2), q(-1, 18))), 'sunset −(N+2)/18');
});


test('symmetry factors of the labelled graphs (standard φ⁴ values, common practice)', () => {
  assert.deepEqual(symmetryData(BUBBLE), { symmetryFactor: [1, 2], labellings: 3 });
  assert.deepEqual(symmetryData(CHAIN), { symmetryFactor: [1, 4], labellings: 3 });
  assert.deepEqual(symmetryData(VERTEX_CORRECTED), { symmetryFactor: [1, 2], labellings: 6 });
  assert.deepEqual(symmetryData(SUNSET), { symmetryFactor: [1, 6], labellings: 1 });
});

test('custom potential equal to the O(2) tensor has the same structure as the preset', () => {
  const custom = customModel(2, 'u/24*(phi1^2+phi2^2)^2');
  const preset = onModel(2);
  const tensor = (m: typeof custom) => Array.from(m.basis[0].data, (x) => (Number(x) * Number(m.scales[0].num)) / Number(m.scales[0].den));
  assert.deepEqual(tensor(custom), tensor(preset));
});

test('custom potentials: clear errors for bad input', () => {
  assert.throws(() => customModel(2, 'u*phi1^3'), /only quartic terms/);
  assert.throws(() => customModel(2, 'u*phi3^4'), /not a field/);
  assert.throws(() => customModel(2, 'pi*phi1^4'), /unknown symbol/);
  assert.throws(() => customModel(2, 'u*v*phi1^4'), /exactly one coupling/);
  assert.throws(() => customModel(2, 'u*phi1^4 + v*phi1^4'), /independent/);
  assert.throws(() => customModel(2, 'u*phi1^4 +'), /parse/);
  assert.throws(() => customModel(9, 'u*phi1^4'), /at most/);
});

test('a model not closed under renormalization is rejected (φ1⁴ + φ1²φ2² generates φ2⁴)', async () => {
  const { flowFor } = await import('../../../shared/engine/flows/index');
  assert.throws(() => flowFor({ model: customModel(2, 'u*phi1^4 + v*phi1^2*phi2^2'), s: q(3, 2), loops: 1, digits: 20 }), /outside the couplings/);
});

test('cubic model at N = 1 is refused (couplings coincide)', () => {
  assert.throws(() => cubicModel(1), /N ≥ 2/);
});
