import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { CurrentUser } from '@underfoot/core';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { resetCsrfToken } from '@/lib/api-client';
import { sessionKeys } from '@/lib/auth';
import { json, mockFetch, problem } from '@/test/fetch-mock';
import { renderWithProviders } from '@/test/render';
import { SignInForm } from './sign-in-form';

const user: CurrentUser = {
  id: 'u1',
  email: 'dana@example.test',
  name: 'Dana Reyes',
  role: 'inspector',
  companyId: 'c1',
  companyName: 'Example Drain Co.',
};

beforeEach(() => {
  resetCsrfToken();
});

afterEach(() => {
  vi.unstubAllGlobals();
});

async function fillAndSubmit(email: string, password: string) {
  const person = userEvent.setup();
  await person.type(screen.getByLabelText('E-mail address'), email);
  await person.type(screen.getByLabelText('Password'), password);
  await person.click(screen.getByRole('button', { name: 'Sign in' }));
  return person;
}

describe('SignInForm', () => {
  it('puts the server’s field errors on the fields and its detail in the form alert', async () => {
    mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/auth/sign-in': () =>
        problem(400, {
          code: 'validation_failed',
          detail: 'Some of the details need another look.',
          errors: [
            { path: 'email', message: 'This address cannot sign in here.' },
            { path: 'captcha', message: 'Prove you are a person.' },
          ],
        }),
    });
    const onSignedIn = vi.fn();
    renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    await fillAndSubmit('dana@example.test', 'correct horse battery');

    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('Some of the details need another look.');
    // A message for a field this form does not have still reaches the person.
    expect(alert).toHaveTextContent('Prove you are a person.');

    const email = screen.getByLabelText('E-mail address');
    expect(email).toHaveAttribute('aria-invalid', 'true');
    expect(email).toHaveAccessibleDescription('This address cannot sign in here.');
    expect(screen.getByLabelText('Password')).not.toHaveAttribute('aria-invalid');
    expect(onSignedIn).not.toHaveBeenCalled();
  });

  it('shows the invalid-credentials message and clears the password', async () => {
    mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/auth/sign-in': () => problem(401, { code: 'invalid_credentials', detail: 'E-mail or password is incorrect.' }),
    });
    const onSignedIn = vi.fn();
    const { queryClient } = renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    await fillAndSubmit('dana@example.test', 'wrong password');

    expect(await screen.findByRole('alert')).toHaveTextContent('E-mail or password is incorrect.');
    expect(screen.getByLabelText('Password')).toHaveValue('');
    expect(screen.getByLabelText('E-mail address')).toHaveValue('dana@example.test');
    expect(onSignedIn).not.toHaveBeenCalled();
    expect(queryClient.getQueryData(sessionKeys.me)).toBeUndefined();
  });

  it('shows the rate-limit detail from the server', async () => {
    mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/auth/sign-in': () => problem(429, { code: 'rate_limited', detail: 'Too many attempts. Try again in 15 minutes.' }),
    });
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    await fillAndSubmit('dana@example.test', 'whatever it is');

    expect(await screen.findByRole('alert')).toHaveTextContent('Too many attempts. Try again in 15 minutes.');
  });

  it('checks the fields with the shared schema before asking the server', async () => {
    const { requests } = mockFetch({});
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    await userEvent.setup().click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Enter an e-mail address.')).toBeInTheDocument();
    expect(screen.getByText('Enter your password.')).toBeInTheDocument();
    expect(requests.filter((r) => r.url === '/api/auth/sign-in')).toHaveLength(0);
  });

  it('signs in with the normalised address, with the CSRF token, and stores the session', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/csrf': () => json({ token: 'csrf-123' }),
      'POST /api/auth/sign-in': () => json({ user }),
    });
    const onSignedIn = vi.fn();
    const { queryClient } = renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    await fillAndSubmit('  Dana@Example.TEST ', 'correct horse battery');

    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(user));
    const signIn = requests.find((r) => r.url === '/api/auth/sign-in');
    expect(signIn?.body).toEqual({ email: 'dana@example.test', password: 'correct horse battery' });
    expect(signIn?.headers.get('x-csrf-token')).toBe('csrf-123');
    expect(queryClient.getQueryData(sessionKeys.me)).toEqual(user);
  });
});
