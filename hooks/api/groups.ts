import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { GroupDetail, GroupRole, GroupSummary } from '../../shared/api/schemas';
import { apiRequest } from './client';
import { queryKeys } from './keys';

export function useGroupsQuery() {
  return useQuery({
    queryKey: queryKeys.groups,
    queryFn: async () => (await apiRequest<{ groups: GroupSummary[] }>('GET', '/groups')).groups,
  });
}

export function useGroupQuery(groupId: string) {
  return useQuery({
    queryKey: queryKeys.group(groupId),
    queryFn: async () => (await apiRequest<{ group: GroupDetail }>('GET', `/groups/${groupId}`)).group,
  });
}

function useGroupMutation<Input>(request: (input: Input) => Promise<{ group: GroupDetail }>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: request,
    onSuccess: ({ group }) => {
      queryClient.setQueryData(queryKeys.group(group.id), group);
      void queryClient.invalidateQueries({ queryKey: queryKeys.groups });
    },
  });
}

export const useCreateGroupMutation = () =>
  useGroupMutation((input: { name: string; description: string }) => apiRequest('POST', '/groups', input));

export const useAddMemberMutation = (groupId: string) =>
  useGroupMutation((input: { email: string; role: GroupRole }) => apiRequest('POST', `/groups/${groupId}/members`, input));

export const useChangeMemberRoleMutation = (groupId: string) =>
  useGroupMutation(({ userId, role }: { userId: string; role: GroupRole }) =>
    apiRequest('PATCH', `/groups/${groupId}/members/${userId}`, { role }),
  );

export const useRemoveMemberMutation = (groupId: string) =>
  useGroupMutation((userId: string) => apiRequest('DELETE', `/groups/${groupId}/members/${userId}`));
