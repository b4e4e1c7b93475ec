import type { EntityManager } from 'typeorm';
import type { NotificationKind } from '../../shared/notebook/sharing';
import { Notification } from '../db/entities';
import { newId } from '../ids';

export interface NewNotification {
  userId: string;
  kind: NotificationKind;
  notebookId: string | null;
  actorName: string | null;
  /** One line for the person's activity list. */
  text: string;
  commentId?: string | null;
  cellId?: string | null;
}

/** The one writer of activity-list entries; callers pass their transaction's manager. */
export async function addNotification(manager: EntityManager, entry: NewNotification): Promise<void> {
  await manager.insert(Notification, { id: newId(), commentId: null, cellId: null, ...entry, text: entry.text.slice(0, 500) });
}
