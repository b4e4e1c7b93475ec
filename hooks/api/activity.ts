import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ActivityReply, NotebookEventKind, NotebookEventView } from '../../shared/notebook/sharing';
import { apiRequest } from './client';

/** How often the navigation asks for the unread count (it also asks when the window regains focus). */
export const ACTIVITY_POLL_MS = 30_000;

export const activityKeys = {
  mine: ['activity', 'mine'] as const,
  notebook: (notebookId: string, kind: NotebookEventKind | null, actorId: string | null) => ['notebook-activity', notebookId, kind ?? 'all', actorId ?? 'anyone'] as const,
};

/** The signed-in person's activity list (mentions, replies, invitations, followed notebooks) and unread count. */
export function useActivityQuery() {
  return useQuery({
    queryKey: activityKeys.mine,
    queryFn: () => apiRequest<ActivityReply>('GET', '/activity'),
    refetchInterval: ACTIVITY_POLL_MS,
    refetchOnWindowFocus: true,
  });
}

/** Mark the given items read, or all of them when `ids` is omitted. */
export function useMarkActivityReadMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (ids?: string[]) => apiRequest<void>('POST', '/activity/read', ids ? { ids } : {}),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: activityKeys.mine }),
  });
}

/** What happened in one notebook, newest first, optionally only one kind or one person's doing. */
export function useNotebookActivityQuery(notebookId: string, { kind = null, actorId = null }: { kind?: NotebookEventKind | null; actorId?: string | null } = {}) {
  return useQuery({
    queryKey: activityKeys.notebook(notebookId, kind, actorId),
    queryFn: async () => {
      const filters = [kind && `kind=${encodeURIComponent(kind)}`, actorId && `actorId=${encodeURIComponent(actorId)}`].filter(Boolean);
      const suffix = filters.length ? `?${filters.join('&')}` : '';
      return (await apiRequest<{ events: NotebookEventView[] }>('GET', `/notebooks/${notebookId}/activity${suffix}`)).events;
    },
    placeholderData: (previous) => previous,
  });
}

const followKey = (notebookId: string) => ['follow', notebookId] as const;

/** Whether changes to the notebook reach my activity list (its owner always follows it). */
export function useFollowingQuery(notebookId: string) {
  return useQuery({
    queryKey: followKey(notebookId),
    queryFn: async () => (await apiRequest<{ following: boolean }>('GET', `/notebooks/${notebookId}/follow`)).following,
  });
}

/** Follow a notebook (its changes land in my activity list) or stop following it. */
export function useFollowNotebookMutation(notebookId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (follow: boolean) => (await apiRequest<{ following: boolean } | undefined>(follow ? 'POST' : 'DELETE', `/notebooks/${notebookId}/follow`))?.following ?? follow,
    onSuccess: (following) => {
      queryClient.setQueryData(followKey(notebookId), following);
      void queryClient.invalidateQueries({ queryKey: activityKeys.mine });
    },
  });
}
