import { z } from 'zod';
import { emailSchema } from '../api/schemas';

/**
 * Working together on a notebook: roles, share links, invitations, comments, activity and live events.
 * The one contract of this boundary: the server validates with these schemas, the app builds its forms
 * and reads replies with these types.
 */

/** A person's role on one notebook, weakest first. */
export const NOTEBOOK_ROLES = ['viewer', 'commenter', 'editor', 'owner'] as const;
export type NotebookRole = (typeof NOTEBOOK_ROLES)[number];
/** Roles that can be granted (ownership is transferred, never granted). */
export const GRANTABLE_ROLES = ['viewer', 'commenter', 'editor'] as const;
export type GrantableRole = (typeof GRANTABLE_ROLES)[number];
/** Roles a share link may carry. */
export const LINK_ROLES = ['viewer', 'commenter'] as const;
export type LinkRole = (typeof LINK_ROLES)[number];

export const roleRank = (role: NotebookRole): number => NOTEBOOK_ROLES.indexOf(role);
/** True when `role` allows at least what `needed` allows. */
export const roleAtLeast = (role: NotebookRole | null | undefined, needed: NotebookRole): boolean => role != null && roleRank(role) >= roleRank(needed);
/** The stronger of two roles (null = no role). */
export const strongerRole = (a: NotebookRole | null, b: NotebookRole | null): NotebookRole | null => (a === null ? b : b === null ? a : roleRank(a) >= roleRank(b) ? a : b);

/** What each role may do; the server checks these on every route, the app only hides what would be refused. */
export const ROLE_NEEDED = {
  read: 'viewer',
  export: 'viewer',
  comment: 'commenter',
  edit: 'editor',
  run: 'editor',
  saveVersion: 'editor',
  restoreVersion: 'editor',
  present: 'editor',
  manageSharing: 'editor',
  delete: 'owner',
  transferOwnership: 'owner',
} as const satisfies Record<string, NotebookRole>;
export type NotebookAction = keyof typeof ROLE_NEEDED;

export const can = (role: NotebookRole | null | undefined, action: NotebookAction): boolean => roleAtLeast(role, ROLE_NEEDED[action]);

const id = z.string().regex(/^[a-z0-9]{10,40}$/, 'Malformed id');

/** POST /api/notebooks/:notebookId/members: a person by address (invited if they have no account yet) or a whole group. */
export const addNotebookMemberInput = z.union([
  z.strictObject({ email: emailSchema, role: z.enum(GRANTABLE_ROLES) }),
  z.strictObject({ groupId: id, role: z.enum(GRANTABLE_ROLES) }),
]);
export const changeNotebookMemberInput = z.strictObject({ role: z.enum(GRANTABLE_ROLES) });
/** Hand the notebook to another person who already holds a role on it; the former owner becomes an editor. */
export const transferOwnershipInput = z.strictObject({ userId: id });

export const SHARE_LINK_MAX_DAYS = 365;
export const createShareLinkInput = z.strictObject({
  role: z.enum(LINK_ROLES),
  /** ISO time in the future, at most a year ahead; omitted = never expires (until revoked). */
  expiresAt: z.iso.datetime({ offset: true }).optional(),
});
/** Share-link tokens: 43 URL-safe base64 characters (32 random bytes). */
export const shareTokenParam = z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'Malformed link');

export const COMMENT_MAX_CHARS = 5000;
/** Own comments can be edited for this long after posting. */
export const COMMENT_EDIT_WINDOW_MS = 15 * 60 * 1000;
/** New comments one person may write per hour, over all notebooks. */
export const COMMENTS_PER_PERSON_PER_HOUR = 120;
/** What one notebook holds at most (deleted comments kept for their replies count): bounds the comment list. */
export const MAX_COMMENTS_PER_NOTEBOOK = 2000;
export const MAX_COMMENT_CHARS_PER_NOTEBOOK = 2_000_000;
/** Distinct @handles one comment may hold. */
export const MAX_MENTIONS_PER_COMMENT = 20;
export const commentBody = z
  .string({ error: 'Write something' })
  .trim()
  .min(1, 'Write something')
  .max(COMMENT_MAX_CHARS, `A comment holds at most ${COMMENT_MAX_CHARS} characters`);
export const createCommentInput = z.strictObject({
  body: commentBody,
  /** Anchor the thread on a cell; omitted = a comment on the notebook as a whole. */
  cellId: id.optional(),
  /** Reply to this thread (its first comment). */
  parentId: id.optional(),
});
export const updateCommentInput = z.union([
  z.strictObject({ body: commentBody }),
  z.strictObject({ resolved: z.boolean() }),
]);

export const ACTIVITY_KINDS = ['mention', 'reply', 'invitation', 'shared', 'notebook-change'] as const;
export type NotificationKind = (typeof ACTIVITY_KINDS)[number];
export const activityQuery = z.strictObject({
  unreadOnly: z.enum(['true', 'false']).optional(),
});
export const markActivityReadInput = z.strictObject({ ids: z.array(id).max(500).optional() });

/** What happened in a notebook (the per-notebook log). */
export const NOTEBOOK_EVENT_KINDS = [
  'cell-added', 'cell-edited', 'cell-moved', 'cell-deleted', 'cell-run', 'notebook-edited', 'imported', 'restored',
  'version-saved', 'sharing-changed', 'owner-changed', 'link-created', 'link-revoked',
  'comment-added', 'comment-edited', 'comment-deleted', 'comment-resolved', 'comment-reopened',
  'dataset-added', 'dataset-removed',
] as const;
export type NotebookEventKind = (typeof NOTEBOOK_EVENT_KINDS)[number];
export const notebookActivityQuery = z.strictObject({
  kind: z.enum(NOTEBOOK_EVENT_KINDS).optional(),
  actorId: id.optional(),
  before: z.iso.datetime({ offset: true }).optional(),
});
export const presentationInput = z.strictObject({ cellId: id.nullable() });
export const listFilter = z.enum(['all', 'mine', 'shared', 'group']);

/** Replies. */
export interface NotebookMemberView {
  id: string;
  kind: 'person' | 'group';
  /** The person or group id. */
  subjectId: string;
  name: string;
  /** Persons only. */
  email: string | null;
  role: NotebookRole;
  grantedByName: string | null;
  createdAt: string;
}

export interface PendingInvitationView {
  id: string;
  email: string;
  role: GrantableRole;
  invitedByName: string;
  createdAt: string;
  expiresAt: string;
  /** Set when accepting it would grant nothing, e.g. 'its sender no longer manages sharing'. */
  voidReason: string | null;
}

export interface SharingView {
  /** The caller's own role. */
  role: NotebookRole;
  members: NotebookMemberView[];
  invitations: PendingInvitationView[];
  /** Listed to those who may manage sharing; tokens are never shown again after creation. */
  links: ShareLinkView[];
}

export interface ShareLinkView {
  id: string;
  role: LinkRole;
  createdByName: string;
  createdAt: string;
  expiresAt: string | null;
  revokedAt: string | null;
  /** Expired or revoked links, and links whose creator no longer manages sharing, open nothing. */
  active: boolean;
  /** Why an inactive link opens nothing: 'revoked', 'expired' or 'its creator no longer manages sharing'. */
  inactiveReason: string | null;
}

export interface CreatedShareLink {
  id: string;
  /** Shown once; only its SHA-256 is stored. */
  token: string;
  url: string;
}

export interface CommentView {
  id: string;
  notebookId: string;
  cellId: string | null;
  /** The cell's label when the comment was written (kept if the cell is deleted). */
  cellLabel: string | null;
  parentId: string | null;
  authorId: string;
  authorName: string;
  /** Markdown subset with $…$ math; empty for a deleted comment that still has replies. */
  body: string;
  createdAt: string;
  editedAt: string | null;
  deleted: boolean;
  /** Thread roots only. */
  resolvedAt: string | null;
  resolvedByName: string | null;
  /** The cell's revision the comment was written on, and whether the cell has changed since. */
  cellRevision: number | null;
  cellChangedSince: boolean;
  /** People this comment has mentioned (ids, people with access), each told once; an edit that removes a mention keeps the id. */
  mentions: string[];
  /** What the caller may do with it. */
  canEdit: boolean;
  canDelete: boolean;
}

/** A person who can be mentioned: someone with access to the notebook. */
export interface MentionCandidate {
  id: string;
  name: string;
  /** The part before @ of the address, for autocomplete; full addresses are not shown to commenters. */
  handle: string;
}

export interface NotificationView {
  id: string;
  kind: NotificationKind;
  notebookId: string | null;
  notebookTitle: string | null;
  actorName: string | null;
  /** One line for the list. */
  text: string;
  commentId: string | null;
  cellId: string | null;
  createdAt: string;
  read: boolean;
}

export interface ActivityReply {
  items: NotificationView[];
  unread: number;
}

export interface NotebookEventView {
  id: string;
  kind: NotebookEventKind;
  actorId: string | null;
  actorName: string | null;
  /** One line for the log. */
  text: string;
  cellId: string | null;
  createdAt: string;
}

/** Someone looking at the notebook right now. */
export interface ViewerPresence {
  userId: string;
  name: string;
  /** True while this person presents the notebook. */
  presenting: boolean;
}

/**
 * Events on a notebook's live stream (server-sent events; the event name is `type`, the data the JSON).
 * `changed` asks clients to refetch the notebook (and comments when `comments` is set).
 */
export type LiveEvent =
  | { type: 'hello'; role: NotebookRole; viewers: ViewerPresence[]; presenter: PresenterState | null }
  | { type: 'changed'; kind: NotebookEventKind; actorId: string | null; actorName: string | null; cellId: string | null; comments: boolean }
  | { type: 'presence'; viewers: ViewerPresence[] }
  | { type: 'presenter'; presenter: PresenterState | null }
  | { type: 'role'; role: NotebookRole }
  | { type: 'revoked' };

export interface PresenterState {
  userId: string;
  name: string;
  cellId: string | null;
  since: string;
}
