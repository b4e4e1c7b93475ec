import assert from 'node:assert/strict';
import { test } from 'node:test';
import { MAX_FIELDS } from '../../../shared/engine/models/presets';
import { MAX_MODEL_FIELDS } from '../../../shared/notebook/cells';

test('the notebook refuses exactly the field counts the engine refuses', () => {
  // The notebook contract is bundled into the app, so it restates the engine's limit instead of importing the engine.
  assert.equal(MAX_MODEL_FIELDS, MAX_FIELDS);
});
