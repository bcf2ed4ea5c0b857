import { QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { CurrentUser } from '@underfoot/core';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { resetCsrfToken } from '@/lib/api-client';
import { sessionKeys } from '@/lib/auth';
import { createQueryClient } from '@/lib/query-client';
import { json, mockFetch, problem } from '@/test/fetch-mock';
import { createAppRoutes } from './router';

function person(role: CurrentUser['role']): CurrentUser {
  return { id: `id-${role}`, email: `${role}@example.test`, name: `Sam ${role}`, role, companyId: 'c1', companyName: 'Example Drain Co.' };
}

/** A tiny stand-in for the session endpoints: signing out really ends the session. */
function signedInAs(initial: CurrentUser | null) {
  let user = initial;
  const mock = mockFetch({
    'GET /api/auth/me': () => (user ? json({ user }) : problem(401, { code: 'unauthenticated', detail: 'Sign in first.' })),
    'GET /api/auth/csrf': () => json({ token: 't' }),
    'POST /api/auth/sign-out': () => {
      user = null;
      return new Response(null, { status: 204 });
    },
  });
  return { ...mock, endSession: () => (user = null) };
}

function renderAt(path: string) {
  const queryClient = createQueryClient();
  const router = createMemoryRouter(createAppRoutes(queryClient), { initialEntries: [path] });
  render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return Object.assign(router, { queryClient });
}

beforeEach(() => {
  resetCsrfToken();
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('routing and guards', () => {
  it('sends a signed-out person to sign-in, remembering where they were going', async () => {
    signedInAs(null);
    const router = renderAt('/office?tab=queue');

    expect(await screen.findByRole('heading', { level: 1, name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/office?tab=queue')}`);
  });

  it.each([
    ['office', '/office', 'Office'],
    ['inspector', '/field', "Today's jobs"],
    ['agent', '/portal', 'Your reports'],
    ['client', '/portal', 'Your reports'],
  ] as const)('lands a signed-in %s on their own area', async (role, path, heading) => {
    signedInAs(person(role));
    const router = renderAt('/');

    expect(await screen.findByRole('heading', { level: 1, name: heading })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe(path);
  });

  it('tells a person when an area is not available for their account, keeping the header', async () => {
    signedInAs(person('inspector'));
    renderAt('/office');

    expect(await screen.findByRole('heading', { level: 1, name: 'Office is not part of your account' })).toBeInTheDocument();
    expect(screen.getByText('Not available for your account')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: "Go to Today's jobs" })).toHaveAttribute('href', '/field');
    expect(screen.getAllByRole('navigation', { name: 'Main', hidden: true }).length).toBeGreaterThan(0);
  });

  it('sends a signed-in person away from the sign-in page', async () => {
    signedInAs(person('office'));
    const router = renderAt('/sign-in');

    expect(await screen.findByRole('heading', { level: 1, name: 'Office' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/office');
  });

  it('shows a designed page for unknown addresses', async () => {
    signedInAs(null);
    renderAt('/no/such/page');

    expect(await screen.findByRole('heading', { level: 1, name: 'We could not find that page' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Sign in' })).toHaveAttribute('href', '/sign-in');
  });

  it('signs out through the account menu and arrives at a clean sign-in page', async () => {
    const { requests } = signedInAs(person('office'));
    const router = renderAt('/office');
    const ui = userEvent.setup();

    await screen.findByRole('heading', { level: 1, name: 'Office' });
    // The desktop and the mobile menu both exist in the DOM; jsdom applies no media queries.
    const signOutButtons = await screen.findAllByRole('button', { name: 'Sign out', hidden: true });
    await ui.click(signOutButtons[0]!);

    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(requests.find((r) => r.method === 'POST' && r.url === '/api/auth/sign-out')?.headers.get('x-csrf-token')).toBe('t');
    expect(router.state.location.search).toBe('');
    expect(await screen.findByRole('heading', { level: 1, name: 'Sign in' })).toBeInTheDocument();
  });

  it('sends a person whose session ended on the server back to sign-in, remembering the page', async () => {
    const server = signedInAs(person('office'));
    const router = renderAt('/office');
    await screen.findByRole('heading', { level: 1, name: 'Office' });

    server.endSession();
    await router.queryClient.invalidateQueries({ queryKey: sessionKeys.me });

    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/office')}`);
  });
});
