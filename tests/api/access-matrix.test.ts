// The access matrix: every route of the API route table × every kind of caller, with the status the
// product promises. The table below must name every route, so a new route cannot be added unchecked.
import assert from 'node:assert/strict';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { after, before, describe, test } from 'node:test';
import { apiRouteTable } from '../../server/app';
import { ResearchGroup } from '../../server/db/entities';
import { runSql } from '../../server/db/sql';
import { newId } from '../../server/ids';
import { GRANTABLE_ROLES, NOTEBOOK_ROLES, type NotebookRole } from '../../shared/notebook/sharing';
import { ORIGIN, startHarness, type Harness } from './harness';
import { collaborationFixture, createPerson, datasetFixture, INVENTED_TABLE, joinGroup, notebookWithRun, signInAgain, type Client, type RouteFixture as Fixture, type TestPerson } from './people';

/**
 * Who calls. Notebook roles come from a personal grant (viewer, commenter, editor), from a group's grant
 * (groupViewer and groupCommenter are members of groups granted those roles; groupMember and groupLead
 * belong, with those group roles, to the group the notebook is filed under, which holds an editor grant),
 * or from ownership. Link holders are signed-in people holding only a share link (viewer or commenter).
 */
const identities = [
  'signedOut', 'unverified', 'siteAdmin', 'otherUser', 'linkViewer', 'linkCommenter',
  'viewer', 'groupViewer', 'commenter', 'groupCommenter', 'editor', 'groupMember', 'groupLead', 'owner',
] as const;
type Identity = (typeof identities)[number];
type Expected = Record<Identity, number>;

const roleOf: Partial<Record<Identity, NotebookRole>> = {
  viewer: 'viewer', groupViewer: 'viewer', commenter: 'commenter', groupCommenter: 'commenter',
  editor: 'editor', groupMember: 'editor', groupLead: 'editor', owner: 'owner',
};
const RANK: readonly NotebookRole[] = NOTEBOOK_ROLES;

interface Row {
  body?: (f: Fixture) => unknown;
  /** A multipart upload: the form's text fields and its one file (field "file"). */
  upload?: { fields: Record<string, string>; file: { content: string; name: string } };
  query?: (f: Fixture) => Record<string, string>;
  expect: Expected;
}

const all = (status: number): Expected => Object.fromEntries(identities.map((i) => [i, status])) as Expected;
const signedIn = (status: number): Expected => ({ ...all(status), signedOut: 401 });
/**
 * A notebook route needing `needed`: allowed roles get `status`, weaker roles 403, people without any role
 * on the notebook (site admins and link holders included) learn nothing (404), signed-out callers 401.
 */
function needsRole(needed: NotebookRole, status: number, refused = 403): Expected {
  return Object.fromEntries(identities.map((identity) => {
    if (identity === 'signedOut') return [identity, 401];
    const role = roleOf[identity];
    if (!role) return [identity, 404];
    return [identity, RANK.indexOf(role) >= RANK.indexOf(needed) ? status : refused];
  })) as Expected;
}
/** Group managers: the lead and site admins; plain members (the owner is one) are refused; strangers see nothing. */
const groupManager = (status: number): Expected => ({ ...all(404), signedOut: 401, siteAdmin: status, groupMember: 403, groupLead: status, owner: 403 });

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
  'PATCH /me': { body: () => ({ name: 'Invented Matrix Name' }), expect: signedIn(200) },
  'POST /me/password': { body: () => ({ currentPassword: 'wrong-password-123', newPassword: 'long-enough-pass-new' }), expect: signedIn(403) },
  'POST /me/email': { body: () => ({ email: 'moved@test.rungbook.example', currentPassword: 'wrong-password-123' }), expect: signedIn(403) },
  'POST /auth/email-change/confirm': { body: () => ({ token: 'a'.repeat(43) }), expect: all(400) },
  'GET /me/sessions': { expect: signedIn(200) },
  'DELETE /me/sessions/:sessionId': { expect: signedIn(404) },

  'GET /groups': { expect: signedIn(200) },
  // Only a confirmed address may start a group (it can then add people).
  'POST /groups': { body: () => ({ name: 'Invented Matrix Group', description: 'invented' }), expect: { ...signedIn(201), unverified: 403 } },
  'GET /groups/:groupId': { expect: { ...groupManager(200), groupMember: 200, owner: 200 } },
  // Only a lead adds people: a site admin could otherwise add an account of their own and read the group's notebooks.
  'POST /groups/:groupId/members': { body: () => ({ email: 'newcomer@test.rungbook.example', role: 'member' }), expect: { ...groupManager(201), siteAdmin: 403 } },
  'PATCH /groups/:groupId/members/:userId': { body: () => ({ role: 'member' }), expect: groupManager(200) },
  // Anyone may leave a group: the group member removes themself (the fixture's userId is the caller then).
  'DELETE /groups/:groupId/members/:userId': { expect: { ...groupManager(200), groupMember: 200 } },

  'GET /notebooks': { expect: signedIn(200) },
  'POST /notebooks': { body: () => ({ title: 'Invented new notebook', summary: '' }), expect: signedIn(201) },
  'POST /notebooks/import': { body: () => ({ format: 'rungbook-notebook', formatVersion: 1, title: 'Invented import', summary: '', cells: [] }), expect: signedIn(201) },
  'GET /notebooks/:notebookId': { expect: needsRole('viewer', 200) },
  'PATCH /notebooks/:notebookId': { body: () => ({ title: 'Renamed by the matrix' }), expect: needsRole('editor', 200) },
  'DELETE /notebooks/:notebookId': { expect: needsRole('owner', 204) },
  'POST /notebooks/:notebookId/cells': { body: () => ({ label: 'note2', input: { kind: 'note', text: 'Invented note' } }), expect: needsRole('editor', 201) },
  'PATCH /notebooks/:notebookId/cells/:cellId': { body: () => ({ revision: 1, label: 'bubble2' }), expect: needsRole('editor', 200) },
  'POST /notebooks/:notebookId/cells/:cellId/move': { body: () => ({ position: 0 }), expect: needsRole('editor', 200) },
  'DELETE /notebooks/:notebookId/cells/:cellId': { expect: needsRole('editor', 200) },
  'POST /notebooks/:notebookId/cells/:cellId/run': { expect: needsRole('editor', 202) },
  'POST /notebooks/:notebookId/run-all': { expect: needsRole('editor', 202) },
  'GET /notebooks/:notebookId/versions': { expect: needsRole('viewer', 200) },
  'POST /notebooks/:notebookId/versions': { body: () => ({ message: 'Matrix version' }), expect: needsRole('editor', 201) },
  'GET /notebooks/:notebookId/versions/compare': { query: (f) => ({ from: f.versionId, to: f.versionId }), expect: needsRole('viewer', 200) },
  'GET /notebooks/:notebookId/versions/:versionId': { expect: needsRole('viewer', 200) },
  'POST /notebooks/:notebookId/versions/:versionId/restore': { expect: needsRole('editor', 200) },
  'GET /notebooks/:notebookId/export.json': { expect: needsRole('viewer', 200) },
  'GET /notebooks/:notebookId/export.tex': { expect: needsRole('viewer', 200) },

  // Sharing: editors manage it (never above their own role); everyone with a role sees who else has one.
  'GET /notebooks/:notebookId/members': { expect: needsRole('viewer', 200) },
  'POST /notebooks/:notebookId/members': { body: () => ({ email: 'newcomer@test.rungbook.example', role: 'viewer' }), expect: needsRole('editor', 200) },
  'PATCH /notebooks/:notebookId/members/:memberId': { body: () => ({ role: 'commenter' }), expect: needsRole('editor', 200) },
  'DELETE /notebooks/:notebookId/members/:memberId': { expect: needsRole('editor', 200) },
  'DELETE /notebooks/:notebookId/invitations/:invitationId': { expect: needsRole('editor', 200) },
  // The fixture's userId (groupMember) holds a role through the group, so ownership can go to them.
  'POST /notebooks/:notebookId/owner': { body: (f) => ({ userId: f.userId }), expect: needsRole('owner', 200) },
  'POST /notebooks/:notebookId/links': { body: () => ({ role: 'viewer' }), expect: needsRole('editor', 201) },
  'DELETE /notebooks/:notebookId/links/:linkId': { expect: needsRole('editor', 200) },
  // A share link opens its notebook for anyone holding it, signed in or not (linkViewer holds the viewer link, the rest the commenter link).
  'GET /shared/:token': { expect: all(200) },
  'GET /shared/:token/events': { expect: all(200) },
  'GET /shared/:token/comments': { expect: all(200) },
  // Commenting through a link needs a signed-in person with a confirmed address and a commenter link.
  'POST /shared/:token/comments': { body: () => ({ body: 'Invented comment through a link' }), expect: { ...signedIn(201), unverified: 403, linkViewer: 403 } },

  // Comments: commenters and up write; viewers read; the fixture thread is the owner's, so only the owner deletes it.
  'GET /notebooks/:notebookId/comments': { expect: needsRole('viewer', 200) },
  'POST /notebooks/:notebookId/comments': { body: (f) => ({ body: 'Invented matrix comment', cellId: f.cellId }), expect: needsRole('commenter', 201) },
  'GET /notebooks/:notebookId/mention-candidates': { expect: needsRole('commenter', 200) },
  'PATCH /comments/:commentId': { body: () => ({ resolved: true }), expect: needsRole('commenter', 200) },
  'DELETE /comments/:commentId': { expect: needsRole('owner', 204) },

  'GET /activity': { expect: signedIn(200) },
  'POST /activity/read': { body: () => ({}), expect: signedIn(200) },
  'GET /notebooks/:notebookId/follow': { expect: needsRole('viewer', 200) },
  'POST /notebooks/:notebookId/follow': { expect: needsRole('viewer', 200) },
  'DELETE /notebooks/:notebookId/follow': { expect: needsRole('viewer', 200) },
  'GET /notebooks/:notebookId/activity': { expect: needsRole('viewer', 200) },

  // Live: whoever may read follows the stream; editors present.
  'GET /notebooks/:notebookId/events': { expect: needsRole('viewer', 200) },
  'POST /notebooks/:notebookId/presentation': { body: (f) => ({ cellId: f.cellId }), expect: needsRole('editor', 200) },
  'DELETE /notebooks/:notebookId/presentation': { expect: needsRole('editor', 204) },

  // Datasets follow the notebook's roles: editors add and remove, viewers read and download; link holders read through /shared.
  'POST /notebooks/:notebookId/datasets': {
    upload: {
      fields: { description: JSON.stringify({ label: 'uploaded', name: 'Invented upload', xAxis: { kind: 's' }, yAxis: { kind: 'Delta_phi2' }, mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } } }) },
      file: { content: INVENTED_TABLE, name: 'invented.csv' },
    },
    expect: needsRole('editor', 201),
  },
  'POST /notebooks/:notebookId/datasets/pasted': {
    body: () => ({ label: 'pasted', name: 'Invented paste', xAxis: { kind: 's' }, yAxis: { kind: 'Delta_phi2' }, mapping: { x: 0, y: 1 }, text: INVENTED_TABLE }),
    expect: needsRole('editor', 201),
  },
  'GET /notebooks/:notebookId/datasets': { expect: needsRole('viewer', 200) },
  'GET /notebooks/:notebookId/datasets/:datasetId': { expect: needsRole('viewer', 200) },
  'GET /notebooks/:notebookId/datasets/:datasetId/download.csv': { expect: needsRole('viewer', 200) },
  'DELETE /notebooks/:notebookId/datasets/:datasetId': { expect: needsRole('editor', 200) },
  'GET /shared/:token/datasets/:datasetId': { expect: all(200) },

  'POST /calc': { body: () => ({ job: { job: 'special', fn: 'gamma', x: '0.5', digits: 20 } }), expect: signedIn(200) },
  // A run of a notebook cell is as visible as the notebook; cancelling needs whoever started it or someone who may run cells.
  'GET /runs/:runId': { expect: needsRole('viewer', 200) },
  'POST /runs/:runId/cancel': { expect: needsRole('editor', 200) },
  'GET /admin/mail': { expect: { ...signedIn(403), siteAdmin: 200 } },
  // Last: it ends the callers' other sessions (the live-stream cookies above among them).
  'POST /me/sessions/end-others': { body: () => ({}), expect: signedIn(200) },
};

/** Status of a live-stream request: the stream is closed as soon as its headers (or an error reply) arrive. */
function streamStatus(port: number, url: string, cookie: string | null): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = http.get({ host: '127.0.0.1', port, path: url, headers: { Accept: 'text/event-stream', Origin: ORIGIN, ...(cookie ? { Cookie: cookie } : {}) } }, (res) => {
      resolve(res.statusCode ?? 0);
      res.destroy();
    });
    req.on('error', reject);
  });
}

/** A stream kept open while `work` runs (presenting needs the presenter's notebook open). */
async function withStreamOpen<T>(port: number, url: string, cookie: string | null, work: () => Promise<T>): Promise<T> {
  const res = await new Promise<http.IncomingMessage>((resolve, reject) => {
    http.get({ host: '127.0.0.1', port, path: url, headers: { Accept: 'text/event-stream', Origin: ORIGIN, ...(cookie ? { Cookie: cookie } : {}) } }, resolve).on('error', reject);
  });
  try {
    // the first bytes of an accepted stream: the hub has registered it
    if (res.statusCode === 200) await new Promise((resolve) => res.once('data', resolve));
    return await work();
  } finally {
    res.destroy();
  }
}


describe('access matrix: every route × every kind of caller', () => {
  let h: Harness;
  let server: http.Server;
  let port: number;
  const people = {} as Record<Exclude<Identity, 'signedOut'>, TestPerson>;
  let newcomerId: string;

  before(async () => {
    h = await startHarness({
      SIGNIN_LIMIT_PER_IP: '100000', SIGNIN_LIMIT_PER_ACCOUNT: '100000', SIGNUP_LIMIT_PER_IP: '100000', FORGOT_LIMIT_PER_IP: '100000', RESET_LIMIT_PER_IP: '100000',
      GROUP_ADD_LIMIT_PER_USER: '100000', VERSION_SAVE_LIMIT_PER_USER: '100000', JOB_QUEUE_PER_USER: '1000', INVITE_LIMIT_PER_USER: '100000', SHARED_LINK_LIMIT_PER_IP: '100000',
      DATASET_UPLOAD_LIMIT_PER_USER: '100000',
    });
    server = http.createServer(h.rungbook.app).listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    port = (server.address() as AddressInfo).port;
    people.unverified = await createPerson(h, { tag: 'unverified', verified: false });
    people.siteAdmin = await createPerson(h, { tag: 'admin', siteAdmin: true });
    for (const identity of identities) {
      if (identity === 'signedOut' || identity === 'unverified' || identity === 'siteAdmin') continue;
      people[identity] = await createPerson(h, { tag: identity.toLowerCase() });
    }
    await createPerson(h, { tag: 'newcomer', signIn: false }).then(async (p) => {
      newcomerId = p.id;
      // The account "add member" routes add: a verified person outside every group and notebook.
      await runSql(h.rungbook.services.dataSource, 'UPDATE "users" SET "email" = ?, "emailKey" = ? WHERE "id" = ?', ['newcomer@test.rungbook.example', 'newcomer@test.rungbook.example', p.id]);
    });
  });
  after(async () => {
    await new Promise((resolve) => server.close(resolve));
    await h.close();
  });

  const streamCookies = new Map<Identity, string>();
  /** A session cookie for requests made outside the supertest agent (live streams over a real socket). */
  async function streamCookie(identity: Exclude<Identity, 'signedOut'>): Promise<string> {
    if (!streamCookies.has(identity)) streamCookies.set(identity, (await h.rungbook.services.sessions.start(people[identity].id)).split(';')[0]);
    return streamCookies.get(identity)!;
  }

  async function newGroup(members: [TestPerson, 'lead' | 'member'][]): Promise<string> {
    const groupId = newId();
    await h.rungbook.services.dataSource.getRepository(ResearchGroup).insert({ id: groupId, name: 'Invented Matrix Group', description: 'invented' });
    for (const [person, role] of members) await joinGroup(h, groupId, person.id, role);
    return groupId;
  }

  /**
   * A fresh notebook of the owner, filed under a group (lead, member, and the owner as a member) with its
   * cells, a run and a version; personal grants, group grants, share links, an invitation and a thread.
   */
  async function freshFixture(): Promise<Fixture & { viewerToken: string }> {
    const groupId = await newGroup([[people.groupLead, 'lead'], [people.groupMember, 'member'], [people.owner, 'member']]);
    const viewerGroup = await newGroup([[people.groupViewer, 'member']]);
    const commenterGroup = await newGroup([[people.groupCommenter, 'member']]);
    const notebook = await notebookWithRun(people.owner.client, groupId);
    const extra = await collaborationFixture(h, { ...notebook, ownerId: people.owner.id }, [
      { userId: newcomerId, role: 'viewer' },
      { userId: people.viewer.id, role: 'viewer' },
      { userId: people.commenter.id, role: 'commenter' },
      { userId: people.editor.id, role: 'editor' },
      { groupId: viewerGroup, role: 'viewer' },
      { groupId: commenterGroup, role: 'commenter' },
    ]);
    const datasetId = await datasetFixture(people.owner.client, notebook.notebookId);
    return {
      ...notebook, groupId, userId: people.groupMember.id,
      memberId: extra.memberId, invitationId: extra.invitationId, linkId: extra.linkId, commentId: extra.commentId,
      token: extra.commenterToken, viewerToken: extra.viewerToken, datasetId, sessionId: 'f'.repeat(32),
    };
  }

  test('the matrix names every route of the route table, and nothing else', () => {
    const routes = apiRouteTable(h.rungbook.services).map((spec) => `${spec.method.toUpperCase()} ${spec.path}`);
    assert.deepEqual(routes.filter((key) => !matrix[key]), [], 'routes without a row in the access matrix');
    assert.deepEqual(Object.keys(matrix).filter((key) => !routes.includes(key)), [], 'matrix rows for routes that no longer exist');
  });

  test(`size: ${Object.keys(matrix).length} routes × ${identities.length} kinds of caller; every notebook role is held personally, through a group and not at all`, () => {
    // the roles come from the product's contract, not from this file
    const held = new Set(Object.values(roleOf));
    assert.deepEqual([...held].sort(), [...NOTEBOOK_ROLES].sort());
    for (const role of GRANTABLE_ROLES) {
      const holders = identities.filter((identity) => roleOf[identity] === role);
      assert.ok(holders.some((i) => i.startsWith('group')) && holders.some((i) => !i.startsWith('group')), `${role}: held both personally and through a group`);
    }
  });

  /** linkViewer holds the viewer link; everyone else the commenter link. */
  const forCaller = (fixture: Fixture & { viewerToken: string }, identity: Identity): Fixture => (identity === 'linkViewer' ? { ...fixture, token: fixture.viewerToken } : fixture);

  for (const [key, row] of Object.entries(matrix)) {
    test(key, async () => {
      const [method, path] = key.split(' ') as [string, string];
      const outcomes: string[] = [];
      // Reading routes share one fixture; every other route gets a fresh one per caller.
      const readOnly = method === 'GET' ? await freshFixture() : null;
      for (const identity of identities) {
        const fixture = forCaller(readOnly ?? (await freshFixture()), identity);
        const url = `/api${path.replace(/:(\w+)/g, (_m, name: keyof Fixture) => fixture[name])}`;
        const client = identity === 'signedOut' ? h.browser() : people[identity].client;
        const cookie = identity === 'signedOut' ? null : await streamCookie(identity);
        let status: number;
        let text = '';
        if (key.endsWith('/events')) {
          status = await streamStatus(port, url, cookie);
        } else {
          const send = async () => {
            let request = client[method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete'](url);
            if (row.query) request = request.query(row.query(fixture));
            if (row.body) request = request.send(row.body(fixture) as object);
            if (row.upload) {
              for (const [name, value] of Object.entries(row.upload.fields)) request = request.field(name, value);
              request = request.attach('file', Buffer.from(row.upload.file.content), row.upload.file.name);
            }
            return request;
          };
          // Presenting needs the presenter's notebook open in a live stream.
          const reply = path.endsWith('/presentation')
            ? await withStreamOpen(port, `/api/notebooks/${fixture.notebookId}/events`, cookie, send)
            : await send();
          status = reply.status;
          text = reply.text;
        }
        if (status !== row.expect[identity]) outcomes.push(`${identity}: ${status} (expected ${row.expect[identity]}) ${text.slice(0, 160)}`);
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
