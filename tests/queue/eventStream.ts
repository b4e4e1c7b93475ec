import http from 'node:http';
import type { LiveEvent } from '../../shared/notebook/sharing';

// A safety net so a missing event fails the test instead of hanging it, not a timing assertion.
const EVENT_WAIT_MS = 15_000;

export interface EventStreamClient {
  status: number;
  /** The next event of this type not read yet (events of other types are kept). */
  next<T extends LiveEvent['type']>(type: T): Promise<Extract<LiveEvent, { type: T }>>;
  close(): void;
}

/** Reads a server's event stream as a browser's EventSource would: named events with JSON data. */
export function openEventStream(port: number, path: string, cookie: string): Promise<EventStreamClient> {
  return new Promise((resolve, reject) => {
    const req = http.get({ host: '127.0.0.1', port, path, headers: { Accept: 'text/event-stream', Cookie: cookie } }, (res) => {
      const received: LiveEvent[] = [];
      const waiting: { type: string; resolve: (event: LiveEvent) => void }[] = [];
      let buffer = '';
      const hand = () => {
        for (let i = 0; i < waiting.length; ) {
          const index = received.findIndex((event) => event.type === waiting[i].type);
          if (index < 0) i += 1;
          else waiting.splice(i, 1)[0].resolve(received.splice(index, 1)[0]);
        }
      };
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => {
        buffer += chunk;
        for (let end = buffer.indexOf('\n\n'); end >= 0; end = buffer.indexOf('\n\n')) {
          const data = buffer.slice(0, end).split('\n').find((line) => line.startsWith('data:'));
          buffer = buffer.slice(end + 2);
          if (data) received.push(JSON.parse(data.slice(5)) as LiveEvent);
        }
        hand();
      });
      resolve({
        status: res.statusCode ?? 0,
        next: (type) =>
          new Promise((resolveEvent, rejectEvent) => {
            const timer = setTimeout(() => rejectEvent(new Error(`no "${type}" event arrived`)), EVENT_WAIT_MS);
            waiting.push({ type, resolve: (event) => (clearTimeout(timer), resolveEvent(event as never)) });
            hand();
          }),
        close: () => req.destroy(),
      });
    });
    req.on('error', reject);
  });
}
