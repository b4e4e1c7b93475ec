import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PublicUser } from '../../shared/api/schemas';
import { ApiError, apiRequest } from './client';
import { queryKeys } from './keys';

/** The signed-in person, or null when signed out (a 401 is an answer, not an error). */
export function useMeQuery() {
  return useQuery({
    queryKey: queryKeys.me,
    queryFn: async (): Promise<PublicUser | null> => {
      try {
        return (await apiRequest<{ user: PublicUser }>('GET', '/me')).user;
      } catch (error) {
        if (error instanceof ApiError && error.status === 401) return null;
        throw error;
      }
    },
    staleTime: 60_000,
  });
}

function useSessionMutation<Input>(path: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => apiRequest<{ user: PublicUser; notices?: string[] }>('POST', path, input),
    onSuccess: (result) => {
      queryClient.clear();
      queryClient.setQueryData(queryKeys.me, result.user);
    },
  });
}

export const useSignInMutation = () => useSessionMutation<{ email: string; password: string }>('/auth/sign-in');
export const useSignUpMutation = () => useSessionMutation<{ name: string; email: string; password: string }>('/auth/sign-up');

export function useSignOutMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => apiRequest<void>('POST', '/auth/sign-out', {}),
    onSuccess: () => {
      queryClient.clear();
      queryClient.setQueryData(queryKeys.me, null);
    },
  });
}

export function useForgotPasswordMutation() {
  return useMutation({ mutationFn: (input: { email: string }) => apiRequest<{ message: string }>('POST', '/auth/forgot', input) });
}

export function useResetPasswordMutation() {
  return useMutation({
    mutationFn: (input: { token: string; password: string }) => apiRequest<{ message: string }>('POST', '/auth/reset', input),
  });
}
