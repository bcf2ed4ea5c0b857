/**
 * The session as every part of the app sees it: who is signed in, where they
 * belong, and signing out. Lives in lib/ because every feature needs it.
 */
import { queryOptions, useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { homeAreaOf, type Actor, type CurrentUser, type Role } from '@underfoot/core';
import { api, isApiError, resetCsrfToken } from './api-client';
import { areaHomePaths, areaOfPath } from '@/config/paths';

export const sessionKeys = {
  me: ['session', 'me'] as const,
};

async function fetchCurrentUser(): Promise<CurrentUser | null> {
  try {
    const body = await api.get<{ user: CurrentUser }>('/api/auth/me');
    return body.user;
  } catch (error) {
    // 401 is the ordinary answer for someone who is not signed in.
    if (isApiError(error, 401)) return null;
    throw error;
  }
}

export function currentUserQueryOptions() {
  return queryOptions({
    queryKey: sessionKeys.me,
    queryFn: fetchCurrentUser,
    staleTime: 5 * 60_000,
    meta: { session: true, errorToast: false },
  });
}

/** For loaders: the signed-in person, or null. Uses the cache and refreshes it in the background when stale. */
export function loadCurrentUser(queryClient: QueryClient): Promise<CurrentUser | null> {
  return queryClient.ensureQueryData({ ...currentUserQueryOptions(), revalidateIfStale: true });
}

/** The signed-in person; null when signed out or while the session is being read. */
export function useCurrentUser(): CurrentUser | null {
  const { data } = useQuery(currentUserQueryOptions());
  return data ?? null;
}

/** After sign-in, reset or accepting an invitation: the session is new, so is its CSRF token. */
export function setSignedInUser(queryClient: QueryClient, user: CurrentUser): void {
  resetCsrfToken();
  queryClient.setQueryData(sessionKeys.me, user);
}

/** Drop everything the previous person could see. */
export function clearSession(queryClient: QueryClient): void {
  resetCsrfToken();
  queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== sessionKeys.me[0] });
  queryClient.setQueryData(sessionKeys.me, null);
}

export function useSignOut(options: { onSignedOut?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async () => {
      try {
        await api.post<void>('/api/auth/sign-out');
      } catch (error) {
        // Already signed out on the server (session expired): the outcome is the same.
        if (!isApiError(error, 401)) throw error;
      }
    },
    meta: { session: true },
    onSuccess: () => {
      clearSession(queryClient);
      options.onSignedOut?.();
    },
  });
}

export function homePathOf(role: Role): string {
  return areaHomePaths[homeAreaOf[role]];
}

/** The user as an actor for `can` from core. */
export function actorOf(user: CurrentUser): Actor {
  return { kind: 'user', userId: user.id, role: user.role, companyId: user.companyId };
}

/**
 * Where to go after signing in. Only same-site paths are followed (never
 * "//elsewhere" or "https://…"), and never into another role's area.
 */
export function safeNextPath(next: string | null | undefined, role: Role): string {
  const home = homePathOf(role);
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return home;
  let url: URL;
  try {
    url = new URL(next, 'http://underfoot.invalid');
  } catch {
    return home;
  }
  if (url.origin !== 'http://underfoot.invalid') return home;
  const area = areaOfPath(url.pathname);
  if (area && area !== homeAreaOf[role]) return home;
  return `${url.pathname}${url.search}${url.hash}`;
}
