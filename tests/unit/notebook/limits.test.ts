import assert from 'node:assert/strict';
import { test } from 'node:test';
import { MAX_FIELDS } from '../../../shared/engine/models/presets';
import { MAX_MODEL_FIELDS } from '../../../shared/notebook/cells';

test('the notebook refuses exactly the field counts the engine refuses', () => {
  // The notebook contract is bundled into the app, so it restates the engine's limit instead of importing the engine.
  assert.equal(MAX_MODEL_FIELDS, MAX_FIELDS);
});

test('the notebook refuses exactly the scan sizes the engine refuses', async () => {
  const { MAX_SCAN_POINTS } = await import('../../../shared/jobs/contract');
  const { scanInput } = await import('../../../shared/notebook/cells');
  const scan = (points: number) => scanInput.safeParse({ kind: 'scan', uses: 'setup', from: '1.5', to: '1.9', points, quantities: ['nuInv'] }).success;
  assert.equal(scan(MAX_SCAN_POINTS), true);
  assert.equal(scan(MAX_SCAN_POINTS + 1), false);
});
