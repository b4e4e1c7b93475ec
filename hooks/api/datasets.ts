import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApiErrorBody } from '../../shared/api/errors';
import type { NotebookDetail } from '../../shared/notebook';
import type { DatasetDescription, DatasetView, DatasetWithPoints, PastedDataset, RowProblem } from '../../shared/notebook/datasets';
import { ApiError } from './client';
import { queryKeys } from './keys';

const API_BASE = process.env.EXPO_PUBLIC_API_URL ?? '';

/** An API error that may list the rows of a table the server refused (`invalid_table`). */
export class DatasetRequestError extends ApiError {
  constructor(
    status: number,
    code: ApiError['code'],
    message: string,
    fields: Record<string, string>,
    readonly problems: RowProblem[],
    readonly problemCount: number,
  ) {
    super(status, code, message, fields);
  }
}

/** A file as the form holds it: what the upload sends (a web File, or a native `{uri, name, type}`) and its size. */
export interface PickedFile {
  name: string;
  size: number;
  /** Appended to the multipart body as is. */
  part: Blob | { uri: string; name: string; type: string };
}

/**
 * Like `apiRequest`, but for a body that may be multipart (the browser sets that Content-Type with its
 * boundary, so it is never set here) and keeping the row problems of a refused table.
 */
async function datasetRequest<T>(method: 'GET' | 'POST' | 'DELETE', path: string, body?: FormData | object): Promise<T> {
  const json = body !== undefined && !(body instanceof FormData);
  let response: Response;
  try {
    response = await fetch(`${API_BASE}/api${path}`, {
      method,
      credentials: 'include',
      headers: json ? { Accept: 'application/json', 'Content-Type': 'application/json' } : { Accept: 'application/json' },
      body: body === undefined ? undefined : json ? JSON.stringify(body) : (body as FormData),
    });
  } catch {
    throw new ApiError(0, 'network', 'Cannot reach the Rungbook server. Check your connection and try again.');
  }
  const payload = (await response.json().catch(() => null)) as (T & Partial<ApiErrorBody>) | null;
  if (!response.ok) throw requestError(response.status, payload?.error);
  return payload as T;
}

function requestError(status: number, error: ApiErrorBody['error'] | undefined): DatasetRequestError {
  const problems = error?.problems ?? [];
  const message = error?.message ?? (status === 413 ? 'The file is too large for the server.' : `Request failed (${status})`);
  return new DatasetRequestError(status, error?.code ?? (status === 413 ? 'payload_too_large' : 'internal'), message, error?.fields ?? {}, problems, error?.problemCount ?? problems.length);
}

/** The multipart body of an upload: the file and its description as a JSON string. */
export function uploadBody(file: PickedFile, description: DatasetDescription): FormData {
  const form = new FormData();
  // First, so a server reading the stream knows the description before the file arrives.
  form.append('description', JSON.stringify(description));
  // The web's FormData takes the File itself; React Native's takes `{uri, name, type}` (and no file name argument).
  if (typeof Blob !== 'undefined' && file.part instanceof Blob) form.append('file', file.part, file.name);
  else form.append('file', file.part as unknown as Blob);
  return form;
}

/** After a dataset is added or removed the notebook (its list of datasets, comparison states) is read again. */
function useDatasetWrite<Input>(notebookId: string, request: (input: Input) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: request,
    onSuccess: (reply) => {
      const notebook = (reply as { notebook?: NotebookDetail }).notebook;
      if (notebook) queryClient.setQueryData(queryKeys.notebook(notebookId), notebook);
      void queryClient.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
      void queryClient.invalidateQueries({ queryKey: queryKeys.datasets(notebookId) });
    },
  });
}

export const useUploadDatasetMutation = (notebookId: string) =>
  useDatasetWrite(notebookId, ({ file, description }: { file: PickedFile; description: DatasetDescription }) =>
    datasetRequest<{ dataset: DatasetView }>('POST', `/notebooks/${notebookId}/datasets`, uploadBody(file, description)),
  );

export const usePasteDatasetMutation = (notebookId: string) =>
  useDatasetWrite(notebookId, (pasted: PastedDataset) => datasetRequest<{ dataset: DatasetView }>('POST', `/notebooks/${notebookId}/datasets/pasted`, pasted));

export const useRemoveDatasetMutation = (notebookId: string) =>
  useDatasetWrite(notebookId, (datasetId: string) => datasetRequest<{ notebook: NotebookDetail }>('DELETE', `/notebooks/${notebookId}/datasets/${datasetId}`));

/** One dataset with its points (loaded only when asked for: points may be megabytes). */
export function useDatasetQuery(notebookId: string, datasetId: string | null) {
  return useQuery({
    queryKey: queryKeys.dataset(notebookId, datasetId ?? 'none'),
    enabled: datasetId !== null,
    queryFn: async () => (await datasetRequest<{ dataset: DatasetWithPoints }>('GET', `/notebooks/${notebookId}/datasets/${datasetId}`)).dataset,
  });
}

export const datasetCsvPath = (notebookId: string, datasetId: string) => `/notebooks/${notebookId}/datasets/${datasetId}/download.csv`;

/** The dataset as the server writes it for download (CSV, formula-looking cells escaped there). */
export async function fetchDatasetCsv(notebookId: string, datasetId: string): Promise<string> {
  let response: Response;
  try {
    response = await fetch(`${API_BASE}/api${datasetCsvPath(notebookId, datasetId)}`, { credentials: 'include', headers: { Accept: 'text/csv' } });
  } catch {
    throw new ApiError(0, 'network', 'Cannot reach the Rungbook server. Check your connection and try again.');
  }
  if (!response.ok) {
    const payload = (await response.json().catch(() => null)) as Partial<ApiErrorBody> | null;
    throw requestError(response.status, payload?.error);
  }
  return response.text();
}
