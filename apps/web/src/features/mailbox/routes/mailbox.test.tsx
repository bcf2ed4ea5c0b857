import { screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { json, mockFetch, problem } from '@/test/fetch-mock';
import { renderWithProviders } from '@/test/render';
import { MailboxRoute } from './mailbox';

const signedOut = () => problem(401, { code: 'unauthenticated', detail: 'Sign in first.' });

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('MailboxRoute', () => {
  it('says the mailbox exists only in demo mode when the server does not have one', async () => {
    mockFetch({ 'GET /api/auth/me': signedOut });
    renderWithProviders(<MailboxRoute />, { path: '/mailbox' });

    expect(await screen.findByRole('heading', { name: 'The mailbox is only available in demo mode' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Refresh' })).not.toBeInTheDocument();
  });

  it('lists the caught mail and shows the chosen message, HTML sandboxed and text links clickable', async () => {
    mockFetch({
      'GET /api/auth/me': signedOut,
      'GET /api/dev/mailbox': () =>
        json({
          messages: [
            { id: 'm2', from: 'office@example.test', to: ['new@example.test'], subject: 'Your invitation', date: '2026-03-04T10:00:00Z' },
            { id: 'm1', from: 'office@example.test', to: ['b@example.test'], subject: 'Reset your password', date: '2026-03-03T10:00:00Z' },
          ],
        }),
      'GET /api/dev/mailbox/m2': () =>
        json({
          id: 'm2',
          from: 'office@example.test',
          to: ['new@example.test'],
          subject: 'Your invitation',
          date: '2026-03-04T10:00:00Z',
          text: 'Accept it here: http://localhost:3000/invitation?token=abc',
          html: '<p><a href="http://localhost:3000/invitation?token=abc">Accept</a><script>alert(1)</script></p>',
        }),
    });
    renderWithProviders(<MailboxRoute />, { path: '/mailbox?message=m2' });

    const list = await screen.findByRole('navigation', { name: 'Messages' });
    const items = within(list).getAllByRole('link');
    expect(items.map((item) => item.textContent)).toEqual([
      expect.stringContaining('Your invitation'),
      expect.stringContaining('Reset your password'),
    ]);
    expect(items[0]).toHaveAttribute('aria-current', 'true');

    const frame = await screen.findByTitle('Formatted message: Your invitation');
    expect(frame).toHaveAttribute('sandbox', 'allow-popups allow-top-navigation-by-user-activation');
    expect(frame.getAttribute('srcdoc')).toContain('<base target="_top">');

    const link = screen.getByRole('link', { name: 'http://localhost:3000/invitation?token=abc' });
    expect(link).toHaveAttribute('target', '_self');
  });
});
