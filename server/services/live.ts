import type { Logger } from 'pino';
import { can, type LinkRole, type LiveEvent, type NotebookRole, type PresenterState, type ViewerPresence } from '../../shared/notebook/sharing';
import type { SessionService, SignedInUser } from '../auth/sessions';
import { AppError } from '../http/errors';
import type { AccessChange, NotebookChange, NotebookEventBus } from './notebookEvents';
import type { NotebookService } from './notebooks';

/** An open event stream as the hub feeds it (the HTTP layer provides it). */
export interface LiveStream {
  send(event: string, data: unknown): void;
  comment(text: string): void;
  close(): void;
  onClose(listener: () => void): void;
  readonly closed: boolean;
}

export interface LiveLimits {
  /** Open streams one person may hold (tabs, devices). */
  perPerson: number;
  /** Open streams one share link may hold. */
  perLink: number;
  /** Open share-link streams of one notebook, through all its links together. */
  linkStreamsPerNotebook: number;
  /**
   * Open share-link streams of signed-out holders from one network address (signed-in holders count
   * against `perPerson`): filling the server through links takes many addresses.
   */
  linkStreamsPerAddress: number;
  /** Open streams of the whole server. */
  total: number;
  /**
   * A comment line this often keeps idle connections open through proxies; at each one the session or
   * share link a stream was opened with is checked again (sign-out, password reset, link expiry).
   */
  heartbeatMs: number;
}

export const DEFAULT_LIVE_LIMITS: LiveLimits = { perPerson: 10, perLink: 50, linkStreamsPerNotebook: 100, linkStreamsPerAddress: 10, total: 2000, heartbeatMs: 20_000 };

/** Who holds a share-link stream, for counting: a signed-in person, or else the network address it came from. */
export type LinkHolder = { userId: string } | { address: string };

/** Someone watching one notebook through one stream: a person, or a share-link holder. */
interface Watcher {
  notebookId: string;
  viewer: SignedInUser | null;
  link: { token: string; linkId: string; createdById: string; holder: LinkHolder } | null;
  /** The session the person's stream was opened with. */
  sessionId: string | null;
  role: NotebookRole;
  stream: LiveStream | null;
  /** A check of the watcher's session or link is under way (heartbeats do not pile up behind a slow one). */
  checking: boolean;
}

export interface LiveDeps {
  notebooks: Pick<NotebookService, 'access' | 'requireRole' | 'cellNotebookId'>;
  events: NotebookEventBus;
  logger: Logger;
  resolveLink(token: string): Promise<{ notebookId: string; role: LinkRole; linkId: string; createdById: string }>;
  /** Validates the sessions people's streams were opened with; without it only access changes end their streams. */
  sessions?: Pick<SessionService, 'resolve'>;
  limits?: Partial<LiveLimits>;
}

/**
 * What one server process's hub tells the others when several serve the same notebooks: its presenter
 * changes, the people watching each notebook through its own streams, and a request to repeat both.
 */
export type LiveRelayMessage =
  | { type: 'presenter'; notebookId: string; presenter: PresenterState | null }
  | { type: 'presence'; notebookId: string; viewers: ViewerPresence[] }
  | { type: 'sync' };

const COMMENT_KINDS = new Set(['comment-added', 'comment-edited', 'comment-deleted', 'comment-resolved', 'comment-reopened']);

/**
 * Live streams of notebooks: changes as they are committed, who is looking, who presents which cell,
 * and role changes of the people watching (a stream whose access is gone is told so and closed).
 */
export function createLiveHub(deps: LiveDeps) {
  const limits = { ...DEFAULT_LIVE_LIMITS, ...deps.limits };
  const watching = new Map<string, Set<Watcher>>();
  const presenters = new Map<string, PresenterState>();
  const perPerson = new Map<string, number>();
  const perLink = new Map<string, number>();
  const linkStreamsOfNotebook = new Map<string, number>();
  const perAddress = new Map<string, number>();
  let total = 0;
  let heartbeat: NodeJS.Timeout | null = null;
  // Other server processes' watchers by notebook and process, refreshed at their heartbeats; a process
  // that stopped refreshing (it died) drops out after a few heartbeats.
  const remoteViewers = new Map<string, Map<string, { viewers: ViewerPresence[]; at: number }>>();
  const remoteTtlMs = () => 3 * limits.heartbeatMs;
  let relay: ((message: LiveRelayMessage) => void) | null = null;

  const watchersOf = (notebookId: string) => [...(watching.get(notebookId) ?? [])].filter((w) => w.stream && !w.stream.closed);
  const send = (watcher: Watcher, event: LiveEvent) => watcher.stream?.send(event.type, event);
  const broadcast = (notebookId: string, event: LiveEvent) => watchersOf(notebookId).forEach((w) => send(w, event));

  function localViewersOf(notebookId: string): ViewerPresence[] {
    const people = new Map<string, ViewerPresence>();
    for (const { viewer } of watchersOf(notebookId)) {
      if (viewer && !people.has(viewer.id)) people.set(viewer.id, { userId: viewer.id, name: viewer.name, presenting: false });
    }
    return [...people.values()];
  }

  function remoteViewersOf(notebookId: string): ViewerPresence[] {
    const fresh = Date.now() - remoteTtlMs();
    return [...(remoteViewers.get(notebookId)?.values() ?? [])].filter((entry) => entry.at >= fresh).flatMap((entry) => entry.viewers);
  }

  /** Everyone watching the notebook through any server process. */
  function viewersOf(notebookId: string): ViewerPresence[] {
    const people = new Map<string, ViewerPresence>();
    const presenter = presenters.get(notebookId);
    for (const viewer of [...localViewersOf(notebookId), ...remoteViewersOf(notebookId)]) {
      if (!people.has(viewer.userId)) people.set(viewer.userId, { ...viewer, presenting: presenter?.userId === viewer.userId });
    }
    return [...people.values()];
  }

  const isWatching = (notebookId: string, userId: string) => viewersOf(notebookId).some((viewer) => viewer.userId === userId);

  const relayPresence = (notebookId: string) => relay?.({ type: 'presence', notebookId, viewers: localViewersOf(notebookId) });

  function count(map: Map<string, number>, key: string, step: number) {
    const next = (map.get(key) ?? 0) + step;
    if (next > 0) map.set(key, next);
    else map.delete(key);
  }

  /** The counters a stream takes a place in, each with its limit and the refusal past it. */
  function countersOf(watcher: Watcher): [Map<string, number>, string, number, string][] {
    const person = (userId: string): [Map<string, number>, string, number, string] =>
      [perPerson, userId, limits.perPerson, `At most ${limits.perPerson} live pages per person are open at once; close another tab.`];
    if (watcher.viewer) return [person(watcher.viewer.id)];
    const { linkId, holder } = watcher.link!;
    return [
      [perLink, linkId, limits.perLink, `At most ${limits.perLink} live pages per share link are open at once.`],
      [linkStreamsOfNotebook, watcher.notebookId, limits.linkStreamsPerNotebook, `At most ${limits.linkStreamsPerNotebook} live pages are open through this notebook's share links at once.`],
      'userId' in holder
        ? person(holder.userId)
        : [perAddress, holder.address, limits.linkStreamsPerAddress, `At most ${limits.linkStreamsPerAddress} live pages through share links are open from one network address at once; close another tab.`],
    ];
  }

  function reserve(watcher: Watcher) {
    if (total >= limits.total) throw new AppError('rate_limited', 'Too many live pages are open on this server right now; the page will reconnect shortly.');
    const counters = countersOf(watcher);
    for (const [map, key, limit, refusal] of counters) if ((map.get(key) ?? 0) >= limit) throw new AppError('rate_limited', refusal);
    for (const [map, key] of counters) count(map, key, 1);
    total += 1;
  }

  function release(watcher: Watcher) {
    for (const [map, key] of countersOf(watcher)) count(map, key, -1);
    total -= 1;
  }

  function startHeartbeat() {
    if (heartbeat) return;
    heartbeat = setInterval(() => {
      for (const [notebookId, set] of watching) {
        relayPresence(notebookId);
        for (const watcher of set) {
          watcher.stream?.comment('ping');
          checkStillAdmitted(watcher);
        }
      }
    }, limits.heartbeatMs);
    heartbeat.unref();
  }

  function stopHeartbeatWhenIdle() {
    if (total > 0 || !heartbeat) return;
    clearInterval(heartbeat);
    heartbeat = null;
  }

  function attach(watcher: Watcher, stream: LiveStream) {
    watcher.stream = stream;
    const wasWatching = watcher.viewer ? isWatching(watcher.notebookId, watcher.viewer.id) : true;
    let set = watching.get(watcher.notebookId);
    if (!set) watching.set(watcher.notebookId, (set = new Set()));
    set.add(watcher);
    stream.onClose(() => detach(watcher));
    if (stream.closed) return;
    startHeartbeat();
    // link holders may follow a presenter but are not told who else is looking
    const viewers = watcher.viewer ? viewersOf(watcher.notebookId) : [];
    send(watcher, { type: 'hello', role: watcher.role, viewers, presenter: presenters.get(watcher.notebookId) ?? null });
    relayPresence(watcher.notebookId);
    if (!wasWatching) broadcastPresence(watcher.notebookId, watcher);
  }

  function broadcastPresence(notebookId: string, except?: Watcher) {
    const event: LiveEvent = { type: 'presence', viewers: viewersOf(notebookId) };
    for (const watcher of watchersOf(notebookId)) if (watcher !== except && watcher.viewer) send(watcher, event);
  }

  function detach(watcher: Watcher) {
    const set = watching.get(watcher.notebookId);
    if (!set?.delete(watcher)) return;
    if (!set.size) watching.delete(watcher.notebookId);
    release(watcher);
    stopHeartbeatWhenIdle();
    relayPresence(watcher.notebookId);
    const userId = watcher.viewer?.id;
    if (!userId || isWatching(watcher.notebookId, userId)) return;
    // the presenter's state lives as long as one of their pages on the notebook is open
    if (presenters.get(watcher.notebookId)?.userId === userId) endPresentation(watcher.notebookId);
    broadcastPresence(watcher.notebookId);
  }

  function endPresentation(notebookId: string) {
    if (!presenters.delete(notebookId)) return;
    broadcast(notebookId, { type: 'presenter', presenter: null });
    relay?.({ type: 'presenter', notebookId, presenter: null });
  }

  /** A message from the hub of another server process (`origin` names that process). */
  function receive(origin: string, message: LiveRelayMessage) {
    if (message.type === 'sync') {
      for (const notebookId of watching.keys()) relayPresence(notebookId);
      for (const [notebookId, presenter] of presenters) relay?.({ type: 'presenter', notebookId, presenter });
      return;
    }
    if (message.type === 'presence') {
      let byOrigin = remoteViewers.get(message.notebookId);
      if (!byOrigin) remoteViewers.set(message.notebookId, (byOrigin = new Map()));
      if (message.viewers.length) byOrigin.set(origin, { viewers: message.viewers, at: Date.now() });
      else byOrigin.delete(origin);
      if (!byOrigin.size) remoteViewers.delete(message.notebookId);
      broadcastPresence(message.notebookId);
      return;
    }
    if (message.presenter) presenters.set(message.notebookId, message.presenter);
    else if (!presenters.delete(message.notebookId)) return;
    broadcast(message.notebookId, { type: 'presenter', presenter: message.presenter });
    broadcastPresence(message.notebookId);
  }

  function onChange(change: NotebookChange) {
    const comments = COMMENT_KINDS.has(change.kind);
    for (const watcher of watchersOf(change.notebookId)) {
      // link holders learn that something changed, not who changed it
      const who = watcher.viewer ? { actorId: change.actorId, actorName: change.actorName } : { actorId: null, actorName: null };
      send(watcher, { type: 'changed', kind: change.kind, ...who, cellId: change.cellId, comments });
    }
  }

  /** The watcher's role now, or null when its access is gone. */
  async function currentRole(watcher: Watcher): Promise<NotebookRole | null> {
    try {
      if (watcher.viewer) return (await deps.notebooks.access(watcher.viewer, watcher.notebookId)).role;
      const link = await deps.resolveLink(watcher.link!.token);
      return link.notebookId === watcher.notebookId ? link.role : null;
    } catch (error) {
      if (error instanceof AppError && error.code === 'not_found') return null;
      throw error;
    }
  }

  function revoke(watcher: Watcher) {
    if (!watcher.stream || watcher.stream.closed) return;
    send(watcher, { type: 'revoked' });
    watcher.stream.close();
  }

  async function recheck(watcher: Watcher) {
    const role = await currentRole(watcher);
    if (!watcher.stream || watcher.stream.closed) return;
    if (role === null) return revoke(watcher);
    if (role === watcher.role) return;
    watcher.role = role;
    send(watcher, { type: 'role', role });
    const presenter = presenters.get(watcher.notebookId);
    if (presenter && presenter.userId === watcher.viewer?.id && !can(role, 'present')) endPresentation(watcher.notebookId);
  }

  /** Whether the person's stream still rests on a live session of theirs (ended by sign-out, password reset, expiry). */
  async function sessionHolds(watcher: Watcher): Promise<boolean> {
    if (!deps.sessions || !watcher.viewer) return true;
    if (!watcher.sessionId) return false;
    const { user } = await deps.sessions.resolve(watcher.sessionId);
    return user?.id === watcher.viewer.id;
  }

  /** Heartbeat check: a link holder's link must still be usable, a person's session still open. */
  function checkStillAdmitted(watcher: Watcher) {
    if (watcher.checking || !watcher.stream || watcher.stream.closed) return;
    watcher.checking = true;
    const check = watcher.link ? recheck(watcher) : sessionHolds(watcher).then((holds) => (holds ? undefined : revoke(watcher)));
    check
      .catch((error) => deps.logger.error({ err: error, notebookId: watcher.notebookId }, 'checking a live stream\'s session or link failed'))
      .finally(() => (watcher.checking = false));
  }

  function onAccessChange(change: AccessChange) {
    // a person's changed access also changes what the share links they made still open
    const affected =
      'notebookId' in change
        ? watchersOf(change.notebookId)
        : [...watching.values()]
            .flatMap((set) => [...set])
            .filter((w) => (w.viewer?.id === change.userId || w.link?.createdById === change.userId) && w.stream && !w.stream.closed);
    for (const watcher of affected) {
      recheck(watcher).catch((error) => deps.logger.error({ err: error, notebookId: watcher.notebookId }, 'checking a live stream\'s access failed'));
    }
  }

  deps.events.onChange(onChange);
  deps.events.onAccessChange(onAccessChange);

  return {
    /**
     * Admit a person to a notebook's stream (viewer and up) on the session they opened it with; the returned
     * function feeds the opened stream.
     */
    async watch(viewer: SignedInUser, notebookId: string, sessionId: string | null): Promise<(stream: LiveStream) => void> {
      const { role } = await deps.notebooks.requireRole(viewer, notebookId, 'read');
      const watcher: Watcher = { notebookId, viewer, link: null, sessionId, role, stream: null, checking: false };
      reserve(watcher);
      return (stream) => attach(watcher, stream);
    },

    /** Admit a share-link holder to the read-only stream of the link's notebook. */
    async watchShared(token: string, holder: LinkHolder): Promise<(stream: LiveStream) => void> {
      const link = await deps.resolveLink(token);
      const watcher: Watcher = {
        notebookId: link.notebookId, viewer: null, link: { token, linkId: link.linkId, createdById: link.createdById, holder }, sessionId: null, role: link.role, stream: null, checking: false,
      };
      reserve(watcher);
      return (stream) => attach(watcher, stream);
    },

    /** Make the caller the notebook's presenter at `cellId` (editors; they need the notebook open). */
    async present(viewer: SignedInUser, notebookId: string, cellId: string | null): Promise<PresenterState> {
      await deps.notebooks.requireRole(viewer, notebookId, 'present');
      if (cellId && (await deps.notebooks.cellNotebookId(cellId)) !== notebookId) throw new AppError('not_found', 'No such cell.', { cellId: 'Not a cell of this notebook' });
      if (!isWatching(notebookId, viewer.id)) {
        throw new AppError('conflict', 'Open the notebook to present it: others follow the page you have open.');
      }
      const current = presenters.get(notebookId);
      const takesOver = current?.userId !== viewer.id;
      const state: PresenterState = { userId: viewer.id, name: viewer.name, cellId, since: takesOver ? new Date().toISOString() : current!.since };
      presenters.set(notebookId, state);
      broadcast(notebookId, { type: 'presenter', presenter: state });
      relay?.({ type: 'presenter', notebookId, presenter: state });
      if (takesOver) broadcastPresence(notebookId);
      return state;
    },

    /** Stop the presentation: the presenter themselves, or anyone who may present. */
    async stopPresenting(viewer: SignedInUser, notebookId: string): Promise<void> {
      await deps.notebooks.access(viewer, notebookId);
      const current = presenters.get(notebookId);
      if (current?.userId !== viewer.id) await deps.notebooks.requireRole(viewer, notebookId, 'present');
      if (!current) return;
      endPresentation(notebookId);
      broadcastPresence(notebookId);
    },

    presenter: (notebookId: string): PresenterState | null => presenters.get(notebookId) ?? null,
    /** Streams open now (for health and tests). */
    openStreams: () => total,

    /** Tells other server processes (through `send`) what they need to know, and asks them to do the same. */
    relayTo(send: (message: LiveRelayMessage) => void): void {
      relay = send;
      send({ type: 'sync' });
    },
    /** A message relayed from another server process. */
    deliver: receive,

    /** End every stream (server shutdown); clients reconnect to the next server. */
    closeAll() {
      const all = [...watching.values()].flatMap((set) => [...set]);
      for (const watcher of all) watcher.stream?.close();
      presenters.clear();
      stopHeartbeatWhenIdle();
    },
  };
}

export type LiveHub = ReturnType<typeof createLiveHub>;
