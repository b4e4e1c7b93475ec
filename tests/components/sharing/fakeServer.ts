/** A fetch stand-in answering by method and path, recording every request, for screens that make several calls. */
export interface Recorded {
  method: string;
  path: string;
  body: unknown;
}

type Reply = { status: number; body?: unknown };
type Handler = (request: Recorded) => Reply;

export function fakeServer(routes: Record<string, Reply | Handler>) {
  const requests: Recorded[] = [];
  global.fetch = jest.fn(async (url: string, init?: { method?: string; body?: string }) => {
    const path = String(url).replace(/^.*\/api/, '');
    const request = { method: init?.method ?? 'GET', path, body: init?.body ? JSON.parse(init.body) : undefined };
    requests.push(request);
    const route = routes[`${request.method} ${path}`] ?? routes[`${request.method} ${path.split('?')[0]}`];
    const reply = typeof route === 'function' ? route(request) : (route ?? { status: 404, body: { error: { code: 'not_found', message: 'No such route in the test' } } });
    return { ok: reply.status >= 200 && reply.status < 300, status: reply.status, json: async () => reply.body };
  }) as unknown as typeof fetch;
  return { requests, sent: (method: string, path: string) => requests.filter((r) => r.method === method && r.path === path) };
}
