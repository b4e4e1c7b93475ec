import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { evaluate } from 'mathjs';
import { special } from '../../../shared/engine/index';
import { CalcJob, CalcResult, JOB_LIMITS, isJobError, runBatch, runJob } from '../../../shared/jobs/index';
import { assertDigits, wide } from '../helpers/engine';

const repoRoot = join(__dirname, '..', '..', '..');

function calc(arg: string): { status: number | null; stdout: string; stderr: string; json: unknown } {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'shared/cli/calc.ts', arg], { cwd: repoRoot, encoding: 'utf8' });
  let json: unknown;
  try {
    json = JSON.parse(r.stdout);
  } catch {
    json = undefined;
  }
  return { status: r.status, stdout: r.stdout, stderr: r.stderr, json };
}

const errorCode = (r: unknown) => (r as { error?: { code: string } }).error?.code;

test('special jobs return `digits` correct significant digits (docs/physics.md §10 values)', () => {
  const r = runJob({ job: 'special', fn: 'gamma', x: '0.25', digits: 40 }) as { value: string };
  assertDigits(r.value, '3.6256099082219083119306851558676720029951', 40); // cf. OEIS A068466
  assert.equal(r.value.replace(/^-?0?\.?0*/, '').replace('.', '').length, 40);
  const psi1 = runJob({ job: 'special', fn: 'psi', order: 1, x: '0.25', digits: 30 }) as { value: string };
  assertDigits(psi1.value, wide(special.pi(40)).pow(2).plus(wide(special.catalan(40)).times(8)).toString(), 30); // DLMF 5.15
  const three = runJob({ job: 'special', fn: 'gamma', x: '3', digits: 8 }) as { value: string };
  assert.equal(three.value, '2.0000000');
  assert.ok(CalcResult.safeParse(r).success);
});

test('schemas are strict and limits are enforced up front', () => {
  const cases: Array<[unknown, string]> = [
    [{ job: 'special', fn: 'gamma', x: '1.5', digits: 30, extra: 1 }, 'invalid-job'],
    [{ job: 'special', fn: 'gamma', x: '1.5', digits: 4 }, 'invalid-job'],
    [{ job: 'special', fn: 'gamma', x: '1.5', digits: 1001 }, 'invalid-job'],
    [{ job: 'special', fn: 'gamma', x: 'one', digits: 30 }, 'invalid-job'],
    [{ job: 'special', fn: 'gamma', x: '1.5', order: 2, digits: 30 }, 'invalid-job'],
    [{ job: 'special', fn: 'gamma', x: '-3', digits: 30 }, 'pole'],
    [{ job: 'laurent', expr: 'gamma(s*eps)', order: 1 }, 'not-affine'],
    [{ job: 'laurent', expr: 'gamma(s) + gamma(eps)', order: 1 }, 'invalid-job'],
    [{ job: 'laurent', expr: 'gamma(s)', order: 1, at: { s: '-2' }, digits: 20 }, 'pole'],
    [{ job: 'laurent', expr: 'gamma(eps)', order: JOB_LIMITS.maxOrder + 1, at: {}, digits: 20 }, 'invalid-job'],
    [{ job: 'laurent', expr: 'gamma(eps)', order: 25, at: {}, digits: 1000 }, 'limit'],
    [{ job: 'laurent', expr: 'gamma(eps)', order: 12 }, 'limit'],
    [{ job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 30, mode: 'x' }, 'invalid-job'],
    [{ job: 'unknown' }, 'invalid-job'],
  ];
  for (const [job, code] of cases) assert.equal(errorCode(runJob(job)), code, JSON.stringify(job));
  assert.ok(!CalcJob.safeParse({ job: 'special', fn: 'gamma', x: '1', digits: 30, foo: 1 }).success);
});

test('laurent job: Γ(ε)Γ(1−ε) = π/sin(πε) = 1/ε + π²ε/6 + … (DLMF 5.5.3), numeric and symbolic', () => {
  const numeric = runJob({ job: 'laurent', expr: 'gamma(eps)*gamma(1-eps)', order: 3, at: {}, digits: 30 }) as { lowest: number; order: number; coeffs: string[] };
  assert.equal(numeric.lowest, -1);
  assert.equal(numeric.order, 3);
  assert.equal(numeric.coeffs.length, 5);
  const pi2 = wide(special.pi(40)).pow(2);
  assertDigits(numeric.coeffs[0], '1', 30);
  assert.equal(numeric.coeffs[1], '0');
  assertDigits(numeric.coeffs[2], pi2.div(6).toString(), 30);
  assert.equal(numeric.coeffs[3], '0');
  assertDigits(numeric.coeffs[4], pi2.pow(2).times(7).div(360).toString(), 30);
  const symbolic = runJob({ job: 'laurent', expr: 'gamma(eps)*gamma(1-eps)', order: 3 }) as { coeffs: Array<{ expr: string }> };
  assert.deepEqual(
    symbolic.coeffs.map((c) => c.expr),
    ['1', '0', 'pi^2/6', '0', '7*pi^4/360'],
  );
});

test('bubble job: G(s/2,s/2), d = 2s−ε (docs/physics.md §4), numeric vs symbolic parsed back with mathjs', () => {
  const numeric = runJob({ job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 30 }) as { lowest: number; coeffs: string[] };
  const symbolic = runJob({ job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 }) as { lowest: number; coeffs: Array<{ expr: string; latex: string }> };
  assert.equal(numeric.lowest, -1);
  assert.equal(symbolic.lowest, -1);
  assertDigits(numeric.coeffs[0], wide(2).div(special.gamma('1.5', 40)).toString(), 30, 'pole 2/Γ(s)');
  const scope = { s: 1.5, psi: (k: number, x: number) => Number(special.polygamma(k, x.toPrecision(17), 20)), eulergamma: 0.5772156649015329 /* OEIS A001620 */ };
  symbolic.coeffs.forEach((c, i) => {
    const v = evaluate(c.expr, scope) as number;
    assert.ok(Math.abs(v - Number(numeric.coeffs[i])) < 1e-12 * Math.max(1, Math.abs(v)), `${c.expr}`);
    assert.ok(c.latex.length > 0);
  });
  // the laurent job with d defined gives the same series as the bubble job
  const viaLaurent = runJob({ job: 'laurent', expr: 'gamma(d/2-s/2)^2*gamma(s-d/2)/(gamma(s/2)^2*gamma(d-s))', d: '2*s-eps', order: 1, at: { s: '1.5' }, digits: 30 }) as { coeffs: string[] };
  assert.deepEqual(viaLaurent.coeffs, numeric.coeffs);
});

test('numeric series digits are all correct: 30-digit output agrees with a 60-digit run', () => {
  const job = { job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 3, at: { s: '1.37' } };
  const low = runJob({ ...job, digits: 30 }) as { coeffs: string[] };
  const high = runJob({ ...job, digits: 60 }) as { coeffs: string[] };
  low.coeffs.forEach((c, i) => assertDigits(c, high.coeffs[i], 30, `eps^${i - 1}`));
});

test('pade job: [1/1] of exp is (1+x/2)/(1−x/2); its pole at 2 flags it when the interval holds it (common practice)', () => {
  // [1/1] of 1 + x + x²/2: q₁ = −c₂/c₁ = −1/2, p₀ = 1, p₁ = c₁ + q₁c₀ = 1/2 (hand derivation); at x = 1 it is 1.5/0.5 = 3
  const job = { job: 'pade', coeffs: ['1', '1', '0.5'], L: 1, M: 1, at: '1', digits: 20 };
  const clear = runJob({ ...job, interval: ['0', '1.5'] }) as { numerator: string[]; denominator: string[]; value?: string; poles: string[]; flagged: boolean };
  assert.deepEqual(clear.numerator.map(Number), [1, 0.5]);
  assert.deepEqual(clear.denominator.map(Number), [1, -0.5]);
  assert.equal(Number(clear.value), 3);
  assert.equal(clear.flagged, false);
  const flagged = runJob({ ...job, interval: ['0', '3'] }) as { value?: string; poles: string[]; flagged: boolean; reason: string };
  assert.equal(flagged.flagged, true);
  assert.deepEqual(flagged.poles.map(Number), [2]);
  assert.equal(flagged.value, undefined, 'a flagged approximant has no plain value');
  assert.match(flagged.reason, /pole inside the interval at 2/);
  // 4 coefficients: every [L/M] with L + M ≤ 3, that is 1 + 2 + 3 + 4 = 10 approximants
  const table = runJob({ job: 'pade', coeffs: ['1', '1', '0.5', '0.1666666666666666666666666667'], digits: 20 }) as { table: unknown[] };
  assert.equal(table.table.length, 10);
});

test('batches run in order; one bad job does not stop the others', () => {
  const out = runBatch([{ job: 'special', fn: 'zeta', x: '3', digits: 20 }, { job: 'special', fn: 'gamma', x: '0', digits: 20 }]) as CalcResult[];
  assertDigits((out[0] as { value: string }).value, '1.2020569031595942853997381615114499907650', 20); // OEIS A002117
  assert.equal(errorCode(out[1]), 'pole');
});

test('CLI contract: one JSON on stdout, exit 0 / 2, no stack traces (spawned process)', () => {
  const ok = calc('{"job":"special","fn":"psi","x":"0.25","digits":30}');
  assert.equal(ok.status, 0);
  assertDigits((ok.json as { value: string }).value, '-4.227453533376265408089530146096683577367244438708', 30); // DLMF 5.4.19
  assert.equal(ok.stdout.trim().split('\n').length, 1);

  const bad = calc('{"job":"special","fn":"psi","x":"0.25","digits":30,"bogus":true}');
  assert.equal(bad.status, 2);
  assert.equal(errorCode(bad.json), 'invalid-job');
  assert.equal(bad.stderr, '');

  const notJson = calc('{not json');
  assert.equal(notJson.status, 2);
  assert.equal(errorCode(notJson.json), 'parse');
  assert.ok(!/\bat .*\.ts:\d+/.test(notJson.stdout + notJson.stderr), 'no stack trace');

  const dir = mkdtempSync(join(tmpdir(), 'calc-'));
  const file = join(dir, 'jobs.json');
  writeFileSync(file, JSON.stringify([{ job: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 0, at: { s: '1.5' }, digits: 25 }, { job: 'laurent', expr: 'gamma(eps)', order: 0 }]));
  const batch = calc(`@${file}`);
  assert.equal(batch.status, 0);
  const results = batch.json as Array<{ lowest: number; coeffs: unknown[] }>;
  assert.equal(results.length, 2);
  assert.equal(results[0].lowest, -1);
  assert.deepEqual(results[1].coeffs, [{ expr: '1', latex: '1' }, { expr: '-eulergamma', latex: '-\\gamma_E' }]); // Γ(ε) = 1/ε − γ + … (DLMF 5.7.1)

  const mixed = calc('[{"job":"special","fn":"gamma","x":"2.5","digits":10},{"job":"special","fn":"gamma","x":"-1","digits":10}]');
  assert.equal(mixed.status, 2);
  assert.equal((mixed.json as unknown[]).length, 2);
  const missing = calc(`@${join(dir, 'nope.json')}`);
  assert.equal(missing.status, 2);
  assert.equal(errorCode(missing.json), 'parse');
});

test('work is refused up front: symbolic factors × terms, numeric digits × terms × factors, and a batch total', () => {
  const factors = (n: number) => Array.from({ length: n }, (_, i) => `gamma(${i + 1}*s/7+eps)`).join('*');
  const started = Date.now();
  const symbolic = runJob({ job: 'laurent', expr: factors(12), order: 5 });
  assert.ok(isJobError(symbolic) && symbolic.error.code === 'limit', JSON.stringify(symbolic).slice(0, 200));
  const numeric = runJob({ job: 'laurent', expr: factors(10), order: 10, at: { s: '1.5' }, digits: 1000 });
  assert.ok(isJobError(numeric) && /digits × terms × Γ factors = 110000/.test(numeric.error.message));
  const batch = runBatch(Array.from({ length: 100 }, () => ({ job: 'special', fn: 'gamma', x: '0.3', digits: 1000 })));
  assert.ok(!Array.isArray(batch) && isJobError(batch) && batch.error.code === 'limit');
  // Refusals cost nothing like the work they refuse (each of those runs for tens of seconds).
  assert.ok(Date.now() - started < 3000, `refusing took ${Date.now() - started} ms`);
});

test('symbolic coefficients print in one canonical sign convention, and still parse back to the numeric values (mathjs)', () => {
  const expr = 'gamma(-1+eps)*gamma(1+s-eps)/gamma(s/2)^2';
  const symbolic = runJob({ job: 'laurent', expr, order: 1 }) as { coeffs: { expr: string }[] };
  const numeric = runJob({ job: 'laurent', expr, order: 1, at: { s: '1.5' }, digits: 20 }) as { coeffs: string[] };
  for (const [k, c] of symbolic.coeffs.entries()) {
    assert.doesNotMatch(c.expr, /\+ -|\(-[a-z]/, `ε^${k - 1}: ${c.expr}`);
    assert.doesNotMatch(c.expr, /\b1\*/, `no unit factors: ${c.expr}`);
    // mathjs has Γ but no ψ, so it checks the coefficients free of ψ and γ_E here; the bubble parse-back test covers ψ terms.
    if (!c.expr.includes('psi') && !c.expr.includes('eulergamma')) {
      const value = evaluate(c.expr, { s: 1.5 });
      assert.ok(Math.abs(value - Number(numeric.coeffs[k])) < 1e-12 * Math.max(1, Math.abs(value)), `ε^${k - 1}`);
    }
  }
});
