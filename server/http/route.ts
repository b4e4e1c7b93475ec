import type { Request, Response, Router } from 'express';
import type { z } from 'zod';
import type { SignedInUser } from '../auth/sessions';
import { AppError } from './errors';
import { assertDeclaredSizeFits, createUploadGate, readUpload, type UploadedFile, type UploadGate } from './upload';
import { parseInput } from './validation';

export type Access = 'public' | 'signed-in' | 'admin';

/** A non-JSON reply (a file download). */
export class FileReply {
  constructor(
    readonly contentType: string,
    readonly fileName: string,
    readonly content: string,
  ) {}
}

/** A JSON reply already serialised (spliced from stored JSON text without parsing it). */
export class RawJsonReply {
  constructor(readonly json: string) {}
}

/** An open server-sent-events stream, as the service that feeds it sees it. */
export interface EventStream {
  /** A named event; `data` is sent as one line of JSON. */
  send(event: string, data: unknown): void;
  /** A comment line (keeps proxies from closing an idle connection). */
  comment(text: string): void;
  /** End the stream from the server side. */
  close(): void;
  /** Called once when the stream ends, from either side. */
  onClose(listener: () => void): void;
  readonly closed: boolean;
}

/** A reply that stays open: server-sent events (text/event-stream) fed by `open`. */
export class EventStreamReply {
  constructor(
    readonly open: (stream: EventStream) => void,
    /** Milliseconds the client waits before reconnecting. */
    readonly retryMs = 3000,
  ) {}
}

/** A client that reads too slowly is dropped (it reconnects) rather than buffered without bound. */
const MAX_STREAM_BACKLOG_BYTES = 1_000_000;

function openEventStream(req: Request, res: Response, reply: EventStreamReply): void {
  res.status(200);
  res.set({
    'Content-Type': 'text/event-stream; charset=utf-8',
    'Cache-Control': 'no-store',
    Connection: 'keep-alive',
    // proxies (nginx) must pass events through as they come
    'X-Accel-Buffering': 'no',
  });
  req.socket.setNoDelay(true);
  req.socket.setKeepAlive(true);
  res.flushHeaders();
  const listeners: (() => void)[] = [];
  let closed = false;
  const finish = () => {
    if (closed) return;
    closed = true;
    for (const listener of listeners.splice(0)) listener();
  };
  res.on('close', finish);
  const write = (text: string) => {
    if (closed) return;
    res.write(text);
    if (res.writableLength > MAX_STREAM_BACKLOG_BYTES) stream.close();
  };
  const stream: EventStream = {
    send: (event, data) => write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`),
    comment: (text) => write(`: ${text.replace(/[\r\n]/g, ' ')}\n\n`),
    close: () => {
      if (closed) return;
      res.end();
      finish();
    },
    onClose: (listener) => {
      if (closed) listener();
      else listeners.push(listener);
    },
    get closed() {
      return closed;
    },
  };
  // a HEAD request learns the status and headers; it has no body to keep open
  if (req.method === 'HEAD' || res.destroyed) finish();
  write(`retry: ${reply.retryMs}\n\n`);
  reply.open(stream);
  if (req.method === 'HEAD') res.end();
}

export interface RouteContext<Body, Params, Query = unknown> {
  body: Body;
  params: Params;
  query: Query;
  user: SignedInUser | null;
  /** The current session's id, when signed in. */
  sessionId: string | null;
  req: Request;
  /** The uploaded file of an `upload: 'file'` route (null when the form had none). */
  file: UploadedFile | null;
  /** The body as text, for a `bodyAsText` route (null when none was sent as JSON). */
  text: string | null;
  /** Queue a Set-Cookie header for the reply. */
  setCookie(serialized: string): void;
}

export interface RouteSpec<BodySchema extends z.ZodType, ParamsSchema extends z.ZodType, QuerySchema extends z.ZodType = z.ZodUnknown> {
  method: 'get' | 'post' | 'patch' | 'delete';
  path: string;
  access: Access;
  /** One line for the OpenAPI description. */
  summary?: string;
  body?: BodySchema;
  params?: ParamsSchema;
  query?: QuerySchema;
  status?: number;
  /** The reply is a text/event-stream that stays open (EventStreamReply); clients and tests read its status, then events. */
  eventStream?: boolean;
  /**
   * A multipart form with one file (field "file") and a JSON text field "description" validated with `body`.
   * `beforeUpload` runs after the access check and before any byte of the file is read (e.g. the notebook role).
   */
  upload?: 'file';
  beforeUpload?(ctx: { params: z.output<ParamsSchema>; user: SignedInUser | null }): Promise<void>;
  /**
   * The JSON body is handed over as text (ctx.text), unparsed: the handler has it parsed and checked
   * off the request thread. `body` then only documents its shape; ctx.body is undefined.
   */
  bodyAsText?: boolean;
  handler(ctx: RouteContext<z.output<BodySchema>, z.output<ParamsSchema>, z.output<QuerySchema>>): Promise<unknown>;
}

/** Declare a route: method, path, who may call it, input schemas, and a handler returning the JSON reply. */
export type AnyRouteSpec = RouteSpec<z.ZodType, z.ZodType, z.ZodType>;

export function route<B extends z.ZodType = z.ZodUnknown, P extends z.ZodType = z.ZodUnknown, Q extends z.ZodType = z.ZodUnknown>(spec: RouteSpec<B, P, Q>) {
  return spec as unknown as AnyRouteSpec;
}

function authorize(access: Access, user: SignedInUser | null): void {
  if (access === 'public') return;
  if (!user) throw new AppError('unauthenticated', 'Sign in to continue.');
  if (access === 'admin' && user.siteRole !== 'admin') throw new AppError('forbidden', 'Only site administrators may do this.');
}

/** The JSON text of a multipart form's "description" field, parsed (the route's body schema validates it). */
function descriptionField(form: unknown): unknown {
  const text = (form as Record<string, unknown> | undefined)?.description;
  if (typeof text !== 'string') throw new AppError('validation_failed', 'Describe the table in the form field "description" (JSON).', { description: 'Required' });
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError('malformed_json', 'The form field "description" is not valid JSON.', { description: 'Not valid JSON' });
  }
}

/**
 * An upload's checks come before any byte of it is read: its declared size, a reading slot (one per
 * person, a few server-wide; taken first so that a refused attempt costs no quota), then the route's
 * own check (role, hourly quota).
 */
async function readUploadOnce(spec: AnyRouteSpec, req: Request, res: Response, params: unknown, user: SignedInUser | null, uploads: UploadGate): Promise<UploadedFile | null> {
  assertDeclaredSizeFits(req);
  const release = uploads.enter(user?.id ?? req.ip ?? 'anonymous');
  // the file stays in memory until the reply is sent (or the client goes away): the slot is held as long
  res.once('finish', release);
  res.once('close', release);
  await spec.beforeUpload?.({ params, user });
  return readUpload(req, res);
}

export function mount(router: Router, specs: AnyRouteSpec[], uploads: UploadGate = createUploadGate(4)): void {
  for (const spec of specs) {
    router[spec.method](spec.path, async (req: Request, res: Response) => {
      const user = res.locals.user as SignedInUser | null;
      authorize(spec.access, user);
      const params = spec.params ? parseInput(spec.params, req.params) : req.params;
      let file: UploadedFile | null = null;
      if (spec.upload) file = await readUploadOnce(spec, req, res, params, user, uploads);
      const text = spec.bodyAsText && typeof req.body === 'string' ? req.body : null;
      const body = spec.body && !spec.bodyAsText ? parseInput(spec.body, spec.upload ? descriptionField(req.body) : req.body) : undefined;
      const query = spec.query ? parseInput(spec.query, req.query) : undefined;
      const cookies: string[] = [];
      const result = await spec.handler({ body, params, query, user, sessionId: (res.locals.sessionId as string | null) ?? null, req, file, text, setCookie: (c) => cookies.push(c) });
      if (cookies.length) res.append('Set-Cookie', cookies);
      if (result instanceof EventStreamReply) {
        openEventStream(req, res, result);
      } else if (result instanceof FileReply) {
        res.status(200).type(result.contentType).attachment(result.fileName).send(result.content);
      } else if (result instanceof RawJsonReply) {
        res.status(spec.status ?? 200).type('application/json').send(result.json);
      } else if (result === undefined) res.status(spec.status ?? 204).end();
      else res.status(spec.status ?? 200).json(result);
    });
  }
}
