import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { test } from 'node:test';
import { runBatch, runJob } from '../../../shared/jobs';
import { AnyJob, JOBS, JOB_KINDS, jobKindOf } from '../../../shared/jobs/contract';
import { parseInput } from '../../../server/http/validation';
import { calcRequest } from '../../../server/routes/runs';

// The job kinds the contract documents (docs/flows.md, "Jobs"), written out here as the independent list.
const DOCUMENTED_KINDS = ['special', 'laurent', 'bubble', 'fourier', 'startriangle', 'pade', 'flow', 'fixedpoints', 'exponents', 'scan', 'kinks', 'compare'];

const listsEveryKind = (message: string) => DOCUMENTED_KINDS.every((kind) => message.includes(kind));

test('JOB_KINDS, AnyJob and each input schema name the same kinds', () => {
  assert.deepEqual([...JOB_KINDS].sort(), [...DOCUMENTED_KINDS].sort());
  const unionKinds = AnyJob.options.map((option) => option.shape.job.value);
  assert.deepEqual([...unionKinds].sort(), [...JOB_KINDS].sort());
  for (const kind of JOB_KINDS) assert.equal(JOBS[kind].input.shape.job.value, kind);
});

test('an unknown job kind is refused with a message listing every kind', () => {
  const out = runJob({ job: 'gamma', x: '1' }) as { error: { code: string; message: string } };
  assert.equal(out.error.code, 'invalid-job');
  assert.match(out.error.message, /unknown job "gamma"/);
  assert.ok(listsEveryKind(out.error.message), out.error.message);
});

test('a missing "job", a non-object and a job named by an inherited property name list every kind too', () => {
  for (const input of [{}, null, 42, 'special', { job: 'constructor' }, { job: 'toString' }, { job: 7 }]) {
    const out = runJob(input) as { error: { code: string; message: string } };
    assert.equal(out.error.code, 'invalid-job', JSON.stringify(input));
    assert.ok(listsEveryKind(out.error.message), out.error.message);
  }
  assert.equal(jobKindOf({ job: '__proto__' }), null);
});

test('a known kind with a bad field is refused by that kind’s schema, naming the field', () => {
  const out = runJob({ job: 'special', fn: 'gamma', x: '1.5', digits: 30, extra: 1 }) as { error: { code: string; message: string } };
  assert.equal(out.error.code, 'invalid-job');
  assert.match(out.error.message, /extra/);
});

test('in a batch each unknown job gets the same message, in place', () => {
  const out = runBatch([{ job: 'special', fn: 'zeta', x: '2', digits: 10 }, { job: 'nope' }]) as { error?: { message: string }; value?: string }[];
  // ζ(2) = π²/6 = 1.644934067 (DLMF 25.6.1), to 10 digits
  assert.equal(out[0].value, '1.644934067');
  assert.ok(listsEveryKind(out[1].error!.message));
});

test('the calc CLI answers an unknown kind with exit code 2 and the list of kinds', () => {
  const cli = spawnSync(process.execPath, ['--import', 'tsx', 'shared/cli/calc.ts', '{"job":"nope"}'], { encoding: 'utf8', timeout: 60_000 });
  assert.equal(cli.status, 2, cli.stderr);
  const out = JSON.parse(cli.stdout) as { error: { code: string; message: string } };
  assert.equal(out.error.code, 'invalid-job');
  assert.ok(listsEveryKind(out.error.message), out.error.message);
});

test('POST /api/calc validates the body with the contract: an unknown kind is a 400 naming every kind', () => {
  assert.throws(
    () => parseInput(calcRequest, { job: { job: 'nope' } }),
    (error: Error) => listsEveryKind(error.message),
  );
});
