import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { resetCsrfToken } from '@/lib/api-client';
import { json, mockFetch, problem, type RecordedRequest } from '@/test/fetch-mock';
import { renderWithProviders } from '@/test/render';
import type { FeeListItem, OrderDetail } from '../api';
import { OrderForm } from './order-form';
import { addDaysIso, localTodayIso } from './order-format';

const feeList: FeeListItem[] = [
  { id: 'base', kind: 'base', name: 'Sewer line camera inspection', description: '', priceCents: 32500, active: true },
  { id: 'locate', kind: 'add_on', name: 'Line locating and depth marks', description: '', priceCents: 9500, active: true },
  { id: 'rush', kind: 'add_on', name: 'Next-day report', description: '', priceCents: 5000, active: true },
];

const placedOrder = { id: 'o1', allowed: { pay: true, cancel: true, schedule: false } } as OrderDetail;

beforeEach(() => {
  resetCsrfToken();
});

afterEach(() => {
  vi.unstubAllGlobals();
});

async function fillValidOrder(ui: ReturnType<typeof userEvent.setup>, overrides: { postalCode?: string; deadline?: string } = {}) {
  await ui.type(screen.getByLabelText('Street address'), '418 Larkspur Lane');
  await ui.type(screen.getByLabelText('City'), 'Alder Falls');
  await ui.type(screen.getByLabelText('State or region'), 'OR');
  await ui.type(screen.getByLabelText('Postal code'), overrides.postalCode ?? '97035');
  await ui.type(screen.getByLabelText(/Year built/), '1962');
  await ui.selectOptions(screen.getByLabelText(/Property type/), 'single_family');
  await ui.click(screen.getByRole('radio', { name: /^Occupied/ }));
  await ui.type(screen.getByLabelText('Contingency deadline', { exact: false }), overrides.deadline ?? addDaysIso(localTodayIso(), 30));
  await ui.type(screen.getByLabelText("The buyer's name"), 'Avery Quinn');
  await ui.type(screen.getByLabelText("The buyer's e-mail"), 'avery.quinn@example.com');
  await ui.click(screen.getByRole('radio', { name: /I pay now by card/ }));
}

const posts = (requests: RecordedRequest[]) => requests.filter((r) => r.method === 'POST' && r.url === '/api/orders');

describe('OrderForm', () => {
  it('adds the chosen add-ons to the base fee in the running total', async () => {
    mockFetch({ 'GET /api/fee-list': () => json({ items: feeList }) });
    renderWithProviders(<OrderForm canPayNow onPlaced={vi.fn()} />);
    const ui = userEvent.setup();

    const total = await screen.findByTestId('order-total');
    expect(total).toHaveTextContent('$325.00');
    await ui.click(screen.getByRole('checkbox', { name: /Line locating/ }));
    expect(total).toHaveTextContent('$420.00');
    await ui.click(screen.getByRole('checkbox', { name: /Next-day report/ }));
    expect(total).toHaveTextContent('$470.00');
  });

  it('shows the schema’s errors for a bad postal code and a past deadline, and sends nothing', async () => {
    const { requests } = mockFetch({ 'GET /api/fee-list': () => json({ items: feeList }) });
    const onPlaced = vi.fn();
    renderWithProviders(<OrderForm canPayNow onPlaced={onPlaced} />);
    const ui = userEvent.setup();
    await screen.findByTestId('order-total');

    await fillValidOrder(ui, { postalCode: '#', deadline: addDaysIso(localTodayIso(), -2) });
    await ui.click(screen.getByRole('button', { name: 'Place the order' }));

    expect(await screen.findByText('Enter a postal code, like 97035.')).toBeInTheDocument();
    expect(screen.getByText('The deadline must be after today.')).toBeInTheDocument();
    expect(screen.getByLabelText('Postal code')).toHaveAttribute('aria-invalid', 'true');
    expect(posts(requests)).toHaveLength(0);
    expect(onPlaced).not.toHaveBeenCalled();
  });

  it('puts the server’s nested field errors on the matching fields', async () => {
    const { requests } = mockFetch({
      'GET /api/fee-list': () => json({ items: feeList }),
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/orders': () =>
        problem(400, {
          code: 'validation_failed',
          detail: 'Some fields need attention.',
          errors: [
            { path: 'parties.0.email', message: 'This address cannot be added to an order here.' },
            { path: 'property.address.street', message: 'We could not find this street.' },
            { path: 'paymentPlan', message: 'Payment plans are not offered.' },
          ],
        }),
    });
    renderWithProviders(<OrderForm canPayNow onPlaced={vi.fn()} />);
    const ui = userEvent.setup();
    await screen.findByTestId('order-total');

    await fillValidOrder(ui);
    await ui.click(screen.getByRole('button', { name: 'Place the order' }));

    expect(await screen.findByText('This address cannot be added to an order here.')).toBeInTheDocument();
    expect(screen.getByLabelText("The buyer's e-mail")).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByLabelText('Street address')).toHaveAttribute('aria-invalid', 'true');
    const alert = screen.getByRole('alert');
    expect(alert).toHaveTextContent('Some fields need attention.');
    expect(alert).toHaveTextContent('Payment plans are not offered.');

    const sent = posts(requests)[0]?.body as Record<string, unknown>;
    expect(sent).toMatchObject({
      kind: 'pre_purchase',
      payer: 'agent_now',
      property: { address: { street: '418 Larkspur Lane', postalCode: '97035' }, yearBuilt: 1962, occupancy: 'occupied' },
      parties: [{ partyRole: 'buyer', name: 'Avery Quinn', email: 'avery.quinn@example.com' }],
    });
    expect(sent).not.toHaveProperty('confirmDuplicate');
  });

  it('warns about an open order at the same address and resends with confirmDuplicate once the person agrees', async () => {
    const { requests } = mockFetch({
      'GET /api/fee-list': () => json({ items: feeList }),
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/orders': [
        () => problem(409, { code: 'duplicate_property', detail: 'This address already has an open inspection order with us.' }),
        () => json({ order: placedOrder }, 201),
      ],
    });
    const onPlaced = vi.fn();
    renderWithProviders(<OrderForm canPayNow onPlaced={onPlaced} />);
    const ui = userEvent.setup();
    await screen.findByTestId('order-total');

    await fillValidOrder(ui);
    await ui.click(screen.getByRole('button', { name: 'Place the order' }));

    const warning = await screen.findByRole('alert');
    expect(warning).toHaveTextContent('This address already has an open inspection order with us.');
    const submit = screen.getByRole('button', { name: 'Place the order' });
    expect(submit).toBeDisabled();
    await ui.click(within(warning).getByRole('checkbox', { name: 'Order anyway' }));
    await ui.click(submit);

    await waitFor(() => expect(onPlaced).toHaveBeenCalledWith({ order: placedOrder, payNow: true }));
    const [first, second] = posts(requests);
    expect(first?.body).not.toHaveProperty('confirmDuplicate');
    expect(second?.body).toMatchObject({ confirmDuplicate: true });
  });

  it('moves the invited people to the other side when the kind of inspection changes', async () => {
    mockFetch({ 'GET /api/fee-list': () => json({ items: feeList }) });
    renderWithProviders(<OrderForm canPayNow={false} onPlaced={vi.fn()} />);
    const ui = userEvent.setup();
    await screen.findByTestId('order-total');

    await ui.click(screen.getByRole('button', { name: 'Add the listing agent' }));
    expect(screen.getByLabelText("The listing agent's name")).toBeInTheDocument();
    await ui.click(screen.getByRole('radio', { name: /^Pre-listing/ }));

    expect(screen.getByLabelText("The seller's name")).toBeInTheDocument();
    expect(screen.getByLabelText("The buyer's agent's name")).toBeInTheDocument();
    // The office cannot pay by card: only the client option is described.
    expect(screen.queryByRole('radio', { name: /I pay now/ })).not.toBeInTheDocument();
  });
});
