import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  AccountNameInput,
  AgentSignUpCompleteInput,
  AgentSignUpInput,
  CurrentUser,
  EmailChangeInput,
  PasswordChangeInput,
} from '@underfoot/core';
import { api } from '@/lib/api-client';
import { sessionKeys, setSignedInUser } from '@/lib/auth';

/** What the API answers; the shapes follow apps/server/src/modules/users (account and sign-up). */

export interface AccountOverview {
  user: CurrentUser;
  emailVerified: boolean;
  pendingEmail: { newEmail: string; expiresAt: string } | null;
  /** Other browsers and devices signed in to this account right now. */
  otherSessions: number;
}

export interface SignUpPage {
  companyId: string;
  companyName: string;
  logoUrl: string | null;
}

export interface SignUpLink {
  email: string;
  name: string;
  companyName: string;
}

export const accountKeys = {
  overview: ['account', 'overview'] as const,
  signUpPage: (companyId: string) => ['sign-up', 'company', companyId] as const,
  signUpLink: (token: string) => ['sign-up', 'link', token] as const,
};

// Forms show their own errors; a 401 on the public pages is an answer, not an expired session.
const formMeta = { errorToast: false } as const;
const publicMeta = { errorToast: false, session: true } as const;

export function accountQueryOptions() {
  return queryOptions({
    queryKey: accountKeys.overview,
    queryFn: () => api.get<AccountOverview>('/api/account'),
  });
}

export function useChangeName() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AccountNameInput) => api.put<{ user: CurrentUser }>('/api/account/name', input).then((b) => b.user),
    meta: formMeta,
    onSuccess: (user) => {
      queryClient.setQueryData(sessionKeys.me, user);
      void queryClient.invalidateQueries({ queryKey: accountKeys.overview });
    },
  });
}

export function useRequestEmailChange() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: EmailChangeInput) => api.post<{ pendingEmail: AccountOverview['pendingEmail'] }>('/api/account/email', input),
    meta: formMeta,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: accountKeys.overview }),
  });
}

export function useConfirmEmailChange() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (token: string) => api.post<{ email: string }>('/api/account/email/confirm', { token }),
    meta: publicMeta,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: sessionKeys.me });
      void queryClient.invalidateQueries({ queryKey: accountKeys.overview });
    },
  });
}

export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: PasswordChangeInput) => api.put<{ otherSessionsEnded: number }>('/api/account/password', input),
    meta: formMeta,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: accountKeys.overview }),
  });
}

export function useSignOutOthers() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<{ ended: number }>('/api/account/sessions/sign-out-others'),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: accountKeys.overview }),
  });
}

// ---------- agents signing themselves up ----------

export function signUpPageQueryOptions(companyId: string) {
  return queryOptions({
    queryKey: accountKeys.signUpPage(companyId),
    queryFn: () => api.get<SignUpPage>(`/api/sign-up/companies/${encodeURIComponent(companyId)}`),
    meta: { errorToast: false },
    staleTime: 5 * 60_000,
  });
}

export function useRequestSignUp(companyId: string) {
  return useMutation({
    mutationFn: (input: AgentSignUpInput) => api.post<{ detail: string }>(`/api/sign-up/companies/${encodeURIComponent(companyId)}`, input),
    meta: publicMeta,
  });
}

export function signUpLinkQueryOptions(token: string) {
  return queryOptions({
    queryKey: accountKeys.signUpLink(token),
    queryFn: () => api.get<SignUpLink>(`/api/sign-up/verify/${encodeURIComponent(token)}`),
    meta: { errorToast: false },
    staleTime: Infinity,
  });
}

export function useCompleteSignUp(options: { onSuccess?: (user: CurrentUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AgentSignUpCompleteInput) => api.post<{ user: CurrentUser }>('/api/sign-up/verify', input).then((b) => b.user),
    meta: publicMeta,
    onSuccess: (user) => {
      setSignedInUser(queryClient, user);
      options.onSuccess?.(user);
    },
  });
}
