import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { NotebookDetail } from '../../shared/notebook';
import type { CreatedShareLink, GrantableRole, LinkRole, SharingView } from '../../shared/notebook/sharing';
import { ApiError, apiRequest } from './client';
import { queryKeys } from './keys';

export type NewMember = { email: string; role: GrantableRole } | { groupId: string; role: GrantableRole };

/** Who holds which role on the notebook, pending invitations and share links (links only for those who manage sharing). */
export function useSharingQuery(notebookId: string) {
  return useQuery({
    queryKey: queryKeys.sharing(notebookId),
    queryFn: () => apiRequest<SharingView>('GET', `/notebooks/${notebookId}/members`),
  });
}

/** After any sharing change: the panel, the notebook (the caller's own role may have changed) and the lists. */
function useRefreshSharing(notebookId: string) {
  const queryClient = useQueryClient();
  return (view?: SharingView) => {
    if (view) queryClient.setQueryData(queryKeys.sharing(notebookId), view);
    else void queryClient.invalidateQueries({ queryKey: queryKeys.sharing(notebookId) });
    void queryClient.invalidateQueries({ queryKey: queryKeys.notebook(notebookId) });
    void queryClient.invalidateQueries({ queryKey: ['notebooks', 'list'] });
  };
}

function useSharingMutation<Input>(notebookId: string, request: (input: Input) => Promise<SharingView | void>) {
  const refresh = useRefreshSharing(notebookId);
  return useMutation({ mutationFn: request, onSuccess: (view) => refresh(view ?? undefined) });
}

/** A person by address (invited when they have no account yet) or one of my groups. */
export const useAddMemberMutation = (notebookId: string) =>
  useSharingMutation(notebookId, (input: NewMember) => apiRequest<SharingView>('POST', `/notebooks/${notebookId}/members`, input));

export const useChangeMemberRoleMutation = (notebookId: string) =>
  useSharingMutation(notebookId, ({ memberId, role }: { memberId: string; role: GrantableRole }) =>
    apiRequest<SharingView>('PATCH', `/notebooks/${notebookId}/members/${memberId}`, { role }),
  );

export const useRemoveMemberMutation = (notebookId: string) =>
  useSharingMutation(notebookId, (memberId: string) => apiRequest<void>('DELETE', `/notebooks/${notebookId}/members/${memberId}`));

/**
 * Give up one's own grant. The reply is the panel when access remains (through a group), nothing when none
 * is left: then the notebook is only dropped from the lists (the page moves away; refetching it would fail).
 */
export function useLeaveNotebookMutation(notebookId: string) {
  const queryClient = useQueryClient();
  const refresh = useRefreshSharing(notebookId);
  return useMutation({
    mutationFn: (memberId: string) => apiRequest<SharingView | undefined>('DELETE', `/notebooks/${notebookId}/members/${memberId}`),
    onSuccess: (view) => {
      if (view) refresh(view);
      else void queryClient.invalidateQueries({ queryKey: ['notebooks', 'list'] });
    },
  });
}

export const useCancelInvitationMutation = (notebookId: string) =>
  useSharingMutation(notebookId, (invitationId: string) => apiRequest<void>('DELETE', `/notebooks/${notebookId}/invitations/${invitationId}`));

/** The new owner must already hold a role; the former owner becomes an editor. */
export const useTransferOwnershipMutation = (notebookId: string) =>
  useSharingMutation(notebookId, async (userId: string) => {
    await apiRequest<unknown>('POST', `/notebooks/${notebookId}/owner`, { userId });
  });

/** The reply carries the token once; only its hash is kept on the server. */
export function useCreateShareLinkMutation(notebookId: string) {
  const refresh = useRefreshSharing(notebookId);
  return useMutation({
    mutationFn: (input: { role: LinkRole; expiresAt?: string }) => apiRequest<CreatedShareLink>('POST', `/notebooks/${notebookId}/links`, input),
    onSuccess: () => refresh(),
  });
}

export const useRevokeShareLinkMutation = (notebookId: string) =>
  useSharingMutation(notebookId, (linkId: string) => apiRequest<void>('DELETE', `/notebooks/${notebookId}/links/${linkId}`));

export const isUnknownLink = (error: unknown) => error instanceof ApiError && (error.status === 404 || error.status === 400);

/** The notebook behind a share link, read-only; works signed out. */
export function useSharedNotebookQuery(token: string, enabled = true) {
  return useQuery({
    queryKey: queryKeys.sharedNotebook(token),
    enabled,
    queryFn: async () => (await apiRequest<{ notebook: NotebookDetail }>('GET', `/shared/${encodeURIComponent(token)}`)).notebook,
    retry: (failures, error) => !isUnknownLink(error) && failures < 1,
  });
}
