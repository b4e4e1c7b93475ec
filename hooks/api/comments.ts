import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CommentView, MentionCandidate } from '../../shared/notebook/sharing';
import { apiRequest } from './client';

/** Keys of comment queries start with 'comments' (live updates refetch them all when a comment changes). */
export const commentKeys = {
  all: ['comments'] as const,
  list: (notebookId: string) => ['comments', notebookId] as const,
  mentionCandidates: (notebookId: string, search: string) => ['comments', notebookId, 'mention-candidates', search] as const,
};

/** Where a notebook's comments are read and written: its own routes, or a share link's. */
export interface CommentsPlace {
  notebookId: string;
  /** Set when the notebook was opened through a share link. */
  shareToken?: string;
}

const commentsPath = ({ notebookId, shareToken }: CommentsPlace) => (shareToken ? `/shared/${shareToken}/comments` : `/notebooks/${notebookId}/comments`);

/**
 * Every comment of the notebook (roots and replies). `enabled: false` only reads what another view already
 * fetched, so a list of cells can show counts without a request per cell.
 */
export function useCommentsQuery(place: CommentsPlace, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({
    queryKey: commentKeys.list(place.notebookId),
    queryFn: async () => (await apiRequest<{ comments: CommentView[] }>('GET', commentsPath(place))).comments,
    enabled,
  });
}

function useCommentMutation<Input, Reply>(notebookId: string, request: (input: Input) => Promise<Reply>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: request,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: commentKeys.list(notebookId) });
      void queryClient.invalidateQueries({ queryKey: ['notebook-activity', notebookId] });
    },
  });
}

export interface NewComment {
  body: string;
  cellId?: string;
  parentId?: string;
}

export const usePostCommentMutation = (place: CommentsPlace) =>
  useCommentMutation(place.notebookId, (input: NewComment) => apiRequest<{ comment: CommentView }>('POST', commentsPath(place), input));

export const useEditCommentMutation = (notebookId: string) =>
  useCommentMutation(notebookId, ({ commentId, body }: { commentId: string; body: string }) => apiRequest<{ comment: CommentView }>('PATCH', `/comments/${commentId}`, { body }));

export const useResolveCommentMutation = (notebookId: string) =>
  useCommentMutation(notebookId, ({ commentId, resolved }: { commentId: string; resolved: boolean }) => apiRequest<{ comment: CommentView }>('PATCH', `/comments/${commentId}`, { resolved }));

export const useDeleteCommentMutation = (notebookId: string) =>
  useCommentMutation(notebookId, (commentId: string) => apiRequest<void>('DELETE', `/comments/${commentId}`));

/** People with access whose name or handle starts with `search`, for `@` autocomplete. */
export function useMentionCandidatesQuery(notebookId: string, search: string | null) {
  return useQuery({
    queryKey: commentKeys.mentionCandidates(notebookId, search ?? ''),
    queryFn: async () => (await apiRequest<{ people: MentionCandidate[] }>('GET', `/notebooks/${notebookId}/mention-candidates?q=${encodeURIComponent(search ?? '')}`)).people,
    enabled: search !== null,
    staleTime: 60_000,
    placeholderData: keepPreviousData,
  });
}
