import { In, IsNull, type DataSource } from 'typeorm';
import type { Logger } from 'pino';
import type { ActivityReply, NotebookEventKind, NotebookEventView, NotificationView } from '../../shared/notebook/sharing';
import type { SignedInUser } from '../auth/sessions';
import { Notebook, NotebookEvent, NotebookFollow, Notification } from '../db/entities';
import type { NotebookChange, NotebookEventBus } from './notebookEvents';
import { NOTEBOOKS_SHARED_WITH_ME, type NotebookService } from './notebooks';
import { addNotification } from './notifications';
import { dialectOf, insertionOrder, momentParameter } from '../db/sql';

export const ACTIVITY_PAGE = 100;

export interface NotebookActivityFilter {
  kind?: NotebookEventKind;
  actorId?: string;
  before?: string;
}

/** The text of an entry that stands for several changes: `3 changes in "Title" since you last looked; latest: …`. */
const COALESCED = /^(\d+) changes in ".*" since you last looked; latest: /s;

/** How many changes an unread 'notebook-change' entry already stands for. */
function changesIn(text: string): number {
  const match = COALESCED.exec(text);
  return match ? Number(match[1]) : 1;
}

const changeLine = (change: NotebookChange) => `${change.actorName ?? 'Someone'} ${change.text}`;

/** Entries the person may still see: those of notebooks they can open (owner, own grant or a group's). */
const VISIBLE = `(a.notebookId IS NULL
  OR a.notebookId IN (SELECT "n"."id" FROM "notebooks" "n" WHERE "n"."ownerId" = :me)
  OR a.notebookId IN ${NOTEBOOKS_SHARED_WITH_ME})`;

/** One person's activity list, following notebooks, and each notebook's log of who did what. */
export function createActivityService(dataSource: DataSource, notebooks: NotebookService, events: NotebookEventBus, logger: Logger) {
  const notifications = dataSource.getRepository(Notification);
  const follows = dataSource.getRepository(NotebookFollow);
  // Changes are handled one at a time, so coalescing sees the entry written for the previous change.
  let handling: Promise<void> = Promise.resolve();
  const dialect = dialectOf(dataSource);

  const visibleTo = (viewer: SignedInUser) => notifications.createQueryBuilder('a').where('a.userId = :me', { me: viewer.id }).andWhere(VISIBLE, { me: viewer.id });

  async function followers(notebook: Notebook): Promise<string[]> {
    const rows = await follows.find({ where: { notebookId: notebook.id }, select: { userId: true } });
    return [...new Set([notebook.ownerId, ...rows.map((row) => row.userId)])];
  }

  /** Each person's newest unread 'notebook-change' entry of the notebook. */
  async function unreadChangeEntries(notebookId: string, userIds: string[]): Promise<Map<string, Notification>> {
    const rows = await notifications.find({ where: { notebookId, kind: 'notebook-change', readAt: IsNull(), userId: In(userIds) }, order: { createdAt: 'ASC' } });
    return new Map(rows.map((row) => [row.userId, row]));
  }

  /**
   * One unread entry per follower and notebook: the first change writes it, later ones rewrite it to
   * count the changes and name the latest, and bring it to the top of the list.
   */
  async function notifyFollowers(change: NotebookChange): Promise<void> {
    // Changes nobody made (a run finishing) follow from one somebody made, which followers were told of.
    if (change.actorId === null) return;
    const notebook = await dataSource.getRepository(Notebook).findOneBy({ id: change.notebookId });
    if (!notebook) return;
    const withAccess = new Set((await notebooks.peopleWithAccess(notebook.id)).map((p) => p.id));
    const told = (await followers(notebook)).filter((userId) => userId !== change.actorId && withAccess.has(userId));
    if (!told.length) return;
    const unread = await unreadChangeEntries(notebook.id, told);
    const latest = { actorName: change.actorName, cellId: change.cellId };
    await dataSource.transaction(async (manager) => {
      for (const userId of told) {
        const entry = unread.get(userId);
        if (!entry) {
          await addNotification(manager, { userId, kind: 'notebook-change', notebookId: notebook.id, ...latest, text: `${changeLine(change)} in "${notebook.title}"` });
          continue;
        }
        const text = `${changesIn(entry.text) + 1} changes in "${notebook.title}" since you last looked; latest: ${changeLine(change)}`;
        await manager.update(Notification, { id: entry.id }, { ...latest, text: text.slice(0, 500), createdAt: new Date() });
      }
    });
  }

  events.onChange((change) => {
    handling = handling.then(() => notifyFollowers(change)).catch((error) => logger.error({ err: error, notebookId: change.notebookId }, 'telling followers about a change failed'));
  });

  function notificationView(row: Notification): NotificationView {
    return {
      id: row.id,
      kind: row.kind,
      notebookId: row.notebookId,
      notebookTitle: row.notebook?.title ?? null,
      actorName: row.actorName,
      text: row.text,
      commentId: row.commentId,
      cellId: row.cellId,
      createdAt: row.createdAt.toISOString(),
      read: row.readAt !== null,
    };
  }

  return {
    /** Resolves once every change published so far has reached its followers (for tests and shutdown). */
    idle(): Promise<void> {
      return handling;
    },

    async list(viewer: SignedInUser, options: { unreadOnly?: boolean } = {}): Promise<ActivityReply> {
      const query = visibleTo(viewer).leftJoinAndSelect('a.notebook', 'notebook').orderBy('a.createdAt', 'DESC').addOrderBy(insertionOrder(dialect, 'a'), 'DESC').limit(ACTIVITY_PAGE);
      if (options.unreadOnly) query.andWhere('a.readAt IS NULL');
      const [rows, unread] = await Promise.all([query.getMany(), visibleTo(viewer).andWhere('a.readAt IS NULL').getCount()]);
      return { items: rows.map(notificationView), unread };
    },

    /** Marks the given entries (all when none are named) as read; returns what is still unread. */
    async markRead(viewer: SignedInUser, ids?: string[]): Promise<{ unread: number }> {
      if (!ids || ids.length) {
        const update = notifications.createQueryBuilder().update().set({ readAt: new Date() }).where('"userId" = :me AND "readAt" IS NULL', { me: viewer.id });
        if (ids) update.andWhere('id IN (:...ids)', { ids });
        await update.execute();
      }
      return { unread: await visibleTo(viewer).andWhere('a.readAt IS NULL').getCount() };
    },

    async following(viewer: SignedInUser, notebookId: string): Promise<{ following: boolean }> {
      const { notebook } = await notebooks.requireRole(viewer, notebookId, 'read');
      return { following: notebook.ownerId === viewer.id || (await follows.existsBy({ notebookId, userId: viewer.id })) };
    },

    async follow(viewer: SignedInUser, notebookId: string): Promise<{ following: boolean }> {
      await notebooks.requireRole(viewer, notebookId, 'read');
      await follows.createQueryBuilder().insert().values({ notebookId, userId: viewer.id }).orIgnore().execute();
      return { following: true };
    },

    /** The owner keeps following their own notebooks. */
    async unfollow(viewer: SignedInUser, notebookId: string): Promise<{ following: boolean }> {
      const { notebook } = await notebooks.requireRole(viewer, notebookId, 'read');
      await follows.delete({ notebookId, userId: viewer.id });
      return { following: notebook.ownerId === viewer.id };
    },

    /** The notebook's log, newest first, a page at a time (`before` = createdAt of the last entry seen). */
    async notebookEvents(viewer: SignedInUser, notebookId: string, filter: NotebookActivityFilter = {}): Promise<NotebookEventView[]> {
      await notebooks.requireRole(viewer, notebookId, 'read');
      const query = dataSource.getRepository(NotebookEvent).createQueryBuilder('e').where('e.notebookId = :notebookId', { notebookId });
      if (filter.kind) query.andWhere('e.kind = :kind', { kind: filter.kind });
      if (filter.actorId) query.andWhere('e.actorId = :actorId', { actorId: filter.actorId });
      if (filter.before) query.andWhere('e.createdAt < :before', { before: momentParameter(dialect, new Date(filter.before)) });
      const rows = await query.orderBy('e.createdAt', 'DESC').addOrderBy(insertionOrder(dialect, 'e'), 'DESC').limit(ACTIVITY_PAGE).getMany();
      return rows.map((row) => ({
        id: row.id,
        kind: row.kind,
        actorId: row.actorId,
        actorName: row.actorName,
        text: row.text,
        cellId: row.cellId,
        createdAt: row.createdAt.toISOString(),
      }));
    },
  };
}

export type ActivityService = ReturnType<typeof createActivityService>;
