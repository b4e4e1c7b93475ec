import type { CommentView } from '../../../shared/notebook/sharing';

type Reply = { status: number; body?: unknown };
type Handler = (url: string, init: RequestInit) => Reply;

/** A fetch stand-in answering by method and path (`GET /api/activity`); unknown requests get 404. */
export function fakeApi(routes: Record<string, Reply | Handler>) {
  const fetchMock = jest.fn(async (url: string, init: RequestInit = {}) => {
    const path = url.split('?')[0];
    const route = routes[`${init.method ?? 'GET'} ${path}`];
    const reply = typeof route === 'function' ? route(url, init) : route ?? { status: 404, body: { error: { code: 'not_found', message: 'No such thing' } } };
    return { ok: reply.status >= 200 && reply.status < 300, status: reply.status, json: async () => reply.body };
  });
  global.fetch = fetchMock as unknown as typeof fetch;
  return fetchMock;
}

export function comment(overrides: Partial<CommentView>): CommentView {
  return {
    id: 'cmt0000001',
    notebookId: 'nb00000001',
    cellId: null,
    cellLabel: null,
    parentId: null,
    authorId: 'u000000001',
    authorName: 'Invented Author',
    body: 'A comment',
    createdAt: new Date().toISOString(),
    editedAt: null,
    deleted: false,
    resolvedAt: null,
    resolvedByName: null,
    cellRevision: null,
    cellChangedSince: false,
    mentions: [],
    canEdit: false,
    canDelete: false,
    ...overrides,
  };
}
