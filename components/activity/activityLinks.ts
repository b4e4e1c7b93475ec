import type { NotificationKind, NotificationView } from '../../shared/notebook/sharing';

export const notificationKindTitles: Record<NotificationKind, string> = {
  mention: 'Mention',
  reply: 'Reply',
  invitation: 'Invitation',
  shared: 'Shared',
  'notebook-change': 'Change',
};

/** Where an activity item leads: its notebook, scrolled to the cell when it is about one. */
export function activityHref(item: Pick<NotificationView, 'notebookId' | 'cellId'>): string | null {
  if (!item.notebookId) return null;
  return item.cellId ? `/notebooks/${item.notebookId}?cell=${item.cellId}` : `/notebooks/${item.notebookId}`;
}

export const newestFirst = (items: NotificationView[]) => [...items].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
