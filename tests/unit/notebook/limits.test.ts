import assert from 'node:assert/strict';
import { test } from 'node:test';
import { AnyJob, JOB_LIMITS, MAX_ABS_N, MAX_FIELDS, MAX_SCAN_POINTS } from '../../../shared/jobs/contract';
import { cellInput, type CellInput } from '../../../shared/notebook/cells';
import { jobForCell, type SetupInput } from '../../../shared/notebook/jobs';
import { cellFieldErrors, longRangeWindow } from '../../../components/notebook/fieldErrors';

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

const scanFrom = (from: string, to: string): CellInput => ({ kind: 'scan', uses: 'setup', from, to, points: 5, quantities: ['nuInv'] });

test('a scan range outside (0, 2] or reversed is refused by the cell, whatever d is', () => {
  assert.equal(cellOk(scanFrom('1.6', '2')), true);
  assert.deepEqual(cellFieldErrors('scan', scanFrom('1.6', '2.1')), { to: 's lies in (0, 2]: s = 2 is the short-range theory' });
  assert.deepEqual(cellFieldErrors('scan', scanFrom('0', '1.9')), { from: 's lies in (0, 2]: s = 2 is the short-range theory' });
  assert.deepEqual(cellFieldErrors('scan', scanFrom('1.9', '1.6')), { to: 'The end of the range must be larger than its start' });
  assert.deepEqual(cellFieldErrors('scan', scanFrom('1.7', '1.7')), { to: 'The end of the range must be larger than its start' });
});

test('against its setup, a scan must start above d/2, compared exactly', () => {
  const at = (d: string) => ({ setupDimensions: new Map([['setup', d]]) });
  // d = 3: d/2 = 1.5 is the end of the mean-field region (docs/physics.md §3), itself excluded.
  assert.match(cellFieldErrors('scan', scanFrom('1.5', '1.9'), at('3')).from ?? '', /\(1\.5, 2\]/);
  assert.deepEqual(cellFieldErrors('scan', scanFrom('1.51', '1.9'), at('3')), {});
  // 2 × 1.5 = 3 < 3.00000000000000000001: still inside the mean-field region, though both read as 3 in floating point.
  assert.ok(cellFieldErrors('scan', scanFrom('1.5', '1.9'), at('3.00000000000000000001')).from);
  // 2 × 1.500000000000000000006 = 3.000000000000000000012 > 3.00000000000000000001: just inside the window.
  assert.deepEqual(cellFieldErrors('scan', scanFrom('1.500000000000000000006', '1.9'), at('3.00000000000000000001')), {});
  // Both ends are checked; d symbolic (empty) or not a decimal leaves only the checks that need no d.
  assert.deepEqual(Object.keys(cellFieldErrors('scan', scanFrom('1.2', '1.4'), at('3'))).sort(), ['from', 'to']);
  assert.deepEqual(cellFieldErrors('scan', scanFrom('0.2', '1.4'), { setupDimensions: new Map([['setup', undefined]]) }), {});
});

test('the window (d/2, 2] is written with d/2 exact, and only when it is not empty', () => {
  // d/2 by hand: 3/2 = 1.5, 2.5/2 = 1.25, 0.5/2 = 0.25, 3.0/2 = 1.5, 1/2 = 0.5.
  assert.equal(longRangeWindow('3'), '(1.5, 2]');
  assert.equal(longRangeWindow('2.5'), '(1.25, 2]');
  assert.equal(longRangeWindow('0.5'), '(0.25, 2]');
  assert.equal(longRangeWindow('3.0'), '(1.5, 2]');
  assert.equal(longRangeWindow('1'), '(0.5, 2]');
  // d = 4 gives d/2 = 2: nothing is left; d ≤ 0 and symbols have no window to state.
  assert.equal(longRangeWindow('4'), null);
  assert.equal(longRangeWindow('-1'), null);
  assert.equal(longRangeWindow(undefined), null);
  assert.equal(longRangeWindow('N'), null);
});

test('every limit of a cell is named in the product’s words, never the validator’s', () => {
  const raw = /Too (small|big)|expected|Invalid input|must be less than or equal/i;
  const setup = setupAt({});
  const wrong: unknown[] = [
    { ...setup, digits: 3 }, { ...setup, digits: 1e6 }, { ...setup, digits: 2.5 },
    { ...setup, model: { preset: 'custom', fields: MAX_FIELDS + 1, potential: 'x'.repeat(JOB_LIMITS.maxExpressionLength + 1) } },
    { ...setup, model: { preset: 'cubic', N: 'N' } }, { ...setup, model: { preset: 'on', N: MAX_ABS_N + 1 } },
    { kind: 'integral', form: 'laurent', expr: 'x'.repeat(JOB_LIMITS.maxExpressionLength + 1), a: 'x'.repeat(201), d: '', order: 13 },
    { kind: 'integral', form: 'bubble', d: '2', order: -1 },
    { kind: 'scan', uses: '', from: '1.6', to: '1.9', points: MAX_SCAN_POINTS + 1, quantities: [] },
    { kind: 'scan', uses: 'setup', from: '1.6', to: '1.9', points: 1, quantities: ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2', 'Delta_phi4'] },
    { kind: 'exponents', uses: 'setup', fixedPoint: 'x'.repeat(JOB_LIMITS.maxFixedPointName + 1) },
    { kind: 'note', text: 'x'.repeat(20_001) },
    { kind: 'comparison', uses: '', dataset: 'data', kinks: false },
  ];
  for (const input of wrong) {
    const errors = cellFieldErrors('cell', input);
    assert.ok(Object.keys(errors).length > 0, JSON.stringify(input).slice(0, 80));
    for (const message of Object.values(errors)) assert.doesNotMatch(message, raw, JSON.stringify(errors));
  }
});
