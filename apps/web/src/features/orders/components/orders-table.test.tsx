import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { json, mockFetch } from '@/test/fetch-mock';
import { renderWithProviders } from '@/test/render';
import type { OrderListItem } from '../api';
import { DaysLeft, daysLeftText, deadlineUrgency } from './days-left';
import { OrdersTable } from './orders-table';

afterEach(() => {
  vi.unstubAllGlobals();
});

function listItem(overrides: Partial<OrderListItem>): OrderListItem {
  return {
    id: 'o1',
    kind: 'pre_purchase',
    status: 'requested',
    address: '418 Larkspur Lane, Alder Falls, OR 97035',
    street: '418 Larkspur Lane',
    city: 'Alder Falls',
    contingencyDeadline: '2027-03-14',
    daysLeft: 10,
    paymentState: 'unpaid',
    payer: 'agent_now',
    feeTotalCents: 32500,
    inspectorName: null,
    window: null,
    createdAt: '2027-03-01T17:00:00.000Z',
    grade: null,
    ...overrides,
  };
}

describe('days left to the deadline', () => {
  it.each([
    [10, 'later', '10 days left'],
    [4, 'later', '4 days left'],
    [3, 'soon', '3 days left'],
    [1, 'soon', '1 day left'],
    [0, 'soon', 'today'],
    [-1, 'passed', 'passed'],
  ] as const)('%i days reads as %s (“%s”)', (days, urgency, text) => {
    expect(deadlineUrgency(days, 'requested')).toBe(urgency);
    expect(daysLeftText(days)).toBe(text);
  });

  it('stops racing the deadline once the order is finished or cancelled', () => {
    expect(deadlineUrgency(-5, 'published')).toBe('settled');
    expect(deadlineUrgency(1, 'cancelled')).toBe('settled');
  });

  it('highlights three days or fewer and says "passed" when the deadline is gone', () => {
    const { rerender } = render(<DaysLeft daysLeft={2} status="scheduled" />);
    expect(screen.getByText('2 days left')).toHaveAttribute('data-urgency', 'soon');
    rerender(<DaysLeft daysLeft={-3} status="scheduled" />);
    expect(screen.getByText('Deadline passed')).toHaveAttribute('data-urgency', 'passed');
    rerender(<DaysLeft daysLeft={12} status="scheduled" />);
    expect(screen.getByText('12 days left')).toHaveAttribute('data-urgency', 'later');
  });
});

describe('OrdersTable', () => {
  it('renders each order with its days left, payment and a dash for the grade, and sorts on the server', async () => {
    const { requests } = mockFetch({
      'GET /api/orders': () =>
        json({
          total: 2,
          orders: [
            listItem({ id: 'a', street: '418 Larkspur Lane', daysLeft: 2 }),
            listItem({
              id: 'b',
              street: '77 Quarry Road',
              status: 'scheduled',
              daysLeft: -1,
              paymentState: 'paid',
              inspectorName: 'Marco Ruiz',
              window: { date: '2027-03-05', startTime: '08:00', endTime: '10:00' },
            }),
          ],
        }),
    });
    renderWithProviders(<OrdersTable area="portal" label="Your orders" emptyState={<p>No orders</p>} />, { path: '/portal' });

    const table = await screen.findByRole('table', { name: 'Your orders' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(within(rows[0]!).getByText('2 days left')).toHaveAttribute('data-urgency', 'soon');
    expect(within(rows[0]!).getByText('Not published yet')).toBeInTheDocument();
    expect(within(rows[0]!).getByRole('link', { name: '418 Larkspur Lane' })).toHaveAttribute('href', '/portal/orders/a');
    expect(within(rows[1]!).getByText('Deadline passed')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('Paid')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('Marco Ruiz')).toBeInTheDocument();

    // By default what still needs doing comes first: no column is the sort then.
    const first = new URL(requests[0]!.url, 'http://x');
    expect(first.searchParams.get('sort')).toBe('attention');
    expect(within(table).getByRole('columnheader', { name: /Deadline/ })).not.toHaveAttribute('aria-sort', 'ascending');

    const user = userEvent.setup();
    await user.click(within(table).getByRole('button', { name: /Deadline/ }));
    await vi.waitFor(() => {
      const last = new URL(requests.at(-1)!.url, 'http://x');
      expect(last.searchParams.get('sort')).toBe('deadline');
      expect(last.searchParams.get('direction')).toBe('asc');
    });
    expect(within(table).getByRole('columnheader', { name: /Deadline/ })).toHaveAttribute('aria-sort', 'ascending');
    await user.click(within(table).getByRole('button', { name: /Address/ }));
    await vi.waitFor(() => {
      const last = new URL(requests.at(-1)!.url, 'http://x');
      expect(last.searchParams.get('sort')).toBe('address');
    });
  });

  it('goes back to "open first" from the sort menu', async () => {
    const { requests } = mockFetch({ 'GET /api/orders': () => json({ total: 30, orders: [listItem({})] }) });
    renderWithProviders(<OrdersTable area="portal" label="Your orders" emptyState={<p>No orders</p>} />, {
      path: '/portal?sort=created&dir=desc',
    });
    await screen.findByRole('table', { name: 'Your orders' });
    expect(new URL(requests[0]!.url, 'http://x').searchParams.get('sort')).toBe('created');
    await userEvent.setup().selectOptions(screen.getByLabelText('Sort by'), 'Open first, nearest deadline');
    await vi.waitFor(() => expect(new URL(requests.at(-1)!.url, 'http://x').searchParams.get('sort')).toBe('attention'));
  });

  it('asks the server with the address search once typing pauses', async () => {
    const { requests } = mockFetch({ 'GET /api/orders': () => json({ total: 30, orders: [listItem({})] }) });
    renderWithProviders(<OrdersTable area="office" label="All orders" emptyState={<p>No orders</p>} />, { path: '/office/orders' });
    await screen.findByRole('table', { name: 'All orders' });

    await userEvent.setup().type(screen.getByLabelText('Search by address'), 'lark');
    await vi.waitFor(() => {
      const searched = requests.map((r) => new URL(r.url, 'http://x').searchParams.get('q')).filter(Boolean);
      // One request for the whole word, not one per letter.
      expect(searched).toEqual(['lark']);
    });

    await userEvent.setup().selectOptions(screen.getByLabelText('Status'), 'scheduled');
    await vi.waitFor(() => {
      const last = new URL(requests.at(-1)!.url, 'http://x').searchParams;
      expect(last.getAll('status')).toEqual(['scheduled']);
      expect(last.get('q')).toBe('lark');
    });
  });

  it('keeps a short list plain: search and filters appear once there are more orders', async () => {
    mockFetch({ 'GET /api/orders': () => json({ total: 2, orders: [listItem({ id: 'a' }), listItem({ id: 'b' })] }) });
    renderWithProviders(<OrdersTable area="portal" label="Your orders" emptyState={<p>No orders</p>} />);
    await screen.findByRole('table', { name: 'Your orders' });
    expect(screen.queryByLabelText('Search by address')).not.toBeInTheDocument();
  });

  it('shows the empty state when the person has no orders at all', async () => {
    mockFetch({ 'GET /api/orders': () => json({ total: 0, orders: [] }) });
    renderWithProviders(<OrdersTable area="portal" label="Your orders" emptyState={<p>Nothing ordered yet</p>} />);
    expect(await screen.findByText('Nothing ordered yet')).toBeInTheDocument();
    expect(screen.queryByRole('table')).not.toBeInTheDocument();
  });
});
