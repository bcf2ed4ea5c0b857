import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  CurrentUser,
  InvitationAcceptInput,
  PasswordResetCompleteInput,
  PasswordResetRequestInput,
  Role,
  SignInInput,
} from '@underfoot/core';
import { api } from '@/lib/api-client';
import { setSignedInUser } from '@/lib/auth';

export interface Invitation {
  email: string;
  name: string;
  role: Role;
  companyName: string;
}

export const authKeys = {
  invitation: (token: string) => ['auth', 'invitation', token] as const,
};

// Forms show their own errors (fields + alert), so no toast; a 401 here is an answer, not an expired session.
const formMeta = { errorToast: false, session: true } as const;

export function signIn(input: SignInInput) {
  return api.post<{ user: CurrentUser }>('/api/auth/sign-in', input).then((body) => body.user);
}

export function useSignIn(options: { onSuccess?: (user: CurrentUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    meta: formMeta,
    onSuccess: (user) => {
      setSignedInUser(queryClient, user);
      options.onSuccess?.(user);
    },
  });
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (input: PasswordResetRequestInput) => api.post<void>('/api/auth/password-reset', input),
    meta: formMeta,
  });
}

export function useCompletePasswordReset(options: { onSuccess?: (user: CurrentUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: PasswordResetCompleteInput) =>
      api.post<{ user: CurrentUser }>('/api/auth/password-reset/complete', input).then((body) => body.user),
    meta: formMeta,
    onSuccess: (user) => {
      setSignedInUser(queryClient, user);
      options.onSuccess?.(user);
    },
  });
}

export function invitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: authKeys.invitation(token),
    queryFn: () => api.get<Invitation>(`/api/auth/invitations/${encodeURIComponent(token)}`),
    // The page explains an expired or used link itself.
    meta: { errorToast: false },
    staleTime: Infinity,
  });
}

export function useAcceptInvitation(options: { onSuccess?: (user: CurrentUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: InvitationAcceptInput) =>
      api.post<{ user: CurrentUser }>('/api/auth/invitations/accept', input).then((body) => body.user),
    meta: formMeta,
    onSuccess: (user) => {
      setSignedInUser(queryClient, user);
      options.onSuccess?.(user);
    },
  });
}
