import assert from 'node:assert/strict';
import { test } from 'node:test';
import { COST_LIMITS, estimatedResultBytes, jobCostProblem } from '../../../shared/jobs/cost';
import { JOB_LIMITS, RESULT_LIMITS } from '../../../shared/jobs/contract';
import { runBatch, runJob } from '../../../shared/jobs';
import { jobForCell, type DatasetForJob, type SetupInput } from '../../../shared/notebook/jobs';
import { extractPoints, readTable } from '../../../shared/notebook/datasetParsing';
import { demoDatasets } from '../../../server/seed/demoDatasets';
import { demoNotebook } from '../../../server/seed/demo';

const scan = (model: unknown, points: number, quantities: string[], digits: number) => ({
  job: 'scan',
  model,
  d: '3',
  s: { from: '1.55', to: '1.95', points },
  quantities,
  loops: 2,
  digits,
});
const six = ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2'];

test('every job of the demo notebook is well within the limits', () => {
  const setups = new Map<string, SetupInput>(demoNotebook.cells.flatMap((c) => (c.input.kind === 'setup' ? [[c.label, c.input] as const] : [])));
  const cells = new Map(demoNotebook.cells.map((c) => [c.label, c.input]));
  const datasets = new Map<string, DatasetForJob>(
    demoDatasets.map(({ description, text }) => {
      const { points } = extractPoints(readTable(text, { header: description.header }), description);
      return [description.label, { label: description.label, shape: description.shape, xAxis: description.xAxis, yAxis: description.yAxis, points, contentHash: description.label }];
    }),
  );
  const jobs = demoNotebook.cells.map((c) => jobForCell(c.input, setups, { cells, datasets })).filter((j) => j !== null);
  assert.ok(jobs.filter((job) => job.job === 'compare').length === 2, 'the demo notebook compares both datasets');
  for (const job of jobs) assert.equal(jobCostProblem(job), null, JSON.stringify(job));
});

test('a one-coupling scan at the schema maximum (1000 points × 6 quantities × 200 digits, measured about 8 s) is accepted', () => {
  assert.equal(jobCostProblem(scan({ preset: 'on', N: 1 }, 1000, six, 200)), null);
});

test('a scan of a two-coupling model is limited by points × digits × fields, and the message names what to reduce', () => {
  // cubic(3): measured about 40 ms a point at 30 digits, so about 1000 points fit the limit and 2000 would not.
  assert.equal(jobCostProblem(scan({ preset: 'cubic', N: 3 }, 500, ['nuInv', 'omega'], 30)), null);
  // cubic(6): measured about 190 ms a point at 30 digits — 1000 points is minutes of engine time.
  const problem = jobCostProblem(scan({ preset: 'cubic', N: 6 }, 1000, six, 30));
  assert.ok(problem, 'refused');
  assert.match(problem, /1000 points × 6 quantities × 30 digits/);
  assert.match(problem, /reduce points, quantities, digits or the number of couplings/);
  // the estimate grows with points: find the largest accepted count by bisection and check the next one is refused
  let lo = 2;
  let hi = 1000;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (jobCostProblem(scan({ preset: 'cubic', N: 6 }, mid, six, 30)) === null) lo = mid;
    else hi = mid;
  }
  assert.equal(jobCostProblem(scan({ preset: 'cubic', N: 6 }, lo, six, 30)), null);
  assert.ok(jobCostProblem(scan({ preset: 'cubic', N: 6 }, lo + 1, six, 30)));
  // at the limit the estimate is about maxUnits ms; with 190 ms a point measured, lo points take about lo × 0.19 s ≤ 60 s
  assert.ok(lo * 0.19 <= 60, `${lo} points of cubic(6) would take about ${Math.round(lo * 0.19)} s`);
});

test('a custom flow is limited by its number of couplings', () => {
  const three = { preset: 'custom', fields: 2, potential: 'u*(phi1^4+phi2^4) + v*phi1^2*phi2^2 + w*(phi1^3*phi2+phi1*phi2^3)' };
  // measured: about 0.5 s a point for this model at 30 digits
  assert.equal(jobCostProblem(scan(three, 20, ['nuInv', 'omega'], 30)), null);
  const problem = jobCostProblem(scan(three, 1000, ['nuInv', 'omega'], 30));
  assert.ok(problem);
  assert.match(problem, /2-field model with 3 couplings/);
});

test('series jobs: digits × terms at the limit is accepted, one digit over is refused with the input to reduce', () => {
  // Γ(eps) has a simple pole (leading power −1), Γ(1−eps) none: depth beyond the leading power = order + 1
  const at = (digits: number, order: number) => ({ job: 'laurent', expr: 'gamma(eps)*gamma(1-eps)', order, at: { s: '1' }, digits });
  const digitsAtLimit = Math.floor(JOB_LIMITS.maxDigitsTimesTerms / 31); // order 29 → depth 30 → 31 terms
  assert.equal(jobCostProblem(at(digitsAtLimit, 29)), null);
  assert.match(jobCostProblem(at(digitsAtLimit + 1, 29)) ?? '', /digits × terms = \d+ exceeds 12000; reduce the digits or the order/);
  assert.match(jobCostProblem(at(30, 30)) ?? '', /limited to 30 terms beyond the leading power \(asked 31\); reduce the order/);
  // the runner gives the same message
  assert.deepEqual(runJob(at(30, 30)), { error: { code: 'limit', message: jobCostProblem(at(30, 30)) } });
});

test('special and Padé jobs keep their digits × terms limits', () => {
  const limit = JOB_LIMITS.maxDigitsTimesTerms * 4;
  assert.equal(jobCostProblem({ job: 'special', fn: 'psi', x: '2', order: limit / 1000 - 1, digits: 1000 }), null);
  assert.match(jobCostProblem({ job: 'special', fn: 'psi', x: '2', order: 200, digits: 1000 }) ?? '', /reduce the digits or the order/);
  const coeffs = (n: number) => Array.from({ length: n }, (_, i) => String(i + 1));
  const one = (n: number) => ({ job: 'pade', coeffs: coeffs(n), L: Math.floor((n - 1) / 2), M: Math.ceil((n - 1) / 2), digits: JOB_LIMITS.maxDigitsTimesTerms / 40 });
  assert.equal(jobCostProblem(one(40)), null);
  assert.match(jobCostProblem(one(41)) ?? '', /reduce the digits or the number of coefficients/);
});

test('the full Padé table has every [L/M] with L + M ≤ n: its size is estimated and a table over the result limit is refused', () => {
  const coeffs = Array.from({ length: 41 }, (_, i) => String(i + 1));
  // 41 coefficients: (41 · 42)/2 = 861 approximants with 2 + L + M coefficients each, Σ over L + M = t ≤ 40 of (t + 1)(t + 2) = 24 682 numbers (hand count)
  const wide = { job: 'pade', coeffs, digits: 290 };
  assert.ok(24_682 * 290 > RESULT_LIMITS.maxResultBytes, 'the numbers alone are over the limit');
  assert.match(jobCostProblem(wide) ?? '', /861 approximants\) at 290 digits would take about \d+(\.\d)? MB.*give L and M/);
  assert.ok(estimatedResultBytes(wide) >= 24_682 * 290);
  // at 50 digits the same table is about 24 682 × 60 characters, well under the limit (measured 3.3 s of engine time)
  assert.equal(jobCostProblem({ ...wide, digits: 50 }), null);
});

test('a scan whose range reaches s = 2 costs an extra derivation and fixed-point search at s = 2', () => {
  const model = { preset: 'cubic', N: 6 };
  const ending = (to: string, points: number) => ({ ...scan(model, points, six, 30), s: { from: '1.55', to, points } });
  let lo = 2;
  let hi = 1000;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (jobCostProblem(ending('1.95', mid)) === null) lo = mid;
    else hi = mid;
  }
  // the largest scan ending at 1.95 that fits: the same number of points ending at s = 2 also derives the flow at s = 2
  assert.equal(jobCostProblem(ending('1.95', lo)), null);
  assert.ok(jobCostProblem(ending('2', lo)));
  assert.ok(jobCostProblem({ ...ending('1.95', lo), s: { from: '2', to: '1.95', points: lo } }), 'either end may be s = 2');
});

test('a batch is limited in count and in total work; the runner refuses exactly what the cost check refuses', () => {
  const one = { job: 'special', fn: 'gamma', x: '2', digits: 1000 };
  const fits = Array.from({ length: JOB_LIMITS.maxBatchWork / 1000 }, () => one);
  assert.equal(jobCostProblem(fits), null);
  const over = [...fits, one];
  const problem = jobCostProblem(over);
  assert.match(problem ?? '', /split it into smaller calls/);
  assert.deepEqual(runBatch(over), { error: { code: 'limit', message: problem } });
  assert.match(jobCostProblem(Array.from({ length: JOB_LIMITS.maxBatch + 1 }, () => ({ job: 'special', fn: 'gamma', x: '2', digits: 5 }))) ?? '', /at most 100 jobs/);
});

test('a hostile potential is refused by the cost check in milliseconds', () => {
  const started = performance.now();
  const problem = jobCostProblem({ job: 'flow', model: { preset: 'custom', fields: 6, potential: '((phi1+phi2+phi3+phi4+phi5+phi6)^4)^3' }, loops: 2, digits: 30 });
  assert.ok(performance.now() - started < 500);
  assert.match(problem ?? '', /quartic in the fields/);
});

test('invalid jobs are left to the job schema (no cost problem reported)', () => {
  assert.equal(jobCostProblem({ job: 'nonsense' }), null);
  assert.equal(jobCostProblem(null), null);
});

test('the unit is calibrated to the limit in seconds the messages print', () => {
  assert.ok(COST_LIMITS.maxUnits >= 30_000 && COST_LIMITS.maxUnits <= 60_000);
  assert.equal(runJob({ job: 'special', fn: 'gamma', x: '5', digits: 10 }).hasOwnProperty('value'), true);
});

test('three loops: accepted by the contract and charged more than two (derivation factor and Padé–Borel sums); a heavy three-loop job is refused up front', () => {
  const exponents = (loops: number, model: unknown, digits = 30) => ({ job: 'exponents', model, s: '1.75', d: '3', loops, digits });
  assert.equal(jobCostProblem(exponents(3, { preset: 'on', N: 1 })), null);
  assert.equal((runJob({ job: 'flow', model: { preset: 'on', N: 1 }, loops: 4 }) as { error?: { code: string } }).error?.code, 'invalid-job');
  // a custom model with six fields and many couplings at three loops and 200 digits is over the limit, and says what to reduce
  const heavy = exponents(3, { preset: 'custom', fields: 6, potential: 'u/24*(phi1^2+phi2^2+phi3^2+phi4^2+phi5^2+phi6^2)^2 + v/24*(phi1^4+phi2^4+phi3^4+phi4^4+phi5^4+phi6^4)' }, 200);
  assert.equal(jobCostProblem({ ...heavy, loops: 2 }), null);
  const problem = jobCostProblem(heavy);
  assert.ok(problem, 'refused');
  assert.match(problem, /at 3 loops and 200 digits/);
  assert.match(problem, /reduce digits, loops or the number of couplings/);
});

test('three loops: the P(s) evaluations are counted — a 200-point scan at 30 digits runs, the same at 80 digits or 5 points at 200 digits are refused before they start, naming what to reduce', () => {
  // the unit is about a millisecond; P(s) at 30 digits takes about 0.1 s (docs/tetrahedron.md, measured)
  assert.equal(jobCostProblem({ ...scan({ preset: 'on', N: '1' }, 200, ['nuInv', 'omega'], 30), loops: 3 }), null);
  assert.match(jobCostProblem({ ...scan({ preset: 'on', N: '1' }, 200, ['nuInv', 'omega'], 80), loops: 3 }) ?? '', /reduce points, quantities, digits/);
  assert.match(jobCostProblem({ ...scan({ preset: 'on', N: '1' }, 5, ['nuInv'], 200), loops: 3 }) ?? '', /over the limit/);
  // at s = 2 the period is 6ζ(3): no P(s) work
  assert.equal(jobCostProblem({ job: 'exponents', model: { preset: 'on', N: '1' }, s: '2', d: '3', loops: 3, digits: 100 }), null);
  assert.ok(5 * COST_LIMITS.tetrahedronUnit * (1 + 200 / 30) ** 4 > COST_LIMITS.maxUnits);
});
