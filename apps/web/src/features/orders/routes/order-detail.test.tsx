import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { CurrentUser } from '@underfoot/core';
import { Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { resetCsrfToken } from '@/lib/api-client';
import { json, mockFetch, problem } from '@/test/fetch-mock';
import { renderWithProviders } from '@/test/render';
import type { OrderDetail } from '../api';
import { PayButton } from '../components/pay-button';
import { OrderDetailRoute } from './order-detail';

const agent: CurrentUser = {
  id: 'u-agent',
  email: 'theo@example.test',
  name: 'Theo Lindqvist',
  role: 'agent',
  companyId: 'c1',
  companyName: 'Example Drain Co.',
};

function order(overrides: Partial<OrderDetail> = {}): OrderDetail {
  return {
    id: 'o1',
    kind: 'pre_purchase',
    orderingSide: 'buyer',
    status: 'requested',
    contingencyDeadline: '2027-03-14',
    daysLeft: 12,
    preferredDates: [],
    payer: 'agent_now',
    feeTotalCents: 41000,
    paymentState: 'unpaid',
    property: {
      street: '52 Thistledown Court',
      unit: '',
      city: 'Alder Falls',
      region: 'OR',
      postalCode: '97411',
      address: '52 Thistledown Court, Alder Falls, OR 97411',
      yearBuilt: 1948,
      propertyType: 'single_family',
      occupancy: 'occupied',
      accessNotes: 'Cleanout in the side yard.',
    },
    inspector: null,
    window: null,
    note: '',
    cancelReason: null,
    createdAt: '2027-03-01T17:00:00.000Z',
    feeLines: [
      { name: 'Sewer line camera inspection', priceCents: 32500 },
      { name: 'Locating and depth readings', priceCents: 8500 },
    ],
    parties: [{ userId: 'u-agent', name: 'Theo Lindqvist', partyRole: 'buyers_agent', active: true }],
    history: [],
    payment: null,
    yourPartyRoles: ['buyers_agent'],
    allowed: { schedule: false, cancel: true, pay: true, recordInspection: false, finishRecording: false },
    ...overrides,
  };
}

function renderOrderPage(path: string) {
  return renderWithProviders(
    <Routes>
      <Route path="/portal/orders/:orderId" element={<OrderDetailRoute />} />
    </Routes>,
    { path },
  );
}

beforeEach(() => {
  resetCsrfToken();
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('order page', () => {
  it('back from the checkout, keeps asking until the webhook has marked the order paid', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/me': () => json({ user: agent }),
      'GET /api/orders/o1': [
        () => json({ order: order() }),
        () =>
          json({
            order: order({
              paymentState: 'paid',
              allowed: { schedule: false, cancel: true, pay: false, recordInspection: false, finishRecording: false },
            }),
          }),
      ],
    });
    renderOrderPage('/portal/orders/o1?payment=success');

    expect(await screen.findByText('Confirming your payment…')).toBeInTheDocument();
    // The next poll (about a second later) brings the paid order.
    expect(await screen.findByText('Payment received', {}, { timeout: 3000 })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Pay now/ })).not.toBeInTheDocument();
    const polls = requests.filter((r) => r.url === '/api/orders/o1').length;
    expect(polls).toBeGreaterThanOrEqual(2);

    // Once paid, it stops asking.
    await new Promise((r) => setTimeout(r, 1300));
    expect(requests.filter((r) => r.url === '/api/orders/o1').length).toBe(polls);
  });

  it('says nothing was charged when the payer declined on the checkout page, and offers to pay again', async () => {
    mockFetch({
      'GET /api/auth/me': () => json({ user: agent }),
      'GET /api/orders/o1': () => json({ order: order() }),
    });
    renderOrderPage('/portal/orders/o1?payment=cancelled');

    expect(await screen.findByText('Payment not completed')).toBeInTheDocument();
    expect(screen.getByText(/Nothing was charged/)).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Pay now · $410.00' })).toBeInTheDocument();
  });

  it('shows "not found" for an order the person may not see', async () => {
    mockFetch({
      'GET /api/auth/me': () => json({ user: agent }),
      'GET /api/orders/o2': () => problem(404, { code: 'not_found', detail: 'We could not find that order.' }),
    });
    renderOrderPage('/portal/orders/o2');
    expect(await screen.findByRole('heading', { level: 1, name: 'We could not find that order' })).toBeInTheDocument();
  });
});

describe('PayButton', () => {
  it('explains a payment provider outage, and "Try again" opens the checkout once it answers', async () => {
    mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/orders/o1/checkout': [
        () =>
          problem(502, {
            code: 'payment_provider_unavailable',
            detail: 'The payment service is not answering right now. Nothing was charged; please try again in a minute.',
          }),
        () => json({ url: 'http://127.0.0.1:9/checkout/cs_1' }),
      ],
    });
    const leaveFor = vi.fn();
    renderWithProviders(<PayButton orderId="o1" amountCents={41000} leaveFor={leaveFor} />);
    const ui = userEvent.setup();

    await ui.click(screen.getByRole('button', { name: 'Pay now · $410.00' }));
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('The payment page could not be opened');
    expect(alert).toHaveTextContent('Nothing was charged');
    expect(leaveFor).not.toHaveBeenCalled();

    await ui.click(screen.getByRole('button', { name: 'Try again' }));
    await waitFor(() => expect(leaveFor).toHaveBeenCalledWith('http://127.0.0.1:9/checkout/cs_1'));
  });
});
