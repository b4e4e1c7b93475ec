import { In, IsNull, MoreThan, type DataSource, type EntityManager } from 'typeorm';
import type { NotebookDetail } from '../../shared/notebook/api';
import {
  can,
  roleAtLeast,
  roleRank,
  SHARE_LINK_MAX_DAYS,
  shareTokenParam,
  strongerRole,
  type CreatedShareLink,
  type GrantableRole,
  type LinkRole,
  type NotebookMemberView,
  type NotebookRole,
  type PendingInvitationView,
  type ShareLinkView,
  type SharingView,
} from '../../shared/notebook/sharing';
import { newLinkToken, sha256Hex } from '../auth/linkTokens';
import type { SignedInUser } from '../auth/sessions';
import { GroupMembership, Notebook, NotebookInvitation, NotebookMember, ResearchGroup, ShareLink, User } from '../db/entities';
import { AppError } from '../http/errors';
import type { SenderLimit } from '../http/senderLimits';
import { newId } from '../ids';
import type { Mailer, OutgoingMessage } from '../mail/mailer';
import { mailSafe } from '../mail/mailSafe';
import { emailKey } from './accounts';
import { commitNotebookChange, recordNotebookChange, type NotebookChange, type NotebookEventBus } from './notebookEvents';
import { roleOn, type NotebookAccess, type NotebookService } from './notebooks';
import { addNotification } from './notifications';
import { momentFrom, runSql } from '../db/sql';

export const INVITATION_LIFETIME_MS = 14 * 24 * 3600 * 1000;
const DAY_MS = 24 * 3600 * 1000;
/** Unrevoked, unexpired links one notebook may have at once (each link may hold live streams). */
export const MAX_ACTIVE_LINKS_PER_NOTEBOOK = 20;
export const CREATOR_LOST_ROLE = 'its creator no longer manages sharing';
export const INVITER_LOST_ROLE = 'its sender no longer manages sharing';

/** The same reply for unknown, malformed, expired and revoked links: nothing tells whether a notebook exists. */
const noSuchNotebook = () => new AppError('not_found', 'No such notebook.');

/** Display names of the given people (unknown and null ids are left out). */
export async function namesOf(dataSource: DataSource, userIds: (string | null)[]): Promise<Map<string, string>> {
  const ids = [...new Set(userIds.filter((id): id is string => Boolean(id)))];
  if (!ids.length) return new Map();
  const users = await dataSource.getRepository(User).find({ where: { id: In(ids) }, select: { id: true, name: true } });
  return new Map(users.map((user) => [user.id, user.name]));
}

const article = (role: NotebookRole) => (role === 'editor' || role === 'owner' ? 'an' : 'a');

function forbidAbove(ownRole: NotebookRole, role: NotebookRole, what: string): void {
  if (roleRank(role) > roleRank(ownRole)) {
    throw new AppError('forbidden', `As ${article(ownRole)} ${ownRole} you cannot ${what} ${article(role)} ${role}.`);
  }
}

/** A share link is neither revoked nor expired (whether it opens anything also depends on its creator's role). */
export function isActiveLink(link: Pick<ShareLink, 'revokedAt' | 'expiresAt'>, now: Date): boolean {
  return !link.revokedAt && (!link.expiresAt || link.expiresAt.getTime() > now.getTime());
}

/**
 * Links and invitations act on behalf of the person who made them, so they are honoured only while that
 * person may still manage sharing with at least the role they hand out. Checked at the point of use, this
 * covers every way a role is lost (grant removed or lowered, left a group, ownership handed on).
 */
export const mayHandOut = (makersRole: NotebookRole | null, role: NotebookRole): boolean => can(makersRole, 'manageSharing') && roleAtLeast(makersRole, role);

/** The weaker of two roles. */
const weakerRole = (a: NotebookRole, b: NotebookRole): NotebookRole => (roleRank(a) <= roleRank(b) ? a : b);

/**
 * Grants the pending, unexpired invitations of a newly confirmed address (inside the confirmation's
 * transaction): the stronger of an existing personal grant and the invited role (capped at the inviter's
 * current role; nothing when the inviter no longer manages sharing), the invitation marked accepted, an
 * activity entry for the person. Returns the notebook changes to publish after commit.
 */
export async function acceptInvitations(manager: EntityManager, user: Pick<User, 'id' | 'name' | 'emailKey'>, at: Date): Promise<NotebookChange[]> {
  const pending = await manager.find(NotebookInvitation, { where: { emailKey: user.emailKey, acceptedAt: IsNull(), expiresAt: MoreThan(at) }, order: { createdAt: 'ASC' } });
  const changes: NotebookChange[] = [];
  for (const invitation of pending) {
    const notebook = await manager.findOneBy(Notebook, { id: invitation.notebookId });
    await manager.update(NotebookInvitation, { id: invitation.id }, { acceptedAt: at, acceptedById: user.id });
    if (!notebook || notebook.ownerId === user.id) continue;
    const invitersRole = await roleOn(manager, invitation.invitedById, notebook.id);
    if (!can(invitersRole, 'manageSharing')) continue;
    const invited = weakerRole(invitation.role, invitersRole!) as GrantableRole;
    const existing = await manager.findOneBy(NotebookMember, { notebookId: notebook.id, userId: user.id });
    const role = strongerRole(existing?.role ?? null, invited) as GrantableRole;
    if (existing) await manager.update(NotebookMember, { id: existing.id }, { role });
    else await manager.insert(NotebookMember, { id: newId(), notebookId: notebook.id, userId: user.id, role, grantedById: invitation.invitedById });
    const inviter = await manager.findOneBy(User, { id: invitation.invitedById });
    await addNotification(manager, {
      userId: user.id,
      kind: 'invitation',
      notebookId: notebook.id,
      actorName: inviter?.name ?? null,
      text: `${inviter?.name ?? 'Someone'} invited you to "${notebook.title}" as ${article(role)} ${role}`,
    });
    const change: NotebookChange = {
      notebookId: notebook.id,
      kind: 'sharing-changed',
      actorId: user.id,
      actorName: user.name,
      cellId: null,
      text: `accepted the invitation as ${article(role)} ${role}`,
    };
    await recordNotebookChange(manager, change);
    changes.push(change);
  }
  return changes;
}

/** A share link as listed in the panel: why it opens nothing (revoked, expired, its creator's role), or null. */
export type LinkListing = ShareLinkView;
/** A pending invitation as listed: why accepting it would grant nothing, or null. */
export type InvitationListing = PendingInvitationView;

export interface SharingServiceDeps {
  dataSource: DataSource;
  notebooks: NotebookService;
  events: NotebookEventBus;
  mailer: Mailer;
  publicUrl: string;
  /** Invitation and sharing e-mails per sender per hour. */
  invitationLimit: SenderLimit;
  now?: () => Date;
}

/** Who may open a notebook and how: grants to people and groups, e-mail invitations, share links, ownership. */
export function createSharingService({ dataSource, notebooks, events, mailer, publicUrl, invitationLimit, now = () => new Date() }: SharingServiceDeps) {
  const notebookUrl = (notebookId: string) => `${publicUrl}/notebooks/${notebookId}`;

  const commitChange = <T>(change: NotebookChange, write: (manager: EntityManager) => Promise<T>): Promise<T> =>
    commitNotebookChange(dataSource, events, change, write, { accessChanged: true, forget: notebooks.forget });

  // Notebook summaries (owner, group) are cached until updatedAt changes.
  const updateNotebookRow = (manager: EntityManager, notebookId: string, fields: Partial<Pick<Notebook, 'groupId' | 'ownerId'>>) =>
    manager.update(Notebook, { id: notebookId }, { ...fields, updatedAt: now() });

  const changeBy = (viewer: SignedInUser, notebookId: string, kind: NotebookChange['kind'], text: string): NotebookChange => ({ notebookId, kind, actorId: viewer.id, actorName: viewer.name, cellId: null, text });

  async function manageable(viewer: SignedInUser, notebookId: string): Promise<NotebookAccess> {
    return notebooks.requireRole(viewer, notebookId, 'manageSharing');
  }

  async function memberViews(notebook: Notebook, showEmails: boolean): Promise<NotebookMemberView[]> {
    const rows: { id: string; userId: string | null; groupId: string | null; role: GrantableRole; createdAt: string | Date; personName: string | null; email: string | null; groupName: string | null; grantedByName: string | null }[] =
      await runSql(
        dataSource,
        `SELECT m."id" AS "id", m."userId" AS "userId", m."groupId" AS "groupId", m."role" AS "role", m."createdAt" AS "createdAt",
                u."name" AS "personName", u."email" AS "email", g."name" AS "groupName", b."name" AS "grantedByName"
           FROM "notebook_members" m
           LEFT JOIN "users" u ON u."id" = m."userId"
           LEFT JOIN "research_groups" g ON g."id" = m."groupId"
           LEFT JOIN "users" b ON b."id" = m."grantedById"
          WHERE m."notebookId" = ?`,
        [notebook.id],
      );
    const owner = await dataSource.getRepository(User).findOneByOrFail({ id: notebook.ownerId });
    // The owner is listed first with their user id as `id`: ownership is not a grant and cannot be changed here.
    const ownerView: NotebookMemberView = {
      id: owner.id, kind: 'person', subjectId: owner.id, name: owner.name, email: showEmails ? owner.email : null, role: 'owner', grantedByName: null, createdAt: notebook.createdAt.toISOString(),
    };
    const grants = rows.map((row): NotebookMemberView => ({
      id: row.id,
      kind: row.userId ? 'person' : 'group',
      subjectId: (row.userId ?? row.groupId)!,
      name: (row.userId ? row.personName : row.groupName) ?? '',
      email: row.userId && showEmails ? row.email : null,
      role: row.role,
      grantedByName: row.grantedByName,
      createdAt: momentFrom(row.createdAt).toISOString(),
    }));
    grants.sort((a, b) => roleRank(b.role) - roleRank(a.role) || a.kind.localeCompare(b.kind) || a.name.localeCompare(b.name));
    return [ownerView, ...grants];
  }

  async function rolesOnNotebook(notebookId: string): Promise<Map<string, NotebookRole>> {
    return new Map((await notebooks.peopleWithAccess(notebookId)).map((person) => [person.id, person.role]));
  }

  async function invitationViews(notebookId: string, roles: Map<string, NotebookRole>): Promise<InvitationListing[]> {
    const rows = await dataSource.getRepository(NotebookInvitation).find({ where: { notebookId, acceptedAt: IsNull(), expiresAt: MoreThan(now()) }, order: { createdAt: 'DESC' } });
    const names = await namesOf(dataSource, rows.map((row) => row.invitedById));
    return rows.map((row) => ({
      id: row.id, email: row.email, role: row.role, invitedByName: names.get(row.invitedById) ?? '', createdAt: row.createdAt.toISOString(), expiresAt: row.expiresAt.toISOString(),
      voidReason: can(roles.get(row.invitedById), 'manageSharing') ? null : INVITER_LOST_ROLE,
    }));
  }

  function linkInactiveReason(link: ShareLink, roles: Map<string, NotebookRole>): string | null {
    if (link.revokedAt) return 'revoked';
    if (!isActiveLink(link, now())) return 'expired';
    return mayHandOut(roles.get(link.createdById) ?? null, link.role) ? null : CREATOR_LOST_ROLE;
  }

  async function linkViews(notebookId: string, roles: Map<string, NotebookRole>): Promise<LinkListing[]> {
    const rows = await dataSource.getRepository(ShareLink).find({ where: { notebookId }, order: { createdAt: 'DESC' } });
    const names = await namesOf(dataSource, rows.map((row) => row.createdById));
    return rows.map((row) => {
      const inactiveReason = linkInactiveReason(row, roles);
      return {
        id: row.id,
        role: row.role,
        createdByName: names.get(row.createdById) ?? '',
        createdAt: row.createdAt.toISOString(),
        expiresAt: row.expiresAt?.toISOString() ?? null,
        revokedAt: row.revokedAt?.toISOString() ?? null,
        active: inactiveReason === null,
        inactiveReason,
      };
    });
  }

  async function view(viewer: SignedInUser, notebookId: string): Promise<SharingView> {
    const { notebook, role } = await notebooks.requireRole(viewer, notebookId, 'read');
    const manages = can(role, 'manageSharing');
    const roles = manages ? await rolesOnNotebook(notebookId) : new Map<string, NotebookRole>();
    return {
      role,
      members: await memberViews(notebook, manages),
      invitations: manages ? await invitationViews(notebookId, roles) : [],
      links: manages ? await linkViews(notebookId, roles) : [],
    };
  }

  async function memberOf(notebookId: string, memberId: string): Promise<NotebookMember> {
    const member = await dataSource.getRepository(NotebookMember).findOneBy({ id: memberId, notebookId });
    if (!member) throw new AppError('not_found', 'No such person or group on this notebook.');
    return member;
  }

  async function subjectName(member: NotebookMember): Promise<string> {
    if (member.userId) return (await dataSource.getRepository(User).findOneBy({ id: member.userId }))?.name ?? 'someone';
    return (await dataSource.getRepository(ResearchGroup).findOneBy({ id: member.groupId! }))?.name ?? 'a group';
  }

  function sharedMail(viewer: SignedInUser, recipient: User, notebook: Notebook, role: GrantableRole): OutgoingMessage {
    const actor = mailSafe(viewer.name);
    const title = mailSafe(notebook.title);
    return {
      to: recipient.email,
      subject: `${actor} shared "${title}" with you`,
      text:
        `Hello ${mailSafe(recipient.name)},\n\n${actor} shared the Rungbook notebook "${title}" with you as ${article(role)} ${role}.\n\n` +
        `Open it: ${notebookUrl(notebook.id)}\n`,
    };
  }

  function invitationMail(viewer: SignedInUser, email: string, notebook: Notebook, role: GrantableRole): OutgoingMessage {
    const actor = mailSafe(viewer.name);
    const title = mailSafe(notebook.title);
    return {
      to: email,
      subject: `${actor} invited you to "${title}" on Rungbook`,
      text:
        `Hello,\n\n${actor} invited you to the Rungbook notebook "${title}" as ${article(role)} ${role}.\n\n` +
        `Create your account with this address and confirm it; the notebook is then in your list (the invitation holds for 14 days):\n\n` +
        `${publicUrl}/sign-up?email=${encodeURIComponent(email)}&invited=1\n\n` +
        `If you already have an account with this address, confirm the address (or reset your password) and sign in.\n` +
        `If you do not know ${actor}, ignore this message.\n`,
    };
  }

  async function sharePersonally(viewer: SignedInUser, granted: NotebookAccess, email: string, role: GrantableRole): Promise<void> {
    const { notebook } = granted;
    const user = await dataSource.getRepository(User).findOneBy({ emailKey: emailKey(email) });
    if (user && user.emailVerifiedAt !== null) return grantToAccount(viewer, notebook, user, role);
    await invite(viewer, notebook, email, role);
  }

  async function grantToAccount(viewer: SignedInUser, notebook: Notebook, user: User, role: GrantableRole): Promise<void> {
    if (user.id === notebook.ownerId) throw new AppError('conflict', `${user.name} owns this notebook.`, { email: 'This is the owner' });
    if (user.id === viewer.id) throw new AppError('conflict', 'You cannot change your own role.', { email: 'This is you' });
    await invitationLimit.takeOrRefuse(viewer.id);
    await commitChange(changeBy(viewer, notebook.id, 'sharing-changed', `shared the notebook with ${user.name} as ${article(role)} ${role}`), async (manager) => {
      const existing = await manager.findOneBy(NotebookMember, { notebookId: notebook.id, userId: user.id });
      if (existing) await manager.update(NotebookMember, { id: existing.id }, { role, grantedById: viewer.id });
      else await manager.insert(NotebookMember, { id: newId(), notebookId: notebook.id, userId: user.id, role, grantedById: viewer.id });
      await addNotification(manager, {
        userId: user.id, kind: 'shared', notebookId: notebook.id, actorName: viewer.name, text: `${viewer.name} shared "${notebook.title}" with you as ${article(role)} ${role}`,
      });
    });
    mailer.sendLater(async () => sharedMail(viewer, user, notebook, role));
  }

  async function invite(viewer: SignedInUser, notebook: Notebook, email: string, role: GrantableRole): Promise<void> {
    await invitationLimit.takeOrRefuse(viewer.id);
    const key = emailKey(email);
    const at = now();
    await commitChange(changeBy(viewer, notebook.id, 'sharing-changed', `invited ${email} as ${article(role)} ${role}`), async (manager) => {
      // One pending invitation per address: inviting again changes its role and restarts its 14 days.
      await manager.delete(NotebookInvitation, { notebookId: notebook.id, emailKey: key, acceptedAt: IsNull() });
      await manager.insert(NotebookInvitation, {
        id: newId(), notebookId: notebook.id, emailKey: key, email: email.trim(), role, invitedById: viewer.id, createdAt: at, expiresAt: new Date(at.getTime() + INVITATION_LIFETIME_MS), acceptedAt: null, acceptedById: null,
      });
    });
    mailer.sendLater(async () => invitationMail(viewer, email.trim(), notebook, role));
  }

  async function shareWithGroup(viewer: SignedInUser, granted: NotebookAccess, groupId: string, role: GrantableRole): Promise<void> {
    const membership = await dataSource.getRepository(GroupMembership).findOneBy({ groupId, userId: viewer.id });
    if (!membership) throw new AppError('forbidden', 'You can share a notebook only with a group you belong to.', { groupId: 'Not one of your groups' });
    const group = await dataSource.getRepository(ResearchGroup).findOneByOrFail({ id: groupId });
    const notebookId = granted.notebook.id;
    await commitChange(changeBy(viewer, notebookId, 'sharing-changed', `shared the notebook with the group ${group.name} as ${article(role)} ${role}`), async (manager) => {
      const existing = await manager.findOneBy(NotebookMember, { notebookId, groupId });
      if (existing) await manager.update(NotebookMember, { id: existing.id }, { role, grantedById: viewer.id });
      else await manager.insert(NotebookMember, { id: newId(), notebookId, groupId, role, grantedById: viewer.id });
      // The group a notebook is filed under holds at least an editor grant; a weaker one files it nowhere.
      if (granted.notebook.groupId === groupId && role !== 'editor') await updateNotebookRow(manager, notebookId, { groupId: null });
    });
  }

  async function createLink(viewer: SignedInUser, notebookId: string, input: { role: LinkRole; expiresAt?: string }): Promise<CreatedShareLink> {
    const { role: ownRole } = await manageable(viewer, notebookId);
    forbidAbove(ownRole, input.role, 'create a link for');
    const expiresAt = input.expiresAt ? new Date(input.expiresAt) : null;
    const at = now();
    if (expiresAt && expiresAt.getTime() <= at.getTime()) {
      throw new AppError('validation_failed', 'A link must expire in the future.', { expiresAt: 'Choose a time in the future' });
    }
    if (expiresAt && expiresAt.getTime() > at.getTime() + SHARE_LINK_MAX_DAYS * DAY_MS) {
      throw new AppError('validation_failed', `A link may expire at most ${SHARE_LINK_MAX_DAYS} days ahead.`, { expiresAt: `At most ${SHARE_LINK_MAX_DAYS} days ahead` });
    }
    const activeLinks = await dataSource.getRepository(ShareLink).count({ where: [
      { notebookId, revokedAt: IsNull(), expiresAt: IsNull() },
      { notebookId, revokedAt: IsNull(), expiresAt: MoreThan(at) },
    ] });
    if (activeLinks >= MAX_ACTIVE_LINKS_PER_NOTEBOOK) {
      throw new AppError('conflict', `A notebook may have at most ${MAX_ACTIVE_LINKS_PER_NOTEBOOK} active share links; revoke one you no longer need first.`);
    }
    const token = newLinkToken();
    const id = newId();
    const expiry = expiresAt ? `, expiring ${expiresAt.toISOString().slice(0, 10)}` : '';
    await commitChange(changeBy(viewer, notebookId, 'link-created', `created a ${input.role} link${expiry}`), (manager) =>
      manager.insert(ShareLink, { id, notebookId, tokenHash: sha256Hex(token), role: input.role, createdById: viewer.id, expiresAt, revokedAt: null }),
    );
    return { id, token, url: `${publicUrl}/shared/${token}` };
  }

  /** The notebook and role a share link opens; the same 404 for every link that opens nothing. */
  async function resolveLink(token: string): Promise<{ notebookId: string; role: LinkRole; linkId: string; createdById: string }> {
    if (!shareTokenParam.safeParse(token).success) throw noSuchNotebook();
    const link = await dataSource.getRepository(ShareLink).findOneBy({ tokenHash: sha256Hex(token) });
    if (!link || !isActiveLink(link, now())) throw noSuchNotebook();
    if (!mayHandOut(await roleOn(dataSource.manager, link.createdById, link.notebookId), link.role)) throw noSuchNotebook();
    return { notebookId: link.notebookId, role: link.role, linkId: link.id, createdById: link.createdById };
  }

  /** The notebook behind a share link, read-only: its cells and results, nothing about who has access. */
  async function sharedDetail(token: string): Promise<NotebookDetail> {
    const link = await resolveLink(token);
    const notebook = await dataSource.getRepository(Notebook).findOneBy({ id: link.notebookId });
    if (!notebook) throw noSuchNotebook();
    // Read as the owner would, then reduce to the link's role.
    const asOwner: SignedInUser = { id: notebook.ownerId, name: '', email: '', siteRole: 'member', emailVerified: true };
    const detail = await notebooks.detail(asOwner, notebook.id);
    return { ...detail, role: link.role, canEdit: false, sharedBy: null, groupId: null, groupName: null };
  }

  return {
    view,
    resolveLink,
    sharedDetail,
    createLink,

    async addMember(viewer: SignedInUser, notebookId: string, input: { email: string; role: GrantableRole } | { groupId: string; role: GrantableRole }): Promise<SharingView> {
      const granted = await manageable(viewer, notebookId);
      forbidAbove(granted.role, input.role, 'grant');
      if ('email' in input) await sharePersonally(viewer, granted, input.email, input.role);
      else await shareWithGroup(viewer, granted, input.groupId, input.role);
      return view(viewer, notebookId);
    },

    async changeMember(viewer: SignedInUser, notebookId: string, memberId: string, role: GrantableRole): Promise<SharingView> {
      const { notebook, role: ownRole } = await manageable(viewer, notebookId);
      const member = await memberOf(notebookId, memberId);
      forbidAbove(ownRole, member.role, 'change the role of');
      forbidAbove(ownRole, role, 'grant');
      if (member.userId === viewer.id) throw new AppError('forbidden', 'You cannot change your own role; ask another editor or the owner.');
      const name = await subjectName(member);
      await commitChange(changeBy(viewer, notebookId, 'sharing-changed', `made ${name} ${article(role)} ${role}`), async (manager) => {
        await manager.update(NotebookMember, { id: member.id }, { role, grantedById: viewer.id });
        if (member.groupId && member.groupId === notebook.groupId && role !== 'editor') await updateNotebookRow(manager, notebookId, { groupId: null });
      });
      return view(viewer, notebookId);
    },

    /** Managers remove grants up to their own role; anyone may give up their own personal grant. */
    async removeMember(viewer: SignedInUser, notebookId: string, memberId: string): Promise<SharingView | undefined> {
      const leaving = (await dataSource.getRepository(NotebookMember).findOneBy({ id: memberId, notebookId }))?.userId === viewer.id;
      const { notebook, role: ownRole } = leaving ? await notebooks.requireRole(viewer, notebookId, 'read') : await manageable(viewer, notebookId);
      const member = await memberOf(notebookId, memberId);
      if (!leaving) forbidAbove(ownRole, member.role, 'remove');
      const name = await subjectName(member);
      await commitChange(changeBy(viewer, notebookId, 'sharing-changed', leaving ? 'left the notebook' : `removed ${name}`), async (manager) => {
        await manager.delete(NotebookMember, { id: member.id });
        if (member.groupId && member.groupId === notebook.groupId) await updateNotebookRow(manager, notebookId, { groupId: null });
      });
      if (leaving) {
        // Someone who left may still reach it through a group; otherwise there is nothing left to show.
        try {
          return await view(viewer, notebookId);
        } catch (error) {
          if (error instanceof AppError && error.code === 'not_found') return undefined;
          throw error;
        }
      }
      return view(viewer, notebookId);
    },

    async cancelInvitation(viewer: SignedInUser, notebookId: string, invitationId: string): Promise<SharingView> {
      await manageable(viewer, notebookId);
      const invitation = await dataSource.getRepository(NotebookInvitation).findOneBy({ id: invitationId, notebookId, acceptedAt: IsNull() });
      if (!invitation) throw new AppError('not_found', 'No such pending invitation.');
      await commitChange(changeBy(viewer, notebookId, 'sharing-changed', `cancelled the invitation of ${invitation.email}`), (manager) => manager.delete(NotebookInvitation, { id: invitation.id }));
      return view(viewer, notebookId);
    },

    async revokeLink(viewer: SignedInUser, notebookId: string, linkId: string): Promise<SharingView> {
      const { role: ownRole } = await manageable(viewer, notebookId);
      const link = await dataSource.getRepository(ShareLink).findOneBy({ id: linkId, notebookId });
      if (!link) throw new AppError('not_found', 'No such link.');
      forbidAbove(ownRole, link.role, 'revoke a link for');
      if (!link.revokedAt) {
        await commitChange(changeBy(viewer, notebookId, 'link-revoked', `revoked a ${link.role} link`), (manager) => manager.update(ShareLink, { id: link.id }, { revokedAt: now() }));
      }
      return view(viewer, notebookId);
    },

    /** The new owner must already hold a role; the former owner keeps an editor grant. */
    async transferOwnership(viewer: SignedInUser, notebookId: string, userId: string): Promise<SharingView> {
      const { notebook } = await notebooks.requireRole(viewer, notebookId, 'transferOwnership');
      if (userId === viewer.id) throw new AppError('conflict', 'You already own this notebook.', { userId: 'This is you' });
      const newOwner = (await notebooks.peopleWithAccess(notebookId)).find((person) => person.id === userId);
      if (!newOwner) throw new AppError('validation_failed', 'Share the notebook with this person first: only someone who already has access can become its owner.', { userId: 'Has no access to this notebook' });
      await commitChange(changeBy(viewer, notebookId, 'owner-changed', `handed the notebook to ${newOwner.name}`), async (manager) => {
        await updateNotebookRow(manager, notebookId, { ownerId: userId });
        await manager.delete(NotebookMember, { notebookId, userId });
        await manager.delete(NotebookMember, { notebookId, userId: viewer.id });
        await manager.insert(NotebookMember, { id: newId(), notebookId, userId: viewer.id, role: 'editor', grantedById: userId });
        await addNotification(manager, {
          userId, kind: 'shared', notebookId, actorName: viewer.name, text: `${viewer.name} handed you "${notebook.title}": you are its owner now`,
        });
      });
      return view(viewer, notebookId);
    },
  };
}

export type SharingService = ReturnType<typeof createSharingService>;
