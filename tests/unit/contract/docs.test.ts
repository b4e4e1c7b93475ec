import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { test } from 'node:test';
import { JOB_KINDS } from '../../../shared/jobs/contract';
import { DOC, END, START, jobTables } from './jobTables';

const flows = readFileSync(DOC, 'utf8');

test('docs/flows.md has a section for every job kind', () => {
  const missing = JOB_KINDS.filter((kind) => !flows.includes(`### \`${kind}\``));
  assert.deepEqual(missing, []);
});

test('the job and result tables of docs/flows.md are the ones the contract gives (npx tsx tests/unit/contract/jobTables.ts --write)', () => {
  const written = flows.slice(flows.indexOf(START), flows.indexOf(END) + END.length);
  assert.equal(written, jobTables(), 'the contract changed: regenerate the tables with npx tsx tests/unit/contract/jobTables.ts --write');
});
