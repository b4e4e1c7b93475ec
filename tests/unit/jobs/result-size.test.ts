import assert from 'node:assert/strict';
import { test } from 'node:test';
import { runJob } from '../../../shared/jobs';
import { estimatedResultBytes, jobCostProblem } from '../../../shared/jobs/cost';
import { RESULT_LIMITS } from '../../../shared/jobs/contract';

const SIX = ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2'];
const ALL_TWELVE = ['nuInv', 'omega', 'eta', 'Delta_phi', 'Delta_phi2', 'Delta_phi3', 'Delta_phi4', 'nu', 'gamma', 'alpha', 'beta', 'delta'];
const scan = (model: object, points: number, quantities: string[], digits: number) => ({ job: 'scan', model, d: '3', s: { from: '1.55', to: '1.95', points }, quantities, loops: 2, digits });

test('the result-size estimate of a scan bounds the engine\'s actual result from above, within 50 %', () => {
  for (const job of [scan({ preset: 'on', N: 1 }, 100, SIX, 200), scan({ preset: 'on', N: 1 }, 100, ['nuInv'], 30), scan({ preset: 'cubic', N: 3 }, 20, SIX, 60)]) {
    const actual = JSON.stringify(runJob(job)).length;
    const estimate = estimatedResultBytes(job);
    assert.ok(estimate >= actual, `estimate ${estimate} ≥ actual ${actual} for ${JSON.stringify(job)}`);
    assert.ok(estimate <= 1.5 * actual, `estimate ${estimate} within 50 % of actual ${actual}`);
  }
});

test('the largest one-coupling scan with six quantities fits one result; with all twelve it is refused up front', () => {
  // `npm run calc` (2025-12, this engine): 1000 points × 6 quantities × 200 digits gave 2 826 754 characters,
  // × 12 quantities gave 5 202 955 — under and over the 4 MB limit per result.
  const six = scan({ preset: 'on', N: 1 }, 1000, SIX, 200);
  const twelve = scan({ preset: 'on', N: 1 }, 1000, ALL_TWELVE, 200);
  assert.ok(estimatedResultBytes(six) >= 2_826_754 && estimatedResultBytes(six) <= RESULT_LIMITS.maxResultBytes);
  assert.ok(estimatedResultBytes(twelve) >= 5_202_955);
  assert.equal(jobCostProblem(six), null);
  const problem = jobCostProblem(twelve);
  assert.ok(problem);
  assert.match(problem, /1000 points × 12 quantities × 200 digits/);
  assert.match(problem, /over the limit of 4\.0 MB per result; reduce points, quantities or digits/);
  // half the points fit again
  assert.equal(jobCostProblem(scan({ preset: 'on', N: 1 }, 500, ALL_TWELVE, 200)), null);
});
