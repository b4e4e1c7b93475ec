import type { NotebookEventKind } from '../../shared/notebook/sharing';

/** Names of what can happen in a notebook, for the log's filter. */
export const eventKindTitles: Record<NotebookEventKind, string> = {
  'cell-added': 'Cells added',
  'cell-edited': 'Cell edits',
  'cell-moved': 'Cells moved',
  'cell-deleted': 'Cells deleted',
  'cell-run': 'Runs',
  'notebook-edited': 'Title and summary',
  imported: 'Imports',
  restored: 'Restores',
  'version-saved': 'Versions saved',
  'sharing-changed': 'Sharing',
  'owner-changed': 'Ownership',
  'link-created': 'Links created',
  'link-revoked': 'Links revoked',
  'comment-added': 'Comments',
  'comment-edited': 'Comment edits',
  'comment-deleted': 'Comments deleted',
  'comment-resolved': 'Threads resolved',
  'comment-reopened': 'Threads reopened',
  'dataset-added': 'Datasets added',
  'dataset-removed': 'Datasets removed',
};
