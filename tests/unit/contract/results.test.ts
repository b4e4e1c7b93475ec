import assert from 'node:assert/strict';
import { test } from 'node:test';
import { z } from 'zod';
import { runJob } from '../../../shared/jobs';
import { JOBS, JOB_KINDS, JobError, type JobKind } from '../../../shared/jobs/contract';

/**
 * Every job kind runs on small inputs and its answer must validate against JOBS[kind].result (strict:
 * an extra or a missing field fails). This is how drift between a runner and the contract is caught:
 * whoever adds a field to a result adds it to the schema in the same change (docs/flows.md, "Results").
 * Inputs are kept cheap (10 digits, one or two loops, three scan points); each kind also has an input
 * the runner refuses, whose answer must be a JobError with the given code.
 */

interface Case {
  /** Jobs whose answer must be a result of the kind (one per result variant the kind has). */
  results: Record<string, unknown>[];
  /** A job of the kind the runner refuses, and the error code it must answer with. */
  failure: { job: Record<string, unknown>; code: JobError['error']['code'] };
}

const ising = { preset: 'on', N: 1 } as const;
const kinkPoints = Array.from({ length: 20 }, (_, i) => [String(i / 10), String(Math.abs(i - 10) / 10)]);
const compareBase = { job: 'compare', model: ising, loops: 1, digits: 10, d: '3', s: { from: '1.55', to: '1.95', points: 3 }, quantity: 'nuInv' };

const CASES: Record<JobKind, Case> = {
  special: {
    results: [
      { job: 'special', fn: 'gamma', x: '0.5', digits: 10 },
      { job: 'special', fn: 'lngamma', x: '-2.5', digits: 10 },
    ],
    failure: { job: { job: 'special', fn: 'gamma', x: '-2', digits: 10 }, code: 'pole' },
  },
  laurent: {
    results: [
      { job: 'laurent', expr: 'gamma(eps)*gamma(1-eps)', order: 2 },
      { job: 'laurent', expr: 'gamma(eps)', order: 2, at: {}, digits: 10 },
    ],
    failure: { job: { job: 'laurent', expr: 'gamma(s) + gamma(eps)', order: 1 }, code: 'invalid-job' },
  },
  bubble: {
    results: [{ job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 10 }],
    failure: { job: { job: 'bubble', a: 'eps*eps', b: '1', d: '2*s-eps', order: 1 }, code: 'not-affine' },
  },
  fourier: {
    results: [{ job: 'fourier', a: 's', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 10 }],
    failure: { job: { job: 'fourier', a: 's', d: '2*s-eps', order: 1, at: { s: '0' }, digits: 10 }, code: 'pole' },
  },
  startriangle: {
    results: [{ job: 'startriangle', deltas: ['d/3', 'd/3', 'd/3'], d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 10 }],
    failure: { job: { job: 'startriangle', deltas: ['1', '1', '1'], d: '2*s-eps', order: 1 }, code: 'invalid-job' },
  },
  pade: {
    results: [
      { job: 'pade', coeffs: ['1', '1', '0.5'], L: 1, M: 1, at: '0.5', interval: ['0', '1'], digits: 10 },
      { job: 'pade', coeffs: ['1', '1', '0.5'], digits: 10 },
      { job: 'pade', coeffs: ['1', '2', '4'], at: '1', digits: 10 },
    ],
    failure: { job: { job: 'pade', coeffs: ['1', '1'], L: 1, digits: 10 }, code: 'invalid-job' },
  },
  flow: {
    results: [
      { job: 'flow', model: ising, loops: 1, digits: 10 },
      { job: 'flow', model: { preset: 'cubic', N: 2 }, loops: 1, digits: 10 },
    ],
    failure: { job: { job: 'flow', model: { preset: 'custom', fields: 2, potential: 'u*phi1^3' }, loops: 1, digits: 10 }, code: 'invalid-job' },
  },
  fixedpoints: {
    results: [
      { job: 'fixedpoints', model: ising, d: '3', s: '1.75', loops: 1, digits: 10 },
      { job: 'fixedpoints', model: { preset: 'cubic', N: 2 }, d: '3', s: '1.75', loops: 1, digits: 10 },
      { job: 'fixedpoints', model: ising, d: '3', s: '1.25', loops: 1, digits: 10 },
    ],
    failure: { job: { job: 'fixedpoints', model: ising, d: '3', loops: 1, digits: 10 }, code: 'invalid-job' },
  },
  exponents: {
    results: [
      { job: 'exponents', model: ising, d: '3', s: '1.75', loops: 2, digits: 10 },
      { job: 'exponents', model: ising, d: '3', s: '1.25', loops: 1, digits: 10 },
    ],
    failure: { job: { job: 'exponents', model: ising, d: '3', s: '1.75', loops: 1, digits: 10, fixedPoint: 'nowhere' }, code: 'invalid-job' },
  },
  scan: {
    results: [
      { job: 'scan', model: ising, d: '3', s: { from: '1.4', to: '1.9', points: 3 }, loops: 1, digits: 10 },
      { job: 'scan', model: ising, d: '3', s: { from: '1.4', to: '2', points: 4 }, loops: 1, digits: 10, quantities: ['eta'], shortRange: { Delta_sigma: '0.5181489' } },
    ],
    failure: { job: { job: 'scan', model: ising, d: '-3', s: { from: '1.4', to: '1.9', points: 3 }, loops: 1, digits: 10 }, code: 'domain' },
  },
  kinks: {
    results: [{ job: 'kinks', points: kinkPoints, resamples: 20 }],
    failure: { job: { job: 'kinks', points: [['0', '1'], ['1', '2']] }, code: 'invalid-job' },
  },
  compare: {
    results: [
      { ...compareBase, data: { xAxis: 's', x: ['1.7'], y: ['1.5'] } },
      { ...compareBase, data: { xAxis: 'Delta_phi', x: ['0.6', '0.65'], y: ['1.5', '1.45'], yErrLow: ['0.1', '0.1'], yErrHigh: ['0.1', '0.2'] } },
    ],
    failure: { job: { ...compareBase, data: { xAxis: 's', x: ['1.7', '1.8'], y: ['1.5'] } }, code: 'invalid-job' },
  },
};

const issues = (error: z.ZodError) => z.prettifyError(error);

test('the cases cover every job kind of the contract', () => {
  assert.deepEqual(Object.keys(CASES).sort(), [...JOB_KINDS].sort());
});

for (const kind of JOB_KINDS) {
  test(`${kind}: each answer validates against JOBS.${kind}.result`, () => {
    for (const job of CASES[kind].results) {
      const output = runJob(job);
      assert.ok(!JobError.safeParse(output).success, `${JSON.stringify(job)} failed: ${JSON.stringify(output)}`);
      const parsed = JOBS[kind].result.safeParse(output);
      assert.ok(parsed.success, `${JSON.stringify(job)}: the result does not match the contract:\n${parsed.success ? '' : issues(parsed.error)}`);
    }
  });

  test(`${kind}: a refused input answers with a JobError, not a result`, () => {
    const { job, code } = CASES[kind].failure;
    const output = runJob(job);
    const parsed = JobError.safeParse(output);
    assert.ok(parsed.success, `${JSON.stringify(job)}: not a JobError: ${JSON.stringify(output).slice(0, 300)}`);
    assert.equal(parsed.data.error.code, code, parsed.data.error.message);
    assert.ok(!JOBS[kind].result.safeParse(output).success);
  });
}
