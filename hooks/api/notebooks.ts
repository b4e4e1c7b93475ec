import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { listFilter } from '../../shared/notebook/sharing';
import type { CellInput, NotebookDetail, NotebookSummary, RunAllReply, RunView, VersionComparison, VersionDetail, VersionSummary } from '../../shared/notebook';
import { ApiError, apiRequest } from './client';
import { queryKeys } from './keys';

const API_BASE = process.env.EXPO_PUBLIC_API_URL ?? '';
const RUN_POLL_MS = 700;

export const isRunActive = (run: RunView | null | undefined) => run?.status === 'queued' || run?.status === 'running';

export type NotebookListFilter = z.infer<typeof listFilter>;

/** The list query's parameters: q when searching, filter unless it is "all", groupId only with filter=group. */
export function notebookListQuery(search: string, filter: NotebookListFilter = 'all', groupId?: string | null): string {
  const params: [string, string][] = [];
  if (search.trim()) params.push(['q', search.trim()]);
  if (filter !== 'all') params.push(['filter', filter]);
  if (filter === 'group' && groupId) params.push(['groupId', groupId]);
  return params.length ? `?${params.map(([key, value]) => `${key}=${encodeURIComponent(value)}`).join('&')}` : '';
}

export function useNotebooksQuery(search: string, filter: NotebookListFilter = 'all', groupId?: string | null) {
  return useQuery({
    queryKey: queryKeys.notebookList(search, filter, filter === 'group' ? (groupId ?? '') : ''),
    queryFn: async () => (await apiRequest<{ notebooks: NotebookSummary[] }>('GET', `/notebooks${notebookListQuery(search, filter, groupId)}`)).notebooks,
    placeholderData: (previous) => previous,
  });
}

/** The notebook, refetched while any of its cells is running so states and results arrive by themselves. */
export function useNotebookQuery(notebookId: string) {
  return useQuery({
    queryKey: queryKeys.notebook(notebookId),
    queryFn: async () => (await apiRequest<{ notebook: NotebookDetail }>('GET', `/notebooks/${notebookId}`)).notebook,
    refetchInterval: (query) => (query.state.data?.cells.some((cell) => cell.state === 'running' || isRunActive(cell.lastRun)) ? RUN_POLL_MS : false),
  });
}

/** Fetch the notebook afresh (after a conflicting save) and put it in the cache. */
export function useReloadNotebook(notebookId: string) {
  const queryClient = useQueryClient();
  return async () => {
    const { notebook } = await apiRequest<{ notebook: NotebookDetail }>('GET', `/notebooks/${notebookId}`);
    queryClient.setQueryData(queryKeys.notebook(notebookId), notebook);
    return notebook;
  };
}

/** One job run, polled while it is queued or running (progress bar); the notebook is refetched when it ends. */
export function useRunQuery(notebookId: string, runId: string | null) {
  const queryClient = useQueryClient();
  return useQuery({
    queryKey: queryKeys.run(runId ?? 'none'),
    enabled: runId !== null,
    queryFn: async () => {
      const { run } = await apiRequest<{ run: RunView }>('GET', `/runs/${runId}`);
      if (!isRunActive(run)) void queryClient.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
      return run;
    },
    refetchInterval: (query) => (isRunActive(query.state.data) ? RUN_POLL_MS : false),
  });
}

function useNotebookMutation<Input>(notebookId: string, request: (input: Input) => Promise<{ notebook: NotebookDetail }>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: request,
    onSuccess: ({ notebook }) => {
      queryClient.setQueryData(queryKeys.notebook(notebookId), notebook);
      void queryClient.invalidateQueries({ queryKey: ['notebooks', 'list'] });
    },
  });
}

export function useCreateNotebookMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { title: string; summary?: string; groupId?: string | null }) => apiRequest<{ notebook: NotebookDetail }>('POST', '/notebooks', input),
    onSuccess: ({ notebook }) => {
      queryClient.setQueryData(queryKeys.notebook(notebook.id), notebook);
      void queryClient.invalidateQueries({ queryKey: ['notebooks', 'list'] });
    },
  });
}

export function useImportNotebookMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (exported: unknown) => apiRequest<{ notebook: NotebookDetail }>('POST', '/notebooks/import', exported),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: ['notebooks', 'list'] }),
  });
}

export const useUpdateNotebookMutation = (notebookId: string) =>
  useNotebookMutation(notebookId, (input: { title?: string; summary?: string }) => apiRequest('PATCH', `/notebooks/${notebookId}`, input));

export function useDeleteNotebookMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => apiRequest<void>('DELETE', `/notebooks/${notebookId}`),
    onSuccess: () => {
      queryClient.removeQueries({ queryKey: queryKeys.notebook(notebookId) });
      void queryClient.invalidateQueries({ queryKey: ['notebooks', 'list'] });
    },
  });
}

export const useAddCellMutation = (notebookId: string) =>
  useNotebookMutation(notebookId, (input: { label: string; input: CellInput; position?: number }) => apiRequest('POST', `/notebooks/${notebookId}/cells`, input));

export interface CellEdit {
  cellId: string;
  label?: string;
  input?: CellInput;
  revision: number;
}

export const useUpdateCellMutation = (notebookId: string) =>
  useNotebookMutation(notebookId, ({ cellId, ...edit }: CellEdit) => apiRequest('PATCH', `/notebooks/${notebookId}/cells/${cellId}`, edit));

export const useMoveCellMutation = (notebookId: string) =>
  useNotebookMutation(notebookId, ({ cellId, position }: { cellId: string; position: number }) =>
    apiRequest('POST', `/notebooks/${notebookId}/cells/${cellId}/move`, { position }),
  );

export const useDeleteCellMutation = (notebookId: string) =>
  useNotebookMutation(notebookId, (cellId: string) => apiRequest('DELETE', `/notebooks/${notebookId}/cells/${cellId}`));

export const isConflict = (error: unknown) => error instanceof ApiError && error.code === 'conflict';

export function useRunCellMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (cellId: string) => (await apiRequest<{ run: RunView }>('POST', `/notebooks/${notebookId}/cells/${cellId}/run`, {})).run,
    onSuccess: (run) => {
      queryClient.setQueryData(queryKeys.run(run.id), run);
      void queryClient.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
    },
  });
}

/** Runs what the queue limit allows; `waiting` lists the cells left for a later run-all. */
export function useRunAllMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => apiRequest<RunAllReply>('POST', `/notebooks/${notebookId}/run-all`, {}),
    onSuccess: ({ runs }) => {
      for (const run of runs) queryClient.setQueryData(queryKeys.run(run.id), run);
      void queryClient.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
    },
  });
}

export function useCancelRunMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (runId: string) => (await apiRequest<{ run: RunView }>('POST', `/runs/${runId}/cancel`, {})).run,
    onSuccess: (run) => {
      queryClient.setQueryData(queryKeys.run(run.id), run);
      void queryClient.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
    },
  });
}

export function useVersionsQuery(notebookId: string) {
  return useQuery({
    queryKey: queryKeys.versions(notebookId),
    queryFn: async () => (await apiRequest<{ versions: VersionSummary[] }>('GET', `/notebooks/${notebookId}/versions`)).versions,
  });
}

export function useVersionQuery(notebookId: string, versionId: string | null) {
  return useQuery({
    queryKey: queryKeys.version(notebookId, versionId ?? 'none'),
    enabled: versionId !== null,
    queryFn: async () => (await apiRequest<{ version: VersionDetail }>('GET', `/notebooks/${notebookId}/versions/${versionId}`)).version,
  });
}

export function useComparisonQuery(notebookId: string, pair: { from: string; to: string } | null) {
  return useQuery({
    queryKey: queryKeys.comparison(notebookId, pair?.from ?? '', pair?.to ?? ''),
    enabled: pair !== null,
    queryFn: async () =>
      (await apiRequest<{ comparison: VersionComparison }>('GET', `/notebooks/${notebookId}/versions/compare?from=${pair!.from}&to=${pair!.to}`)).comparison,
  });
}

export function useSaveVersionMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (message: string) => apiRequest<{ version: VersionSummary }>('POST', `/notebooks/${notebookId}/versions`, { message }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: queryKeys.versions(notebookId) }),
  });
}

export function useRestoreVersionMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (versionId: string) => apiRequest<{ notebook: NotebookDetail }>('POST', `/notebooks/${notebookId}/versions/${versionId}/restore`, {}),
    onSuccess: ({ notebook }) => {
      queryClient.setQueryData(queryKeys.notebook(notebookId), notebook);
      void queryClient.invalidateQueries({ queryKey: queryKeys.versions(notebookId) });
    },
  });
}

/** An export as text (LaTeX or JSON), fetched with the session cookie. */
export async function fetchNotebookExport(notebookId: string, format: 'tex' | 'json', query: Record<string, string | number> = {}): Promise<string> {
  let response: Response;
  const search = new URLSearchParams(Object.entries(query).map(([key, value]) => [key, String(value)])).toString();
  try {
    response = await fetch(`${API_BASE}/api/notebooks/${notebookId}/export.${format}${search ? `?${search}` : ''}`, { credentials: 'include' });
  } catch {
    throw new ApiError(0, 'network', 'Cannot reach the Rungbook server. Check your connection and try again.');
  }
  if (!response.ok) {
    const payload = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
    throw new ApiError(response.status, 'internal', payload?.error?.message ?? `Export failed (${response.status})`);
  }
  return response.text();
}
