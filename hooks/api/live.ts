import { useEffect, useRef, useState } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { NotebookDetail } from '../../shared/notebook';
import { can, type LiveEvent, type NotebookEventKind, type NotebookRole, type PresenterState, type ViewerPresence } from '../../shared/notebook/sharing';
import { activityKeys } from './activity';
import { apiRequest } from './client';
import { commentKeys } from './comments';
import { queryKeys } from './keys';

const API_BASE = process.env.EXPO_PUBLIC_API_URL ?? '';
/** Without EventSource the notebook is refetched this often instead. */
export const LIVE_POLL_MS = 5000;
/** After the browser gives up on a stream (a refused reply), a fresh one is opened this much later, doubling up to a minute. */
const REOPEN_AFTER_MS = 5000;
const REOPEN_AFTER_MAX_MS = 60_000;
const LIVE_EVENT_TYPES = ['hello', 'changed', 'presence', 'presenter', 'role', 'revoked'] as const;

/**
 * live: events arrive; connecting: the first reply is pending; reconnecting: the stream dropped and is being
 * reopened; polling: no event stream on this platform; revoked: the caller lost access and nothing more comes.
 */
export type LiveConnection = 'connecting' | 'live' | 'reconnecting' | 'polling' | 'revoked';

export interface NotebookLive {
  viewers: ViewerPresence[];
  presenter: PresenterState | null;
  connection: LiveConnection;
  /** The caller's role as the stream last said; null until it has. */
  role: NotebookRole | null;
  /** Greetings received (one per connection); 0 = who presents is not known yet. */
  session: number;
}

const initialLive: NotebookLive = { viewers: [], presenter: null, connection: 'connecting', role: null, session: 0 };

/** The notebook's own stream, or (with a share token) the read-only stream of the link. */
export const liveEventsUrl = (notebookId: string, shareToken?: string) =>
  shareToken ? `${API_BASE}/api/shared/${encodeURIComponent(shareToken)}/events` : `${API_BASE}/api/notebooks/${notebookId}/events`;

/** Where the page reads the notebook from: its own route, or the share link's. */
interface LiveTarget {
  notebookId: string;
  shareToken?: string;
}

const notebookKeyOf = ({ notebookId, shareToken }: LiveTarget) => (shareToken ? queryKeys.sharedNotebook(shareToken) : queryKeys.notebook(notebookId));

/** Every filter of the notebook's own log (keys: 'notebook-activity', id, kind, actor). */
const notebookLogKey = (notebookId: string) => activityKeys.notebook(notebookId, null, null).slice(0, 2);

function refreshComments(client: QueryClient, notebookId: string) {
  void client.invalidateQueries({ queryKey: commentKeys.list(notebookId) });
  // A new comment may mention the caller: their own activity list and unread count change too.
  void client.invalidateQueries({ queryKey: activityKeys.mine });
}

const SHARING_KINDS: ReadonlySet<NotebookEventKind> = new Set(['sharing-changed', 'owner-changed', 'link-created', 'link-revoked']);

function refreshAfterChange(client: QueryClient, target: LiveTarget, event: Extract<LiveEvent, { type: 'changed' }>) {
  const { notebookId } = target;
  void client.invalidateQueries({ queryKey: notebookKeyOf(target) });
  void client.invalidateQueries({ queryKey: notebookLogKey(notebookId) });
  if (event.comments) refreshComments(client, notebookId);
  if (event.kind === 'version-saved' || event.kind === 'restored') void client.invalidateQueries({ queryKey: queryKeys.versions(notebookId) });
  if (SHARING_KINDS.has(event.kind)) void client.invalidateQueries({ queryKey: queryKeys.sharing(notebookId) });
}

function refreshEverything(client: QueryClient, target: LiveTarget) {
  const { notebookId } = target;
  void client.invalidateQueries({ queryKey: notebookKeyOf(target) });
  void client.invalidateQueries({ queryKey: notebookLogKey(notebookId) });
  refreshComments(client, notebookId);
}

/** The cached notebook takes the new role at once (editing controls follow canEdit); the refetch confirms it. */
function applyRole(client: QueryClient, notebookId: string, role: NotebookRole) {
  client.setQueryData<NotebookDetail>(queryKeys.notebook(notebookId), (notebook) => (notebook ? { ...notebook, role, canEdit: can(role, 'edit') } : notebook));
  void client.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
  void client.invalidateQueries({ queryKey: queryKeys.notebooks });
}

function roleChanged(client: QueryClient, notebookId: string, role: NotebookRole): boolean {
  const cached = client.getQueryData<NotebookDetail>(queryKeys.notebook(notebookId));
  return cached !== undefined && cached.role !== role;
}

function parseEvent(data: unknown): LiveEvent | null {
  if (typeof data !== 'string') return null;
  try {
    return JSON.parse(data) as LiveEvent;
  } catch {
    return null;
  }
}

interface StreamHandlers {
  onEvent: (event: LiveEvent) => void;
  onOpen: () => void;
  /** closed = the browser will not retry by itself. */
  onError: (closed: boolean) => void;
}

function openStream(target: LiveTarget, handlers: StreamHandlers): EventSource {
  const source = new EventSource(liveEventsUrl(target.notebookId, target.shareToken), { withCredentials: true });
  for (const type of LIVE_EVENT_TYPES) {
    source.addEventListener(type, (message) => {
      const event = parseEvent((message as MessageEvent).data);
      if (event) handlers.onEvent({ ...event, type } as LiveEvent);
    });
  }
  source.onopen = handlers.onOpen;
  source.onerror = () => handlers.onError(source.readyState === EventSource.CLOSED);
  return source;
}

/**
 * Who else is looking at the notebook, who presents it, and the caller's role — kept current by the
 * notebook's event stream, which also refetches the notebook (and its comments) when someone changes it.
 * The browser's EventSource reconnects by itself (the server asks for 3 s); after a reconnect everything
 * is refetched, since events may have been missed. With `shareToken` the page follows the share link's
 * read-only stream (no presence list, no role changes; `revoked` = the link stopped opening anything).
 */
export function useNotebookLive(notebookId: string, { shareToken }: { shareToken?: string } = {}): NotebookLive {
  const client = useQueryClient();
  const [live, setLive] = useState<NotebookLive>(initialLive);

  useEffect(() => {
    const target: LiveTarget = { notebookId, shareToken };
    const ownRole = !shareToken;
    setLive(initialLive);
    // React Native has no EventSource: poll the notebook instead (no presence or presenter there).
    if (typeof globalThis.EventSource !== 'function') {
      setLive({ ...initialLive, connection: 'polling' });
      const timer = setInterval(() => refreshEverything(client, target), LIVE_POLL_MS);
      return () => clearInterval(timer);
    }

    let source: EventSource | null = null;
    let reopenTimer: ReturnType<typeof setTimeout> | null = null;
    let interrupted = false;
    let stopped = false;
    let refusals = 0;
    const stop = () => {
      stopped = true;
      source?.close();
      if (reopenTimer) clearTimeout(reopenTimer);
    };
    const onEvent = (event: LiveEvent) => {
      if (stopped) return;
      switch (event.type) {
        case 'hello':
          if (interrupted) refreshEverything(client, target);
          interrupted = false;
          refusals = 0;
          if (ownRole && roleChanged(client, notebookId, event.role)) applyRole(client, notebookId, event.role);
          setLive((current) => ({ viewers: event.viewers, presenter: event.presenter, role: event.role, connection: 'live', session: current.session + 1 }));
          return;
        case 'changed':
          refreshAfterChange(client, target, event);
          return;
        case 'presence':
          setLive((current) => ({ ...current, viewers: event.viewers }));
          return;
        case 'presenter':
          setLive((current) => ({ ...current, presenter: event.presenter }));
          return;
        case 'role':
          if (ownRole) applyRole(client, notebookId, event.role);
          setLive((current) => ({ ...current, role: event.role }));
          return;
        case 'revoked':
          stop();
          void client.cancelQueries({ queryKey: notebookKeyOf(target) });
          void client.invalidateQueries({ queryKey: queryKeys.notebooks, refetchType: 'none' });
          setLive((current) => ({ ...initialLive, connection: 'revoked', session: current.session }));
      }
    };
    // The stream counts as live from its greeting (hello), which says who presents.
    const onOpen = () => {
      if (stopped) return;
      if (interrupted) refreshEverything(client, target);
      interrupted = false;
    };
    const onError = (closed: boolean) => {
      if (stopped) return;
      interrupted = true;
      setLive((current) => ({ ...current, connection: 'reconnecting' }));
      if (!closed) return;
      // A refused reply (signed out, access gone) ends the stream for good; the refetch shows why, and a later try may succeed.
      source?.close();
      refreshEverything(client, target);
      reopenTimer = setTimeout(connect, Math.min(REOPEN_AFTER_MAX_MS, REOPEN_AFTER_MS * 2 ** refusals));
      refusals += 1;
    };
    const connect = () => {
      if (!stopped) source = openStream(target, { onEvent, onOpen, onError });
    };
    connect();
    return stop;
  }, [client, notebookId, shareToken]);

  return live;
}

const postPresentation = (notebookId: string, cellId: string | null) => apiRequest<unknown>('POST', `/notebooks/${notebookId}/presentation`, { cellId });
const endPresentation = (notebookId: string) => apiRequest<unknown>('DELETE', `/notebooks/${notebookId}/presentation`);

/**
 * While `cellId` is not undefined the caller presents: each new cell is posted (again after each new
 * `session`, since a dropped stream ends the presentation on the server). Leaving (unmount, or `cellId`
 * becoming undefined) ends it — only while `owned` (the stream says the caller is the presenter): anyone who
 * may present can end a presentation, so a presenter who was taken over must not end the new one.
 * Requests are plain calls, not mutations, so the one sent on unmount still goes out.
 */
export function usePresenting(notebookId: string, cellId: string | null | undefined, { session, owned }: { session: number; owned: boolean }): { error: string | null } {
  const [error, setError] = useState<string | null>(null);
  const presenting = cellId !== undefined;
  const mounted = useRef(true);
  const ownedNow = useRef(owned);
  ownedNow.current = owned;
  useEffect(() => {
    mounted.current = true;
    return () => {
      mounted.current = false;
    };
  }, []);
  const report = (failure: unknown) => {
    if (mounted.current) setError(failure instanceof Error ? failure.message : 'Presenting failed.');
  };

  useEffect(() => {
    if (cellId === undefined) return;
    postPresentation(notebookId, cellId).then(() => mounted.current && setError(null), report);
  }, [notebookId, cellId, session]);
  useEffect(() => {
    if (!presenting) return;
    return () => {
      if (ownedNow.current) void endPresentation(notebookId).catch(() => undefined);
    };
  }, [presenting, notebookId]);
  return { error };
}

/** End the caller's presentation now (the Leave button; unmounting ends it too). */
export const stopPresenting = (notebookId: string) => endPresentation(notebookId).catch(() => undefined);
