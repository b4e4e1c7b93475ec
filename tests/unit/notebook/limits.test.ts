import assert from 'node:assert/strict';
import { test } from 'node:test';
import { AnyJob, JOB_LIMITS, MAX_ABS_N, MAX_FIELDS, MAX_SCAN_POINTS } from '../../../shared/jobs/contract';
import { cellInput, type CellInput } from '../../../shared/notebook/cells';
import { jobForCell, type SetupInput } from '../../../shared/notebook/jobs';

/**
 * The notebook's cell schema takes its limits from the job contract (shared/jobs/contract/limits.ts).
 * What is checked here is the consequence: a cell at a limit builds a job the contract accepts, and a
 * cell one past it is refused by the cell schema, before any job is built.
 */

const setupAt = (overrides: Partial<SetupInput>): SetupInput => ({ kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30, ...overrides });
const jobOf = (cell: CellInput, setup: SetupInput) => jobForCell(cell, new Map([['setup', setup]]));
const cellOk = (cell: unknown) => cellInput.safeParse(cell).success;

test('a custom model with the most fields the engine takes builds a valid job; one more field is refused by the cell', () => {
  const custom = (fields: number) => setupAt({ model: { preset: 'custom', fields, potential: 'u/24*phi1^4' } });
  assert.ok(cellOk(custom(MAX_FIELDS)));
  const job = jobOf({ kind: 'flow', uses: 'setup' }, custom(MAX_FIELDS));
  assert.ok(AnyJob.safeParse(job).success, JSON.stringify(job));
  assert.equal(cellOk(custom(MAX_FIELDS + 1)), false);
});

test('a preset at the largest |N| builds a valid job; a larger N is refused by the cell', () => {
  for (const preset of ['on', 'cubic'] as const) {
    for (const N of [MAX_ABS_N, -MAX_ABS_N]) {
      const setup = setupAt({ model: { preset, N } });
      assert.ok(cellOk(setup), `${preset} N = ${N}`);
      assert.ok(AnyJob.safeParse(jobOf({ kind: 'flow', uses: 'setup' }, setup)).success, `${preset} N = ${N}`);
    }
    assert.equal(cellOk(setupAt({ model: { preset, N: MAX_ABS_N + 1 } })), false, preset);
  }
});

test('a scan with the most points builds a valid scan job; one more point is refused by the cell', () => {
  const scan = (points: number): CellInput => ({ kind: 'scan', uses: 'setup', from: '1.5', to: '1.9', points, quantities: ['nuInv'] });
  assert.ok(cellOk(scan(MAX_SCAN_POINTS)));
  assert.ok(AnyJob.safeParse(jobOf(scan(MAX_SCAN_POINTS), setupAt({ digits: 10 }))).success);
  assert.equal(cellOk(scan(MAX_SCAN_POINTS + 1)), false);
});

test('a setup with the most digits a notebook allows builds flow jobs the contract accepts', () => {
  const setup = setupAt({ digits: JOB_LIMITS.maxFlowDigits });
  assert.ok(cellOk(setup));
  for (const kind of ['flow', 'fixedpoints', 'exponents'] as const) {
    assert.ok(AnyJob.safeParse(jobOf({ kind, uses: 'setup' } as CellInput, setup)).success, kind);
  }
});
