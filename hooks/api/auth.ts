import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ChangeEmailInput, ChangeNameInput, ChangePasswordInput, EmailChanged, EmailChangeStarted, EndedSessions, PasswordChanged, SessionList } from '../../shared/api/account';
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

/** Account settings: name, password, e-mail address and sessions of the signed-in person. */
const sessionsKey = [...queryKeys.me, 'sessions'] as const;

export function useChangeNameMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ChangeNameInput) => apiRequest<{ user: PublicUser }>('PATCH', '/me', input),
    onSuccess: (result) => queryClient.setQueryData(queryKeys.me, result.user),
  });
}

/** Ends every other session of the account; the reply says how many. */
export function useChangePasswordMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ChangePasswordInput) => apiRequest<PasswordChanged>('POST', '/me/password', input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sessionsKey }),
  });
}

/** Only e-mails a link to the new address: the address changes when the link is opened. */
export function useChangeEmailMutation() {
  return useMutation({ mutationFn: (input: ChangeEmailInput) => apiRequest<EmailChangeStarted>('POST', '/me/email', input) });
}

export function useConfirmEmailChangeMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (token: string) => apiRequest<EmailChanged>('POST', '/auth/email-change/confirm', { token }),
    // The link may have been opened while signed in as someone else: ask who is signed in rather than assume.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.me }),
  });
}

export function useSessionsQuery() {
  return useQuery({
    queryKey: sessionsKey,
    queryFn: async () => (await apiRequest<SessionList>('GET', '/me/sessions')).sessions,
  });
}

export function useEndSessionMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (sessionId: string) => apiRequest<EndedSessions>('DELETE', `/me/sessions/${encodeURIComponent(sessionId)}`),
    onSettled: () => queryClient.invalidateQueries({ queryKey: sessionsKey }),
  });
}

export function useEndOtherSessionsMutation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => apiRequest<EndedSessions>('POST', '/me/sessions/end-others', {}),
    onSettled: () => queryClient.invalidateQueries({ queryKey: sessionsKey }),
  });
}
