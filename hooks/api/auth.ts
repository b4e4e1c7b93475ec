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
    mutationFn: (input: Input) => apiRequest<{ user: PublicUser }>('POST', path, input),
    onSuccess: (result) => {
      queryClient.clear();
      queryClient.setQueryData(queryKeys.me, result.user);
    },
  });
}

/** An account whose address is not confirmed yet is refused like a wrong password: it signs in through the e-mailed link. */
export const useSignInMutation = () => useSessionMutation<{ email: string; password: string }>('/auth/sign-in');
/** Verifying the address from the e-mailed link, with the account's password, signs its owner in. */
export const useVerifyEmailMutation = () => useSessionMutation<{ token: string; password: string }>('/auth/verify');

/** Sign-up starts no session: the reply only says to check the inbox (the same for a taken address). */
export function useSignUpMutation() {
  return useMutation({
    mutationFn: (input: { name: string; email: string; password: string }) => apiRequest<{ message: string }>('POST', '/auth/sign-up', input),
  });
}

/** A fresh confirmation link for an account waiting for confirmation; the reply is the same for any address. */
export function useResendVerificationMutation() {
  return useMutation({ mutationFn: (input: { email: string }) => apiRequest<{ message: string }>('POST', '/auth/verify/resend', input) });
}

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
