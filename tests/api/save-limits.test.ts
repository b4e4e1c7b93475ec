// A cell whose job would be over the engine's work limits is refused when it is saved, not only when
// it is run — and changing a setup is checked against every cell that uses it.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { jobCostProblem } from '../../shared/jobs/cost';
import { jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import type { CellInput } from '../../shared/notebook/cells';
import { startHarness, type Harness } from './harness';
import { createPerson, type TestPerson } from './people';

const smallSetup = { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.5', loops: 2, digits: 30 } as const;
const heavySetup = { kind: 'setup', model: { preset: 'cubic', N: 6 }, d: '3', s: '1.5', loops: 2, digits: 30 } as const;
const scan = { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 1000, quantities: ['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2'] };

describe('work limits on save', () => {
  let h: Harness;
  let owner: TestPerson;
  let notebookId: string;

  before(async () => {
    h = await startHarness();
    owner = await createPerson(h);
    notebookId = (await owner.client.post('/api/notebooks').send({ title: 'Invented limits notebook', summary: '' }).expect(201)).body.notebook.id;
  });
  after(() => h.close());

  test('the same scan is accepted for a one-component model and refused for six components', async () => {
    // Independent of the server: the engine's own cost estimate says which of the two is over.
    const setupsOf = (setup: SetupInput) => new Map([['setup', setup]]);
    assert.equal(jobCostProblem(jobForCell(scan as CellInput, setupsOf(smallSetup as SetupInput))), null);
    assert.notEqual(jobCostProblem(jobForCell(scan as CellInput, setupsOf(heavySetup as SetupInput))), null);

    const setup = (await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'setup', input: smallSetup }).expect(201)).body.notebook.cells[0];
    await owner.client.post(`/api/notebooks/${notebookId}/cells`).send({ label: 'scan', input: scan }).expect(201);

    const refused = await owner.client.patch(`/api/notebooks/${notebookId}/cells/${setup.id}`).send({ revision: setup.revision, input: heavySetup }).expect(422);
    assert.equal(refused.body.error.code, 'job_too_large');
    assert.match(refused.body.error.message, /cell "scan"/);
    const after = (await owner.client.get(`/api/notebooks/${notebookId}`).expect(200)).body.notebook;
    assert.deepEqual(after.cells.find((c: { label: string }) => c.label === 'setup').input, smallSetup, 'nothing changed');
  });

  test('adding an over-limit cell is refused with the input to reduce', async () => {
    const other = (await owner.client.post('/api/notebooks').send({ title: 'Invented heavy notebook', summary: '' }).expect(201)).body.notebook.id;
    await owner.client.post(`/api/notebooks/${other}/cells`).send({ label: 'setup', input: heavySetup }).expect(201);
    const refused = await owner.client.post(`/api/notebooks/${other}/cells`).send({ label: 'scan', input: scan }).expect(422);
    assert.match(refused.body.error.message, /points|quantities|digits/);
  });
});
