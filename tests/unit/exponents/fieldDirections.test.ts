import assert from 'node:assert/strict';
import { test } from 'node:test';
import { ExponentsResult } from '../../../shared/jobs/contract';
import { runFlowJob } from '../../../shared/jobs/flowJobs';

/**
 * An Ising field coupled to a field that is free at the "u only" point: at s = 2 γ_φ is a matrix whose
 * eigenvalues differ there, so η is given per field direction (docs/physics.md, field renormalization at s = 2).
 */
const anisotropic = (fixedPoint?: string) => ({
  job: 'exponents',
  model: { preset: 'custom', fields: 2, potential: 'u/24*phi1^4 + v/24*phi2^4 + w/4*phi1^2*phi2^2' },
  s: '2',
  d: '3.8',
  loops: 2,
  digits: 12,
  ...(fixedPoint ? { fixedPoint } : {}),
});

test('at the Ising ⊕ free point, η is the Ising η along phi1 and 0 along phi2; the single η is withheld', () => {
  const out = ExponentsResult.parse(runFlowJob(anisotropic('u only')));
  assert.ok('fieldAnomalous' in out && out.fieldAnomalous, 'field directions are reported');
  const [phi1, phi2] = out.fieldAnomalous.directions;
  assert.equal(phi1.field, 'phi1');
  // Wilson–Fisher η = (N + 2) ε² / (2 (N + 8)²) at N = 1, i.e. ε²/54 (common practice; textbook two-loop result)
  assert.equal(Number(phi1.series.eta[2]).toFixed(11), (1 / 54).toFixed(11));
  assert.equal(Number(phi1.values?.eta).toFixed(11), ((1 / 54) * 0.2 ** 2).toFixed(11));
  // a free field has no anomalous dimension (common practice)
  assert.deepEqual(phi2.series.eta.map(Number), [0, 0, 0]);
  assert.equal('values' in out ? out.values?.eta : 'missing', null);
  assert.ok(out.notices.some((n) => n.kind === 'eta-per-field'));
});

test('at the symmetric O(2) point the matrix is ∝ δ and one η is printed, equal to the O(2) η', () => {
  const out = ExponentsResult.parse(runFlowJob(anisotropic()));
  assert.equal(out.meanField, false);
  if (out.meanField) return;
  // Wilson–Fisher η = (N + 2) ε² / (2 (N + 8)²) at N = 2: ε²/50 (common practice)
  assert.equal(Number(out.series.eta?.[2]).toFixed(11), (1 / 50).toFixed(11));
  assert.equal(out.fieldAnomalous?.proportional ?? true, true);
});
