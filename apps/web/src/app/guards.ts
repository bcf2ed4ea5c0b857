/**
 * Route loaders that decide who may see what before any screen code loads,
 * so a person never downloads an area that is not theirs.
 */
import type { QueryClient } from '@tanstack/react-query';
import { homeAreaOf } from '@underfoot/core';
import { data, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { paths, type Area } from '@/config/paths';
import { homePathOf, loadCurrentUser, safeNextPath } from '@/lib/auth';

/** The payload of the 403 shown when someone opens another role's area. */
export interface WrongAreaData {
  kind: 'wrong-area';
  area: Area;
}

export function isWrongAreaData(value: unknown): value is WrongAreaData {
  return typeof value === 'object' && value !== null && (value as WrongAreaData).kind === 'wrong-area';
}

function here(request: Request): string {
  const url = new URL(request.url);
  return `${url.pathname}${url.search}`;
}

/** `/`: straight to the person's own area, or to sign-in. */
export function homeLoader(queryClient: QueryClient) {
  return async () => {
    const user = await loadCurrentUser(queryClient);
    return redirect(user ? homePathOf(user.role) : paths.auth.signIn.getHref());
  };
}

/** Pages behind sign-in. */
export function requireUserLoader(queryClient: QueryClient) {
  return async ({ request }: LoaderFunctionArgs) => {
    const user = await loadCurrentUser(queryClient);
    if (!user) throw redirect(paths.auth.signIn.getHref(here(request)));
    return null;
  };
}

/** One role's area: anyone else gets the "not available for your account" page. */
export function requireAreaLoader(queryClient: QueryClient, area: Area) {
  return async ({ request }: LoaderFunctionArgs) => {
    const user = await loadCurrentUser(queryClient);
    if (!user) throw redirect(paths.auth.signIn.getHref(here(request)));
    if (homeAreaOf[user.role] !== area) {
      throw data({ kind: 'wrong-area', area } satisfies WrongAreaData, { status: 403 });
    }
    return null;
  };
}

/** Sign-in and forgotten password make no sense when signed in: go on to where the person was heading. */
export function signedOutOnlyLoader(queryClient: QueryClient) {
  return async ({ request }: LoaderFunctionArgs) => {
    const user = await loadCurrentUser(queryClient);
    if (user) throw redirect(safeNextPath(new URL(request.url).searchParams.get('next'), user.role));
    return null;
  };
}
