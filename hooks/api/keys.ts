/** Every React Query key in one place, so invalidation after a mutation cannot miss one. */
export const queryKeys = {
  me: ['me'] as const,
  groups: ['groups'] as const,
  group: (groupId: string) => ['groups', groupId] as const,
  capturedMail: ['admin', 'mail'] as const,
  notebooks: ['notebooks'] as const,
  notebookList: (search: string, filter = 'all', groupId = '') => ['notebooks', 'list', search, filter, groupId] as const,
  notebook: (notebookId: string) => ['notebooks', 'detail', notebookId] as const,
  run: (runId: string) => ['runs', runId] as const,
  versions: (notebookId: string) => ['notebooks', 'versions', notebookId] as const,
  version: (notebookId: string, versionId: string) => ['notebooks', 'versions', notebookId, versionId] as const,
  sharing: (notebookId: string) => ['notebooks', 'sharing', notebookId] as const,
  sharedNotebook: (token: string) => ['shared', token] as const,
  comparison: (notebookId: string, fromId: string, toId: string) => ['notebooks', 'compare', notebookId, fromId, toId] as const,
  datasets: (notebookId: string) => ['notebooks', 'datasets', notebookId] as const,
  dataset: (notebookId: string, datasetId: string) => ['notebooks', 'datasets', notebookId, datasetId] as const,
};
