import type { QueryClient } from '@tanstack/react-query';
import { fireEvent, screen, waitFor, within } from '@testing-library/react-native';
import { SharingScreen } from '../../../components/screens/SharingScreen';
import { grantableBy, linkState } from '../../../components/sharing/roles';
import type { NotebookMemberView, NotebookRole, SharingView } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';
import { fakeServer } from './fakeServer';

jest.mock('expo-router', () => ({ router: { push: jest.fn(), replace: jest.fn() }, Link: ({ children }: { children: unknown }) => children }));
const { router } = jest.requireMock<{ router: { replace: jest.Mock } }>('expo-router');

const NB = 'nb00000001';
const me = { id: 'me00000001', name: 'Invented Editor', email: 'editor@y.example', siteRole: 'member', emailVerified: true };

function member(overrides: Partial<NotebookMemberView>): NotebookMemberView {
  return { id: 'm1', kind: 'person', subjectId: 'u1', name: 'Someone', email: 's@y.example', role: 'viewer', grantedByName: null, createdAt: '2026-01-01T00:00:00Z', ...overrides };
}

const owner = member({ id: 'm0', subjectId: 'own0000001', name: 'Invented Owner', email: 'owner@y.example', role: 'owner' });
const editorMe = member({ id: 'm1', subjectId: me.id, name: me.name, email: me.email, role: 'editor' });
const reader = member({ id: 'm2', subjectId: 'rdr0000001', name: 'Invented Reader', email: 'reader@y.example', role: 'viewer' });

function sharingAs(role: NotebookRole, extra: Partial<SharingView> = {}): SharingView {
  return { role, members: [owner, editorMe, reader], invitations: [], links: [], ...extra };
}

function serve(sharing: SharingView, more: Parameters<typeof fakeServer>[0] = {}) {
  return fakeServer({
    'GET /me': { status: 200, body: { user: me } },
    [`GET /notebooks/${NB}`]: { status: 200, body: { notebook: { id: NB, title: 'Invented two-loop check', cells: [] } } },
    [`GET /notebooks/${NB}/members`]: { status: 200, body: sharing },
    'GET /groups': { status: 200, body: { groups: [] } },
    ...more,
  });
}

/** The role choices of a picker, read from the test ids `<prefix>-<role>`. */
function offeredRoles(prefix: string): string[] {
  return ['viewer', 'commenter', 'editor', 'owner'].filter((role) => screen.queryByTestId(`${prefix}-${role}`) !== null);
}

/** Let every request the screen started answer before the test ends. */
const settled = (client: QueryClient) => waitFor(() => expect(client.isFetching() + client.isMutating()).toBe(0));

beforeEach(() => jest.clearAllMocks());

describe('who may be given which role', () => {
  // The documented order is viewer < commenter < editor < owner; ownership is transferred, never granted.
  it.each([
    ['viewer', ['viewer']],
    ['commenter', ['viewer', 'commenter']],
    ['editor', ['viewer', 'commenter', 'editor']],
    ['owner', ['viewer', 'commenter', 'editor']],
  ] as const)('a %s may hand out %j', (caller, expected) => {
    expect(grantableBy(caller)).toEqual(expected);
  });

  it('names a link by what it can still do: revoked beats expired', () => {
    expect(linkState({ active: false, revokedAt: '2026-01-02T00:00:00Z' })).toBe('revoked');
    expect(linkState({ active: false, revokedAt: null })).toBe('expired');
    expect(linkState({ active: true, revokedAt: null })).toBe('active');
  });
});

describe('SharingScreen', () => {
  it('offers an editor only viewer, commenter and editor, and no controls on the owner’s row', async () => {
    serve(sharingAs('editor'));
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    await screen.findByTestId('share-email');
    expect(offeredRoles('share-role')).toEqual(['viewer', 'commenter', 'editor']);
    expect(offeredRoles(`member-role-${reader.email}`)).toEqual(['viewer', 'commenter', 'editor']);
    expect(screen.queryByTestId(`member-remove-${owner.email}`)).toBeNull();
    expect(screen.getByTestId(`member-role-${owner.email}`)).toHaveTextContent('Owner');
    expect(screen.queryByTestId('transfer-owner')).toBeNull();
    await settled(client);
  });

  it('lets a viewer read who has access but change nothing', async () => {
    serve(sharingAs('viewer'));
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    await screen.findByTestId(`member-row-${reader.email}`);
    expect(screen.getByTestId('sharing-my-role')).toHaveTextContent('Viewer');
    expect(within(screen.getByTestId(`member-row-${owner.email}`)).getByText('Invented Owner')).toBeTruthy();
    for (const control of ['share-email', 'share-add', 'link-create', 'transfer-owner', `member-remove-${reader.email}`, `member-role-${reader.email}-editor`]) {
      expect(screen.queryByTestId(control)).toBeNull();
    }
    await settled(client);
  });

  it('shows the server’s complaint next to the e-mail field and keeps what was typed', async () => {
    const server = serve(sharingAs('editor'), {
      [`POST /notebooks/${NB}/members`]: { status: 400, body: { error: { code: 'validation_failed', message: 'Check the highlighted field', fields: { email: 'That address cannot be invited' } } } },
    });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    fireEvent.changeText(await screen.findByTestId('share-email'), 'colleague@y.example');
    fireEvent.press(screen.getByTestId('share-role-viewer'));
    fireEvent.press(screen.getByTestId('share-add'));
    await waitFor(() => expect(screen.getByTestId('share-email-error')).toHaveTextContent('That address cannot be invited'));
    expect(screen.getByTestId('share-email').props.value).toBe('colleague@y.example');
    expect(server.sent('POST', `/notebooks/${NB}/members`).map((r) => r.body)).toEqual([{ email: 'colleague@y.example', role: 'viewer' }]);
    await settled(client);
  });

  it('shows the invitation limit message and keeps the address', async () => {
    serve(sharingAs('owner'), {
      [`POST /notebooks/${NB}/members`]: { status: 429, body: { error: { code: 'rate_limited', message: 'You sent 30 invitations this hour. Wait before sending more.' } } },
    });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    fireEvent.changeText(await screen.findByTestId('share-email'), 'later@y.example');
    fireEvent.press(screen.getByTestId('share-add'));
    await waitFor(() => expect(screen.getByTestId('share-error')).toHaveTextContent('You sent 30 invitations this hour. Wait before sending more.'));
    expect(screen.getByTestId('share-email').props.value).toBe('later@y.example');
    await settled(client);
  });

  it('says an address without an account was invited, and lists the invitation', async () => {
    const invitation = { id: 'inv0000001', email: 'new@y.example', role: 'commenter' as const, invitedByName: me.name, createdAt: '2026-01-01T00:00:00Z', expiresAt: '2026-01-15T00:00:00Z', voidReason: null };
    serve(sharingAs('editor'), { [`POST /notebooks/${NB}/members`]: { status: 201, body: sharingAs('editor', { invitations: [invitation] }) } });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    fireEvent.changeText(await screen.findByTestId('share-email'), 'new@y.example');
    fireEvent.press(screen.getByTestId('share-role-commenter'));
    fireEvent.press(screen.getByTestId('share-add'));
    await waitFor(() => expect(screen.getByTestId('share-done')).toHaveTextContent(/invitation to new@y\.example/));
    expect(screen.getByTestId('share-email').props.value).toBe('');
    expect(screen.getByTestId('invitation-row-new@y.example')).toBeTruthy();
    expect(screen.getByTestId(`invitation-cancel-${invitation.id}`)).toBeTruthy();
    await settled(client);
  });

  it('creates a link with an expiry, shows its address once, and lists links with their state', async () => {
    const links = [
      { id: 'lnk0000001', role: 'viewer' as const, createdByName: me.name, createdAt: '2026-01-01T00:00:00Z', expiresAt: null, revokedAt: null, active: true, inactiveReason: null },
      { id: 'lnk0000002', role: 'commenter' as const, createdByName: me.name, createdAt: '2026-01-01T00:00:00Z', expiresAt: '2026-01-02T00:00:00Z', revokedAt: null, active: false, inactiveReason: 'expired' },
      { id: 'lnk0000003', role: 'viewer' as const, createdByName: me.name, createdAt: '2026-01-01T00:00:00Z', expiresAt: null, revokedAt: '2026-01-03T00:00:00Z', active: false, inactiveReason: 'revoked' },
      { id: 'lnk0000005', role: 'viewer' as const, createdByName: 'Invented Former Editor', createdAt: '2026-01-01T00:00:00Z', expiresAt: null, revokedAt: null, active: false, inactiveReason: 'its creator no longer manages sharing' },
    ];
    const url = 'http://localhost:8080/shared/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA';
    const server = serve(sharingAs('editor', { links }), { [`POST /notebooks/${NB}/links`]: { status: 201, body: { id: 'lnk0000004', token: url.slice(-43), url } } });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    expect(await screen.findByTestId('link-state-lnk0000001')).toHaveTextContent('active');
    expect(screen.getByTestId('link-state-lnk0000002')).toHaveTextContent('expired');
    expect(screen.getByTestId('link-state-lnk0000003')).toHaveTextContent('revoked');
    expect(screen.getByTestId('link-revoke-lnk0000001')).toBeTruthy();
    expect(screen.queryByTestId('link-revoke-lnk0000002')).toBeNull();
    // the server's reason for an inactive link whose creator lost the role is shown, and it can still be revoked for good
    expect(screen.getByTestId('link-state-lnk0000005')).toHaveTextContent(/its creator no longer manages sharing/);
    expect(screen.getByTestId('link-revoke-lnk0000005')).toBeTruthy();

    fireEvent.changeText(screen.getByTestId('link-expiry-days'), '400');
    fireEvent.press(screen.getByTestId('link-create'));
    expect(screen.getByTestId('link-expiry-days-error')).toHaveTextContent(/1 to 365/);
    expect(server.sent('POST', `/notebooks/${NB}/links`)).toHaveLength(0);

    const before = Date.now();
    fireEvent.changeText(screen.getByTestId('link-expiry-days'), '7');
    fireEvent.press(screen.getByTestId('link-role-commenter'));
    fireEvent.press(screen.getByTestId('link-create'));
    expect(await screen.findByTestId('link-url')).toHaveTextContent(url);
    const [sent] = server.sent('POST', `/notebooks/${NB}/links`);
    const { role, expiresAt } = sent.body as { role: string; expiresAt: string };
    expect(role).toBe('commenter');
    const sevenDays = 7 * 24 * 60 * 60 * 1000;
    expect(Date.parse(expiresAt) - before).toBeGreaterThanOrEqual(sevenDays);
    expect(Date.parse(expiresAt) - Date.now()).toBeLessThanOrEqual(sevenDays);

    fireEvent.press(screen.getByTestId('link-done'));
    expect(screen.queryByTestId('link-url')).toBeNull();
    await settled(client);
  });

  it('lets the owner transfer ownership only after picking a person and confirming', async () => {
    const ownerMe = member({ id: 'm0', subjectId: me.id, name: me.name, email: me.email, role: 'owner' });
    const server = serve({ role: 'owner', members: [ownerMe, reader], invitations: [], links: [] }, { [`POST /notebooks/${NB}/owner`]: { status: 200, body: {} } });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    fireEvent.press(await screen.findByTestId('transfer-owner'));
    expect(screen.queryByTestId(`transfer-pick-${me.email}`)).toBeNull();
    expect(screen.getByTestId('transfer-confirm')).toBeDisabled();
    fireEvent.press(screen.getByTestId(`transfer-pick-${reader.email}`));
    expect(screen.getByTestId('transfer-question')).toHaveTextContent(/Make Invented Reader the owner\?/);
    expect(server.sent('POST', `/notebooks/${NB}/owner`)).toHaveLength(0);
    fireEvent.press(screen.getByTestId('transfer-confirm'));
    await waitFor(() => expect(server.sent('POST', `/notebooks/${NB}/owner`).map((r) => r.body)).toEqual([{ userId: reader.subjectId }]));
    expect(await screen.findByTestId('transfer-done')).toHaveTextContent(/^Invented Reader now owns this notebook\./);
    await settled(client);
  });

  it('offers no role change on one’s own row (the server refuses it), only the badge', async () => {
    serve(sharingAs('editor'));
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    await screen.findByTestId(`member-row-${me.email}`);
    expect(offeredRoles(`member-role-${me.email}`)).toEqual([]);
    expect(screen.getByTestId(`member-role-${me.email}`)).toHaveTextContent('Editor');
    expect(screen.queryByTestId(`member-remove-${me.email}`)).toBeNull();
    // Other rows keep their controls.
    expect(offeredRoles(`member-role-${reader.email}`)).toEqual(['viewer', 'commenter', 'editor']);
    await settled(client);
  });

  it('lets a commenter leave after confirming, and goes to the notebook list when no access is left', async () => {
    const commenterMe = member({ id: 'm5', subjectId: me.id, name: me.name, email: me.email, role: 'commenter' });
    const server = serve({ role: 'commenter', members: [owner, commenterMe], invitations: [], links: [] }, { [`DELETE /notebooks/${NB}/members/m5`]: { status: 204 } });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    fireEvent.press(await screen.findByTestId('member-leave'));
    expect(screen.getByTestId('member-leave-question')).toHaveTextContent(/^Leave this notebook\?/);
    fireEvent.press(screen.getByTestId('member-leave-cancel'));
    expect(screen.queryByTestId('member-leave-question')).toBeNull();
    expect(server.sent('DELETE', `/notebooks/${NB}/members/m5`)).toHaveLength(0);

    fireEvent.press(screen.getByTestId('member-leave'));
    fireEvent.press(screen.getByTestId('member-leave-confirm'));
    await waitFor(() => expect(router.replace).toHaveBeenCalledWith('/notebooks'));
    expect(server.sent('DELETE', `/notebooks/${NB}/members/m5`)).toHaveLength(1);
    await settled(client);
  });

  it('stays on the panel after leaving when a group still gives access', async () => {
    const viewerMe = member({ id: 'm6', subjectId: me.id, name: me.name, email: me.email, role: 'viewer' });
    const group = member({ id: 'm7', kind: 'group', subjectId: 'grp0000001', name: 'Invented Group', email: null, role: 'commenter' });
    const after: SharingView = { role: 'commenter', members: [owner, group], invitations: [], links: [] };
    const server = serve({ role: 'viewer', members: [owner, viewerMe, group], invitations: [], links: [] }, { [`DELETE /notebooks/${NB}/members/m6`]: { status: 200, body: after } });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    fireEvent.press(await screen.findByTestId('member-leave'));
    fireEvent.press(screen.getByTestId('member-leave-confirm'));
    await waitFor(() => expect(server.sent('DELETE', `/notebooks/${NB}/members/m6`)).toHaveLength(1));
    await waitFor(() => expect(screen.queryByTestId(`member-row-${me.email}`)).toBeNull());
    expect(screen.getByTestId('sharing-my-role')).toHaveTextContent('Commenter');
    expect(router.replace).not.toHaveBeenCalled();
    await settled(client);
  });

  it('offers the owner no way to leave (ownership is transferred instead)', async () => {
    const ownerMe = member({ id: 'm0', subjectId: me.id, name: me.name, email: me.email, role: 'owner' });
    serve({ role: 'owner', members: [ownerMe, reader], invitations: [], links: [] });
    const { client } = renderWithQueryClient(<SharingScreen notebookId={NB} />);
    await screen.findByTestId(`member-row-${me.email}`);
    expect(screen.getByTestId(`member-role-${me.email}`)).toHaveTextContent('Owner');
    expect(screen.queryByTestId('member-leave')).toBeNull();
    await settled(client);
  });
});
