// The access matrix: every route of the API route table × every kind of caller, with the status the
// product promises. The table below must name every route, so a new route cannot be added unchecked.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { apiRouteTable } from '../../server/app';
import { ResearchGroup } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { startHarness, type Harness } from './harness';
import { createPerson, joinGroup, notebookWithRun, signInAgain, type RouteFixture as Fixture, type TestPerson } from './people';

const identities = ['signedOut', 'unverified', 'siteAdmin', 'otherUser', 'groupMember', 'groupLead', 'owner'] as const;
type Identity = (typeof identities)[number];
type Expected = Record<Identity, number>;

interface Row {
  body?: (f: Fixture) => unknown;
  query?: (f: Fixture) => Record<string, string>;
  expect: Expected;
}

const all = (status: number): Expected => Object.fromEntries(identities.map((i) => [i, status])) as Expected;
const signedIn = (status: number): Expected => ({ ...all(status), signedOut: 401 });
/** Owner and group (member or lead) may; strangers — site admins included — learn nothing (404). */
const notebookRole = (status: number): Expected => ({ signedOut: 401, unverified: 404, siteAdmin: 404, otherUser: 404, groupMember: status, groupLead: status, owner: status });
/** Group managers: the lead and site admins; plain members (the owner is one) are refused; strangers see nothing. */
const groupManager = (status: number): Expected => ({ signedOut: 401, unverified: 404, siteAdmin: status, otherUser: 404, groupMember: 403, groupLead: status, owner: 403 });

const matrix: Record<string, Row> = {
  'GET /health': { expect: all(200) },
  'GET /openapi.json': { expect: all(200) },
  'POST /auth/sign-up': { body: () => ({ name: 'Invented Newcomer', email: `new-${newId()}@test.rungbook.example`, password: 'long-enough-pass-new' }), expect: all(202) },
  'POST /auth/verify': { body: () => ({ token: 'a'.repeat(43), password: 'long-enough-pass-new' }), expect: all(400) },
  // Public and answered alike for every address (no enumeration); a fresh address each time (5 mails per address per hour).
  'POST /auth/verify/resend': { body: () => ({ email: `resend-${newId()}@test.rungbook.example` }), expect: all(202) },
  'POST /auth/sign-in': { body: () => ({ email: 'nobody@test.rungbook.example', password: 'wrong-password-123' }), expect: all(401) },
  'POST /auth/sign-out': { body: () => ({}), expect: all(204) },
  'POST /auth/forgot': { body: () => ({ email: 'nobody@test.rungbook.example' }), expect: all(202) },
  'POST /auth/reset': { body: () => ({ token: 'a'.repeat(43), password: 'long-enough-pass-new' }), expect: all(400) },
  'GET /me': { expect: signedIn(200) },

  'GET /groups': { expect: signedIn(200) },
  // Only a confirmed address may start a group (it can then add people).
  'POST /groups': { body: () => ({ name: 'Invented Matrix Group', description: 'invented' }), expect: { ...signedIn(201), unverified: 403 } },
  'GET /groups/:groupId': { expect: { signedOut: 401, unverified: 404, siteAdmin: 200, otherUser: 404, groupMember: 200, groupLead: 200, owner: 200 } },
  // Only a lead adds people: a site admin could otherwise add an account of their own and read the group's notebooks.
  'POST /groups/:groupId/members': { body: () => ({ email: 'newcomer@test.rungbook.example', role: 'member' }), expect: { ...groupManager(201), siteAdmin: 403 } },
  'PATCH /groups/:groupId/members/:userId': { body: () => ({ role: 'member' }), expect: groupManager(200) },
  // Anyone may leave a group: the group member removes themself (the fixture's userId is the caller then).
  'DELETE /groups/:groupId/members/:userId': { expect: { ...groupManager(200), groupMember: 200 } },

  'GET /notebooks': { expect: signedIn(200) },
  'POST /notebooks': { body: () => ({ title: 'Invented new notebook', summary: '' }), expect: signedIn(201) },
  'POST /notebooks/import': { body: () => ({ format: 'rungbook-notebook', formatVersion: 1, title: 'Invented import', summary: '', cells: [] }), expect: signedIn(201) },
  'GET /notebooks/:notebookId': { expect: notebookRole(200) },
  'PATCH /notebooks/:notebookId': { body: () => ({ title: 'Renamed by the matrix' }), expect: notebookRole(200) },
  'DELETE /notebooks/:notebookId': { expect: { ...notebookRole(403), owner: 204 } },
  'POST /notebooks/:notebookId/cells': { body: () => ({ label: 'note2', input: { kind: 'note', text: 'Invented note' } }), expect: notebookRole(201) },
  'PATCH /notebooks/:notebookId/cells/:cellId': { body: () => ({ revision: 1, label: 'bubble2' }), expect: notebookRole(200) },
  'POST /notebooks/:notebookId/cells/:cellId/move': { body: () => ({ position: 0 }), expect: notebookRole(200) },
  'DELETE /notebooks/:notebookId/cells/:cellId': { expect: notebookRole(200) },
  'POST /notebooks/:notebookId/cells/:cellId/run': { expect: notebookRole(202) },
  'POST /notebooks/:notebookId/run-all': { expect: notebookRole(202) },
  'GET /notebooks/:notebookId/versions': { expect: notebookRole(200) },
  'POST /notebooks/:notebookId/versions': { body: () => ({ message: 'Matrix version' }), expect: notebookRole(201) },
  'GET /notebooks/:notebookId/versions/compare': { query: (f) => ({ from: f.versionId, to: f.versionId }), expect: notebookRole(200) },
  'GET /notebooks/:notebookId/versions/:versionId': { expect: notebookRole(200) },
  'POST /notebooks/:notebookId/versions/:versionId/restore': { expect: notebookRole(200) },
  'GET /notebooks/:notebookId/export.json': { expect: notebookRole(200) },
  'GET /notebooks/:notebookId/export.tex': { expect: notebookRole(200) },

  'POST /calc': { body: () => ({ job: { job: 'special', fn: 'gamma', x: '0.5', digits: 20 } }), expect: signedIn(200) },
  // A run of a notebook cell is as visible as the notebook; cancelling needs an editor of it.
  'GET /runs/:runId': { expect: notebookRole(200) },
  'POST /runs/:runId/cancel': { expect: notebookRole(200) },
  'GET /admin/mail': { expect: { ...signedIn(403), siteAdmin: 200 } },
};

describe('access matrix: every route × every kind of caller', () => {
  let h: Harness;
  const people = {} as Record<Exclude<Identity, 'signedOut'>, TestPerson>;

  before(async () => {
    h = await startHarness({ SIGNIN_LIMIT_PER_IP: '100000', SIGNIN_LIMIT_PER_ACCOUNT: '100000', SIGNUP_LIMIT_PER_IP: '100000', FORGOT_LIMIT_PER_IP: '100000', RESET_LIMIT_PER_IP: '100000', GROUP_ADD_LIMIT_PER_USER: '100000', VERSION_SAVE_LIMIT_PER_USER: '100000', JOB_QUEUE_PER_USER: '1000' });
    people.unverified = await createPerson(h, { tag: 'unverified', verified: false });
    people.siteAdmin = await createPerson(h, { tag: 'admin', siteAdmin: true });
    people.otherUser = await createPerson(h, { tag: 'other' });
    people.groupMember = await createPerson(h, { tag: 'member' });
    people.groupLead = await createPerson(h, { tag: 'lead' });
    people.owner = await createPerson(h, { tag: 'owner' });
    await createPerson(h, { tag: 'newcomer', signIn: false }).then(async (p) => {
      // The account "add member" routes add: a verified person outside every group.
      await h.rungbook.services.dataSource.query('UPDATE users SET email = ?, emailKey = ? WHERE id = ?', ['newcomer@test.rungbook.example', 'newcomer@test.rungbook.example', p.id]);
    });
  });
  after(() => h.close());

  /** A fresh group (lead, member, and the owner as a member) with the owner's notebook, two cells, a run and a version. */
  async function freshFixture(): Promise<Fixture> {
    const groupId = newId();
    await h.rungbook.services.dataSource.getRepository(ResearchGroup).insert({ id: groupId, name: 'Invented Matrix Group', description: 'invented' });
    await joinGroup(h, groupId, people.groupLead.id, 'lead');
    await joinGroup(h, groupId, people.groupMember.id, 'member');
    await joinGroup(h, groupId, people.owner.id, 'member');
    return { ...(await notebookWithRun(people.owner.client, groupId)), groupId, userId: people.groupMember.id };
  }

  test('the matrix names every route of the route table, and nothing else', () => {
    const routes = apiRouteTable(h.rungbook.services).map((spec) => `${spec.method.toUpperCase()} ${spec.path}`);
    assert.deepEqual(routes.filter((key) => !matrix[key]), [], 'routes without a row in the access matrix');
    assert.deepEqual(Object.keys(matrix).filter((key) => !routes.includes(key)), [], 'matrix rows for routes that no longer exist');
  });

  for (const [key, row] of Object.entries(matrix)) {
    test(key, async () => {
      const [method, path] = key.split(' ') as [string, string];
      const outcomes: string[] = [];
      for (const identity of identities) {
        const fixture = await freshFixture();
        const url = `/api${path.replace(/:(\w+)/g, (_m, name: keyof Fixture) => fixture[name])}`;
        const client = identity === 'signedOut' ? h.browser() : people[identity].client;
        let request = client[method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete'](url);
        if (row.query) request = request.query(row.query(fixture));
        if (row.body) request = request.send(row.body(fixture) as object);
        const reply = await request;
        if (reply.status !== row.expect[identity]) outcomes.push(`${identity}: ${reply.status} (expected ${row.expect[identity]}) ${reply.text.slice(0, 160)}`);
        if (identity !== 'signedOut' && (key === 'POST /auth/sign-out' || key === 'POST /auth/sign-in')) {
          await signInAgain(h, people[identity]);
        }
      }
      assert.deepEqual(outcomes, []);
    });
  }
});

describe('authority over sharing: only the owner moves a notebook into or out of a group', () => {
  let h: Harness;
  before(async () => {
    h = await startHarness({ SIGNIN_LIMIT_PER_IP: '100000' });
  });
  after(() => h.close());

  test('a group member cannot move someone else\'s notebook into a group of their own making, nor out of the group', async () => {
    const owner = await createPerson(h, { tag: 'owner' });
    const member = await createPerson(h, { tag: 'member' });
    const groupId = (await owner.client.post('/api/groups').send({ name: 'Invented Shared Group', description: '' }).expect(201)).body.group.id;
    await joinGroup(h, groupId, member.id, 'member');
    const notebook = (await owner.client.post('/api/notebooks').send({ title: 'Invented shared notebook', summary: '', groupId }).expect(201)).body.notebook;
    const ownGroup = (await member.client.post('/api/groups').send({ name: 'Invented Private Group', description: '' }).expect(201)).body.group.id;

    const intoOwn = await member.client.patch(`/api/notebooks/${notebook.id}`).send({ groupId: ownGroup }).expect(403);
    assert.equal(intoOwn.body.error.code, 'forbidden');
    await member.client.patch(`/api/notebooks/${notebook.id}`).send({ groupId: null }).expect(403);
    // The group keeps its access, and the member may still edit within it (a title is not sharing).
    assert.equal((await owner.client.get(`/api/notebooks/${notebook.id}`).expect(200)).body.notebook.groupId, groupId);
    await member.client.patch(`/api/notebooks/${notebook.id}`).send({ title: 'Renamed by a member' }).expect(200);
    await member.client.patch(`/api/notebooks/${notebook.id}`).send({ groupId }).expect(200); // unchanged group: not a move

    // The owner may move it out, and only into a group they belong to.
    await owner.client.patch(`/api/notebooks/${notebook.id}`).send({ groupId: ownGroup }).expect(403);
    await owner.client.patch(`/api/notebooks/${notebook.id}`).send({ groupId: null }).expect(200);
    await member.client.get(`/api/notebooks/${notebook.id}`).expect(404);
  });
});
