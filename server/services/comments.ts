import { In, IsNull, type DataSource, type EntityManager } from 'typeorm';
import type { Logger } from 'pino';
import {
  can,
  COMMENT_EDIT_WINDOW_MS,
  COMMENTS_PER_PERSON_PER_HOUR,
  MAX_COMMENT_CHARS_PER_NOTEBOOK,
  MAX_COMMENTS_PER_NOTEBOOK,
  MAX_MENTIONS_PER_COMMENT,
  strongerRole,
  type CommentView,
  type LinkRole,
  type MentionCandidate,
  type NotebookEventKind,
  type NotebookRole,
} from '../../shared/notebook/sharing';
import type { SignedInUser } from '../auth/sessions';
import { Cell, Comment, Notebook, NotebookFollow, Notification } from '../db/entities';
import { AppError } from '../http/errors';
import { senderLimit } from '../http/senderLimits';
import { newId } from '../ids';
import type { Mailer } from '../mail/mailer';
import { mailSafe } from '../mail/mailSafe';
import { commitNotebookChange, type NotebookChange, type NotebookEventBus } from './notebookEvents';
import type { NotebookService } from './notebooks';
import { addNotification, type NewNotification } from './notifications';
import { namesOf } from './sharing';

/** What a share link grants, as the sharing service resolves it (404 for unknown, expired or revoked links). */
export interface ResolvedLink {
  notebookId: string;
  role: LinkRole;
  linkId: string;
}

export interface CommentServiceDeps {
  dataSource: DataSource;
  notebooks: NotebookService;
  events: NotebookEventBus;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  mentionMailsPerSenderPerHour: number;
  resolveLink(token: string): Promise<ResolvedLink>;
}

export interface NewComment {
  body: string;
  cellId?: string;
  parentId?: string;
}

type Person = { id: string; name: string; email: string; role: NotebookRole };

/** Who is asking, and with which role: a signed-in person on the notebook, or anyone holding a link. */
interface Reader {
  userId: string | null;
  role: NotebookRole;
  /** Edit and delete go through /api/comments/:id, which needs a role of one's own on the notebook. */
  mayChange: boolean;
}

const MAX_MENTION_CANDIDATES = 20;

/** The part of an address before @, reduced to the characters a handle may hold. */
function handleBase(email: string): string {
  const local = email.slice(0, email.lastIndexOf('@')).toLowerCase();
  return local.replace(/[^a-z0-9._-]/g, '').replace(/^[._-]+|[._-]+$/g, '') || 'person';
}

/**
 * Handles of the people with access. Rule: a handle is the part of the address before @ (lowercased,
 * kept to letters, digits and . _ -). When several people share it, they are ordered by full address
 * and the first keeps the plain handle while the others get 2, 3, … appended (skipping any handle that
 * is already someone's own), so the same set of people always gets the same handles.
 */
export function mentionHandles(people: { id: string; email: string }[]): Map<string, string> {
  const key = (p: { id: string; email: string }) => `${p.email.toLowerCase()} ${p.id}`;
  const byAddress = [...people].sort((a, b) => (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : 0));
  const plain = new Set(byAddress.map((p) => handleBase(p.email)));
  const taken = new Set<string>();
  const handles = new Map<string, string>();
  for (const person of byAddress) {
    const base = handleBase(person.email);
    let handle = base;
    for (let n = 2; taken.has(handle) || (handle !== base && plain.has(handle)); n += 1) handle = `${base}${n}`;
    taken.add(handle);
    handles.set(person.id, handle);
  }
  return handles;
}

/** `@handle` tokens of a text (an @ inside a word, as in an address, is not a mention). */
export function mentionedHandles(text: string): Set<string> {
  const found = new Set<string>();
  for (const match of text.matchAll(/(?<![A-Za-z0-9._%+-])@([A-Za-z0-9][A-Za-z0-9._-]*)/g)) {
    found.add(match[1].toLowerCase().replace(/[._-]+$/, ''));
  }
  return found;
}

const cellPhrase = (label: string | null) => (label ? `cell "${label}"` : 'the notebook');

/** The text of an unread entry that stands for several mentions: `3 mentions in "Title"; latest: …`. */
const COALESCED_MENTIONS = /^(\d+) mentions in ".*"; latest: /s;

/** How many mentions an unread 'mention' entry already stands for. */
function mentionsCounted(text: string): number {
  const match = COALESCED_MENTIONS.exec(text);
  return match ? Number(match[1]) : 1;
}

/** The @handles of a body; more distinct ones than a comment may hold is a validation error. */
function boundedMentions(body: string): Set<string> {
  const handles = mentionedHandles(body);
  if (handles.size > MAX_MENTIONS_PER_COMMENT) {
    throw new AppError('validation_failed', `A comment may mention at most ${MAX_MENTIONS_PER_COMMENT} people.`, { body: `Mention at most ${MAX_MENTIONS_PER_COMMENT} people in one comment (this one names ${handles.size})` });
  }
  return handles;
}

/** 409 when the notebook would hold more comments, or more characters of comments, than it may. */
async function requireRoom(manager: EntityManager, notebookId: string, added: { comments: number; chars: number }): Promise<void> {
  const held = await manager
    .createQueryBuilder(Comment, 'c')
    .select('COUNT(*)', 'comments')
    .addSelect('COALESCE(SUM(LENGTH(c.body)), 0)', 'chars')
    .where('c.notebookId = :notebookId', { notebookId })
    .getRawOne<{ comments: number; chars: number }>();
  const comments = Number(held?.comments ?? 0) + added.comments;
  const chars = Number(held?.chars ?? 0) + added.chars;
  if (comments > MAX_COMMENTS_PER_NOTEBOOK || chars > MAX_COMMENT_CHARS_PER_NOTEBOOK) {
    throw new AppError('conflict', `This notebook holds the most comments it can (${MAX_COMMENTS_PER_NOTEBOOK} comments or ${MAX_COMMENT_CHARS_PER_NOTEBOOK} characters of them); delete resolved threads to make room.`);
  }
}

/** Comment threads on notebooks and cells, mentions, and the notifications and e-mails they cause. */
export function createCommentService(deps: CommentServiceDeps) {
  const { dataSource, notebooks, events, mailer, logger, publicUrl } = deps;
  const comments = dataSource.getRepository(Comment);
  const mentionMails = senderLimit(deps.mentionMailsPerSenderPerHour, 'mention e-mails');
  const newComments = senderLimit(COMMENTS_PER_PERSON_PER_HOUR, 'comments');

  async function views(notebookId: string, reader: Reader): Promise<CommentView[]> {
    // Bounded by construction: a notebook holds at most MAX_COMMENTS_PER_NOTEBOOK comments and
    // MAX_COMMENT_CHARS_PER_NOTEBOOK characters of them (requireRoom on every new or longer comment).
    const rows = await comments.find({ where: { notebookId }, order: { createdAt: 'ASC' } });
    const withReplies = new Set(rows.map((row) => row.parentId).filter(Boolean));
    const shown = rows.filter((row) => !row.deletedAt || withReplies.has(row.id));
    const cellIds = [...new Set(shown.map((row) => row.cellId).filter((id): id is string => Boolean(id)))];
    const cells = cellIds.length ? await dataSource.getRepository(Cell).find({ where: { id: In(cellIds), notebookId }, select: { id: true, revision: true } }) : [];
    const revisions = new Map(cells.map((cell) => [cell.id, cell.revision]));
    const names = await namesOf(dataSource, shown.flatMap((row) => [row.authorId, row.resolvedById]));
    const roots = shown.filter((row) => !row.parentId);
    const threads = roots.flatMap((root) => [root, ...shown.filter((row) => row.parentId === root.id)]);
    return threads.map((row) => view(row, reader, names, revisions));
  }

  function view(row: Comment, reader: Reader, names: Map<string, string>, revisions: Map<string, number>): CommentView {
    const deleted = row.deletedAt !== null;
    const own = reader.userId === row.authorId;
    const mayComment = reader.mayChange && can(reader.role, 'comment');
    return {
      id: row.id,
      notebookId: row.notebookId,
      cellId: row.cellId,
      cellLabel: row.cellLabel,
      parentId: row.parentId,
      authorId: row.authorId,
      authorName: names.get(row.authorId) ?? '',
      body: deleted ? '' : row.body,
      createdAt: row.createdAt.toISOString(),
      editedAt: row.editedAt?.toISOString() ?? null,
      deleted,
      resolvedAt: row.resolvedAt?.toISOString() ?? null,
      resolvedByName: row.resolvedById ? (names.get(row.resolvedById) ?? null) : null,
      cellRevision: row.cellRevision,
      cellChangedSince: row.cellId !== null && revisions.get(row.cellId) !== row.cellRevision,
      mentions: deleted ? [] : (JSON.parse(row.mentionsJson) as string[]),
      canEdit: !deleted && own && mayComment && withinEditWindow(row),
      canDelete: !deleted && reader.mayChange && ((own && mayComment) || reader.role === 'owner'),
    };
  }

  async function viewOf(commentId: string, reader: Reader): Promise<CommentView> {
    const row = await comments.findOneByOrFail({ id: commentId });
    const names = await namesOf(dataSource, [row.authorId, row.resolvedById]);
    const cell = row.cellId ? await dataSource.getRepository(Cell).findOneBy({ id: row.cellId, notebookId: row.notebookId }) : null;
    return view(row, reader, names, new Map(cell ? [[cell.id, cell.revision]] : []));
  }

  const withinEditWindow = (row: Comment) => Date.now() - row.createdAt.getTime() <= COMMENT_EDIT_WINDOW_MS;

  /** Candidates with their handles; the caller's own entry is kept so numbering is the same for everyone. */
  async function candidates(notebookId: string): Promise<(Person & { handle: string })[]> {
    const people = await notebooks.peopleWithAccess(notebookId);
    const handles = mentionHandles(people);
    return people.map((p) => ({ ...p, handle: handles.get(p.id)! }));
  }

  /** Where a new comment goes: its cell (checked to be this notebook's) and, for a reply, its thread's first comment. */
  async function anchor(notebookId: string, input: NewComment): Promise<Pick<Comment, 'cellId' | 'cellLabel' | 'cellRevision' | 'parentId'> & { root: Comment | null }> {
    if (input.parentId) {
      const root = await comments.findOneBy({ id: input.parentId, notebookId });
      if (!root || root.parentId) throw new AppError('not_found', 'No such thread in this notebook.', { parentId: 'Reply to the first comment of a thread of this notebook' });
      const cell = root.cellId ? await dataSource.getRepository(Cell).findOneBy({ id: root.cellId, notebookId }) : null;
      return { root, parentId: root.id, cellId: root.cellId, cellLabel: cell?.label ?? root.cellLabel, cellRevision: cell ? cell.revision : root.cellRevision };
    }
    if (!input.cellId) return { root: null, parentId: null, cellId: null, cellLabel: null, cellRevision: null };
    const cell = await dataSource.getRepository(Cell).findOneBy({ id: input.cellId, notebookId });
    if (!cell) throw new AppError('not_found', 'No such cell in this notebook.', { cellId: 'Not a cell of this notebook' });
    return { root: null, parentId: null, cellId: cell.id, cellLabel: cell.label, cellRevision: cell.revision };
  }

  /** People with access whose handle the body names; any other @word is ignored alike. */
  function mentionedPeople(body: string, people: (Person & { handle: string })[]): Person[] {
    const handles = boundedMentions(body);
    return people.filter((p) => handles.has(p.handle));
  }

  async function threadParticipants(root: Comment): Promise<string[]> {
    const replies = await comments.find({ where: { parentId: root.id }, select: { authorId: true } });
    return [...new Set([root.authorId, ...replies.map((r) => r.authorId)])];
  }

  function mailMention(author: SignedInUser, notebook: Notebook, person: Person, body: string) {
    mailer.sendLater(async () => {
      // Over the sender's hourly limit the e-mail is skipped; the activity entry was written anyway.
      if (!(await mentionMails.take(author.id))) {
        logger.info({ senderId: author.id }, 'mention e-mail skipped: sender over the hourly limit');
        return null;
      }
      const excerpt = body.length > 500 ? `${body.slice(0, 500)}…` : body;
      const name = mailSafe(author.name);
      const title = mailSafe(notebook.title);
      return {
        to: person.email,
        subject: `${name} mentioned you in ${title}`,
        text: `${name} mentioned you in a comment on "${title}":\n\n${excerpt}\n\nOpen the notebook: ${publicUrl}/notebooks/${notebook.id}\n`,
      };
    });
  }

  /**
   * One unread mention entry per person and notebook: the first mention writes it, later ones rewrite it
   * to count the mentions and name the latest, and bring it to the top of the list.
   */
  async function tellMentioned(manager: EntityManager, userId: string, author: SignedInUser, notebook: Notebook, comment: Pick<Comment, 'id' | 'cellId' | 'cellLabel'>) {
    const latest = { actorName: author.name, commentId: comment.id, cellId: comment.cellId };
    const unread = await manager.findOne(Notification, { where: { userId, notebookId: notebook.id, kind: 'mention', readAt: IsNull() }, order: { createdAt: 'DESC' } });
    if (!unread) {
      await addNotification(manager, { userId, kind: 'mention', notebookId: notebook.id, ...latest, text: `${author.name} mentioned you in "${notebook.title}"` });
      return;
    }
    const text = `${mentionsCounted(unread.text) + 1} mentions in "${notebook.title}"; latest: ${author.name} on ${cellPhrase(comment.cellLabel)}`;
    await manager.update(Notification, { id: unread.id }, { ...latest, text: text.slice(0, 500), createdAt: new Date() });
  }

  /** People told of this comment before (entries keep the comment's id until a later mention rewrites them). */
  async function toldOf(commentId: string, userIds: string[]): Promise<Set<string>> {
    if (!userIds.length) return new Set();
    const rows = await dataSource.getRepository(Notification).find({ where: { commentId, kind: 'mention', userId: In(userIds) }, select: { userId: true } });
    return new Set(rows.map((row) => row.userId));
  }

  const commit = (recorded: NotebookChange, write: (manager: EntityManager) => Promise<void>) => commitNotebookChange(dataSource, events, recorded, write);

  function change(notebookId: string, actor: SignedInUser, kind: NotebookEventKind, cellId: string | null, text: string): NotebookChange {
    return { notebookId, kind, actorId: actor.id, actorName: actor.name, cellId, text };
  }

  async function follow(manager: EntityManager, notebookId: string, userId: string) {
    await manager.createQueryBuilder().insert().into(NotebookFollow).values({ notebookId, userId }).orIgnore().execute();
  }

  async function write(author: SignedInUser, notebook: Notebook, input: NewComment): Promise<string> {
    const placed = await anchor(notebook.id, input);
    const people = await candidates(notebook.id);
    const mentioned = mentionedPeople(input.body, people);
    const added = { comments: 1, chars: input.body.length };
    await requireRoom(dataSource.manager, notebook.id, added);
    await newComments.takeOrRefuse(author.id);
    const withAccess = new Set(people.map((p) => p.id));
    const mentionedIds = new Set(mentioned.map((p) => p.id));
    const repliedTo = placed.root ? (await threadParticipants(placed.root)).filter((id) => id !== author.id && withAccess.has(id) && !mentionedIds.has(id)) : [];
    const id = newId();
    const recorded = change(notebook.id, author, 'comment-added', placed.cellId, placed.root ? `replied to a comment on ${cellPhrase(placed.cellLabel)}` : `commented on ${cellPhrase(placed.cellLabel)}`);
    await commit(recorded, async (manager) => {
      // Again inside the transaction: another comment may have been written since the check above.
      await requireRoom(manager, notebook.id, added);
      await manager.insert(Comment, {
        id,
        notebookId: notebook.id,
        cellId: placed.cellId,
        cellLabel: placed.cellLabel,
        cellRevision: placed.cellRevision,
        parentId: placed.parentId,
        authorId: author.id,
        body: input.body,
        mentionsJson: JSON.stringify(mentioned.map((p) => p.id)),
        createdAt: new Date(),
      });
      await follow(manager, notebook.id, author.id);
      const entry = (userId: string, kind: 'reply', text: string): NewNotification => ({ userId, kind, notebookId: notebook.id, actorName: author.name, text, commentId: id, cellId: placed.cellId });
      for (const person of mentioned.filter((p) => p.id !== author.id)) await tellMentioned(manager, person.id, author, notebook, { id, ...placed });
      for (const userId of repliedTo) await addNotification(manager, entry(userId, 'reply', `${author.name} replied in a thread on ${cellPhrase(placed.cellLabel)} of "${notebook.title}"`));
    });
    for (const person of mentioned.filter((p) => p.id !== author.id)) mailMention(author, notebook, person, input.body);
    return id;
  }

  /** A comment and the caller's current role on its notebook; a notebook the caller cannot open is a missing comment. */
  async function commentFor(viewer: SignedInUser, commentId: string): Promise<{ row: Comment; notebook: Notebook; role: NotebookRole }> {
    const row = await comments.findOneBy({ id: commentId });
    if (!row) throw new AppError('not_found', 'No such comment.');
    try {
      const { notebook, role } = await notebooks.access(viewer, row.notebookId);
      return { row, notebook, role };
    } catch (error) {
      if (error instanceof AppError && error.code === 'not_found') throw new AppError('not_found', 'No such comment.');
      throw error;
    }
  }

  function requireCommenter(role: NotebookRole, what: string) {
    if (!can(role, 'comment')) throw new AppError('forbidden', `As a ${role} you cannot ${what}; it needs the commenter role.`);
  }

  async function editBody(viewer: SignedInUser, row: Comment, notebook: Notebook, role: NotebookRole, body: string) {
    if (row.deletedAt) throw new AppError('not_found', 'No such comment.');
    requireCommenter(role, 'edit comments');
    if (row.authorId !== viewer.id) throw new AppError('forbidden', 'You can edit only your own comments.');
    if (!withinEditWindow(row)) {
      throw new AppError('forbidden', `Comments can be edited for ${COMMENT_EDIT_WINDOW_MS / 60_000} minutes after posting; that time has passed. Reply instead.`);
    }
    const people = await candidates(notebook.id);
    const mentioned = mentionedPeople(body, people);
    // Everyone this comment ever mentioned stays listed, so removing and re-adding a mention tells nobody twice.
    const before = JSON.parse(row.mentionsJson) as string[];
    const told = await toldOf(row.id, mentioned.map((p) => p.id));
    const newlyMentioned = mentioned.filter((p) => !before.includes(p.id) && !told.has(p.id) && p.id !== viewer.id);
    const mentionsJson = JSON.stringify([...new Set([...before, ...mentioned.map((p) => p.id)])]);
    const longer = { comments: 0, chars: body.length - row.body.length };
    if (longer.chars > 0) await requireRoom(dataSource.manager, notebook.id, longer);
    const recorded = change(notebook.id, viewer, 'comment-edited', row.cellId, `edited a comment on ${cellPhrase(row.cellLabel)}`);
    await commit(recorded, async (manager) => {
      if (longer.chars > 0) await requireRoom(manager, notebook.id, longer);
      await manager.update(Comment, { id: row.id }, { body, editedAt: new Date(), mentionsJson });
      for (const person of newlyMentioned) await tellMentioned(manager, person.id, viewer, notebook, row);
    });
    for (const person of newlyMentioned) mailMention(viewer, notebook, person, body);
  }

  async function setResolved(viewer: SignedInUser, row: Comment, role: NotebookRole, resolved: boolean) {
    requireCommenter(role, resolved ? 'resolve threads' : 'reopen threads');
    if (row.parentId) throw new AppError('validation_failed', 'Only a whole thread can be resolved: use its first comment.', { resolved: 'Resolve the thread\'s first comment' });
    if ((row.resolvedAt !== null) === resolved) return;
    const recorded = change(row.notebookId, viewer, resolved ? 'comment-resolved' : 'comment-reopened', row.cellId, `${resolved ? 'resolved' : 'reopened'} a thread on ${cellPhrase(row.cellLabel)}`);
    await commit(recorded, async (manager) => {
      await manager.update(Comment, { id: row.id }, resolved ? { resolvedAt: new Date(), resolvedById: viewer.id } : { resolvedAt: null, resolvedById: null });
    });
  }

  /** A comment with replies stays as an empty placeholder; otherwise it goes, and so does a placeholder left without replies. */
  async function removeComment(manager: EntityManager, row: Comment) {
    const replies = await manager.countBy(Comment, { parentId: row.id });
    if (replies > 0) {
      await manager.update(Comment, { id: row.id }, { deletedAt: new Date(), body: '', mentionsJson: '[]' });
      return;
    }
    await manager.delete(Comment, { id: row.id });
    if (!row.parentId) return;
    const root = await manager.findOneBy(Comment, { id: row.parentId });
    if (root?.deletedAt && (await manager.countBy(Comment, { parentId: root.id })) === 0) await manager.delete(Comment, { id: root.id });
  }

  async function linkNotebook(token: string): Promise<{ link: ResolvedLink; notebook: Notebook }> {
    const link = await deps.resolveLink(token);
    const notebook = await dataSource.getRepository(Notebook).findOneBy({ id: link.notebookId });
    if (!notebook) throw new AppError('not_found', 'No such notebook.');
    return { link, notebook };
  }

  /** The caller's own role on the notebook, or null (a link holder needs none). */
  async function ownRole(viewer: SignedInUser, notebookId: string): Promise<NotebookRole | null> {
    try {
      return (await notebooks.access(viewer, notebookId)).role;
    } catch (error) {
      if (error instanceof AppError && error.code === 'not_found') return null;
      throw error;
    }
  }

  return {
    async list(viewer: SignedInUser, notebookId: string): Promise<CommentView[]> {
      const { role } = await notebooks.requireRole(viewer, notebookId, 'read');
      return views(notebookId, { userId: viewer.id, role, mayChange: true });
    },

    async create(viewer: SignedInUser, notebookId: string, input: NewComment): Promise<CommentView> {
      const { notebook, role } = await notebooks.requireRole(viewer, notebookId, 'comment');
      const id = await write(viewer, notebook, input);
      return viewOf(id, { userId: viewer.id, role, mayChange: true });
    },

    async mentionCandidates(viewer: SignedInUser, notebookId: string, q = ''): Promise<MentionCandidate[]> {
      await notebooks.requireRole(viewer, notebookId, 'comment');
      const needle = q.trim().replace(/^@/, '').toLowerCase();
      return (await candidates(notebookId))
        .filter((p) => p.id !== viewer.id && (!needle || p.handle.startsWith(needle) || p.name.toLowerCase().includes(needle)))
        .slice(0, MAX_MENTION_CANDIDATES)
        .map((p) => ({ id: p.id, name: p.name, handle: p.handle }));
    },

    async update(viewer: SignedInUser, commentId: string, patch: { body: string } | { resolved: boolean }): Promise<CommentView> {
      const { row, notebook, role } = await commentFor(viewer, commentId);
      if ('body' in patch) await editBody(viewer, row, notebook, role, patch.body);
      else await setResolved(viewer, row, role, patch.resolved);
      return viewOf(row.id, { userId: viewer.id, role, mayChange: true });
    },

    async remove(viewer: SignedInUser, commentId: string): Promise<void> {
      const { row, role } = await commentFor(viewer, commentId);
      if (row.deletedAt) throw new AppError('not_found', 'No such comment.');
      if (row.authorId === viewer.id) requireCommenter(role, 'delete comments');
      else if (role !== 'owner') throw new AppError('forbidden', 'You can delete only your own comments; the notebook\'s owner may delete any.');
      const recorded = change(row.notebookId, viewer, 'comment-deleted', row.cellId, `deleted a comment on ${cellPhrase(row.cellLabel)}`);
      await commit(recorded, (manager) => removeComment(manager, row));
    },

    /** Through a share link: anyone holding it reads that notebook's comments, and nothing else. */
    async listThroughLink(token: string, viewer: SignedInUser | null): Promise<CommentView[]> {
      const { link, notebook } = await linkNotebook(token);
      return views(notebook.id, { userId: viewer?.id ?? null, role: link.role, mayChange: false });
    },

    /** Through a commenter link: a signed-in person with a confirmed address comments on that notebook. */
    async createThroughLink(viewer: SignedInUser, token: string, input: NewComment): Promise<CommentView> {
      const { link, notebook } = await linkNotebook(token);
      if (!viewer.emailVerified) throw new AppError('email_not_verified', 'Confirm your e-mail address before commenting: follow the link we sent you, or ask for a new one.');
      const role = strongerRole(link.role, await ownRole(viewer, notebook.id))!;
      if (!can(role, 'comment')) throw new AppError('forbidden', 'This link lets you read the notebook, not comment on it.');
      const id = await write(viewer, notebook, input);
      return viewOf(id, { userId: viewer.id, role, mayChange: false });
    },
  };
}

export type CommentService = ReturnType<typeof createCommentService>;
