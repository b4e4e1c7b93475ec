import assert from 'node:assert/strict';
import { test } from 'node:test';
import { customModel, customModelExpansions } from '../../../shared/engine/models/custom';
import type { CellInput } from '../../../shared/notebook/cells';
import { assertCellsAccepted } from '../../../server/services/cellChecks';

test('a notebook of one custom setup and 199 dependents expands the potential once when it is checked', () => {
  // a potential no other test uses, so that it cannot already be among the recent models
  const potential = 'u/24*(phi1^2+phi2^2)^2 + v/24*(phi1^4+phi2^4) + 0*u*phi1^4/7919';
  const setup: CellInput = { kind: 'setup', model: { preset: 'custom', fields: 2, potential }, d: '3', loops: 1, digits: 20 };
  const cells: { label: string; input: CellInput }[] = [{ label: 'setup', input: setup }];
  for (let i = 0; i < 199; i += 1) cells.push({ label: `fp${i}`, input: { kind: 'fixedpoints', uses: 'setup' } });
  const before = customModelExpansions();
  assertCellsAccepted(cells);
  // the setup's own check and every dependent's cost estimate read the same model
  assert.equal(customModelExpansions() - before, 1);
});

test('the same fields and potential give the same model object, frozen so that no caller can change it for another', () => {
  const a = customModel(2, 'g/24*(phi1^2+phi2^2)^2');
  const b = customModel(2, 'g/24*(phi1^2+phi2^2)^2');
  assert.equal(a, b);
  assert.ok(Object.isFrozen(a) && Object.isFrozen(a.couplings) && Object.isFrozen(a.basis) && Object.isFrozen(a.scales));
  assert.throws(() => (a.couplings as string[]).push('h'), TypeError);
  // a different field count is a different model
  assert.notEqual(customModel(3, 'g/24*(phi1^2+phi2^2)^2'), a);
});

test('only recent models are kept: after 32 others, a model is expanded again', () => {
  const first = customModel(1, 'w1*phi1^4');
  for (let k = 2; k <= 33; k += 1) customModel(1, `w${k}*phi1^4`);
  const before = customModelExpansions();
  const again = customModel(1, 'w1*phi1^4');
  assert.equal(customModelExpansions() - before, 1);
  assert.notEqual(again, first);
  assert.deepEqual(again.couplings, first.couplings);
});
