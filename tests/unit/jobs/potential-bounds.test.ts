import assert from 'node:assert/strict';
import { test } from 'node:test';
import { POTENTIAL_LIMITS, customModel } from '../../../shared/engine/models/custom';
import { CalcJob, FlowCalcJob, runJob } from '../../../shared/jobs';
import { jobCostProblem } from '../../../shared/jobs/cost';

function refusedQuickly(fields: number, potential: string): string {
  const started = performance.now();
  let message = '';
  try {
    customModel(fields, potential);
  } catch (error) {
    message = (error as Error).message;
  }
  const elapsed = performance.now() - started;
  assert.ok(message, `refused: ${potential}`);
  assert.ok(elapsed < 200, `refused in ${elapsed.toFixed(1)} ms`);
  return message;
}

test('a potential is quartic in the fields: a bracket of degree 16 is refused before it is multiplied out', () => {
  customModel(1, 'g*phi1^4'); // warm the parser
  // (Σφ)^4 has degree 4; cubing it gives degree 12 — multiplied out it would have C(17,5) = 6188 terms from 126³ products
  assert.match(refusedQuickly(6, '((phi1+phi2+phi3+phi4+phi5+phi6)^4)^3'), /quartic in the fields.*degree up to 8/);
  assert.match(refusedQuickly(6, 'g*phi1^4*phi2'), /degree up to 5/);
});

test('each term carries one coupling: products of couplings are refused before expansion', () => {
  assert.match(refusedQuickly(6, '((u1+u2+u3+u4+u5+u6)^4)^3*phi1^4'), /multiplies up to 2 couplings/);
  assert.match(refusedQuickly(2, 'u*v*phi1^4'), /multiplies up to 2 couplings/);
});

test('the number of terms is bounded: many couplings times a full quartic bracket is refused by the term bound', () => {
  const couplings = Array.from({ length: 200 }, (_, i) => `g${i}`).join('+');
  // 200 couplings × C(10,4) = 210 quartic monomials in 6 fields: 42 210 terms > the limit
  assert.ok(201 * 210 > POTENTIAL_LIMITS.maxTerms);
  assert.match(refusedQuickly(6, `(${couplings})*(phi1+phi2+phi3+phi4+phi5+phi6)^4`), /could expand to \d+ terms/);
});

test('numbers cannot grow without bound through nested powers', () => {
  // 9^(4^6) has 4096·log2(9) ≈ 12 984 bits
  assert.match(refusedQuickly(1, '((((((9^4)^4)^4)^4)^4)^4)*g*phi1^4'), /over 4096 bits/);
  assert.match(refusedQuickly(1, 'g*phi1^5'), /powers in the potential must be integers 0…4/);
});

test('ordinary potentials are accepted and give the known tensors', () => {
  // O(2): V = u/24 (φ1²+φ2²)²; λ_1111 = ∂⁴V/∂φ1⁴ = u (scale 1/1 after the 4! of the monomial)
  const model = customModel(2, 'u/24*(phi1^2+phi2^2)^2 + v/24*(phi1^4+phi2^4)');
  assert.deepEqual(model.couplings, ['u', 'v']);
});

for (const name of ['constructor', '__proto__', 'toString', 'valueOf', 'hasOwnProperty']) {
  test(`"${name}" as a coupling or parameter name gives a clear error, never a built-in lookup`, () => {
    assert.match(refusedQuickly(1, `${name}*phi1^4`), new RegExp(`"${name}" cannot name a coupling`));
    // the job schemas refuse it up front (the API answers 400 from these)
    const flow = FlowCalcJob.safeParse({ job: 'flow', model: { preset: 'custom', fields: 1, potential: `${name}*phi1^4` }, loops: 1, digits: 20 });
    assert.equal(flow.success, false);
    assert.match(JSON.stringify(flow.error?.issues), /built-in property name/);
    const laurent = CalcJob.safeParse({ job: 'laurent', expr: `gamma(1 + ${name}*eps)`, order: 1 });
    assert.equal(laurent.success, false);
    const at = CalcJob.safeParse({ job: 'laurent', expr: 'gamma(1+eps)', order: 1, at: { [name]: '1' }, digits: 20 });
    if (name !== '__proto__') assert.equal(at.success, false, `at: { ${name} }`);
    // and the runner itself answers with an invalid-job error, not an internal one
    const result = runJob({ job: 'bubble', a: name, b: '1', d: '4-eps', order: 1 }) as { error?: { code: string } };
    assert.equal(result.error?.code, 'invalid-job');
  });
}

test('a parameter named like a built-in in "at" is refused by the runner too', () => {
  // JSON.parse makes "__proto__" an own key, which is how it arrives from a request body
  const job = JSON.parse('{"job":"laurent","expr":"gamma(1+eps)","order":1,"at":{"__proto__":"1","constructor":"2"},"digits":20}');
  const result = runJob(job) as { error?: { code: string; message: string } };
  assert.equal(result.error?.code, 'invalid-job');
  assert.match(result.error?.message ?? '', /at\.constructor/);
});

test('expressions cannot build huge numbers: nested powers of a constant are refused with a limit error', () => {
  const result = runJob({ job: 'laurent', expr: '((((9^50)^50)^50)^50)*gamma(1+eps)', order: 1 }) as { error?: { code: string; message: string } };
  assert.equal(result.error?.code, 'limit');
  assert.match(result.error?.message ?? '', /4096 bits/);
  assert.match(jobCostProblem({ job: 'laurent', expr: '((((9^50)^50)^50)^50)*gamma(1+eps)', order: 1 }) ?? '', /4096 bits/);
});
