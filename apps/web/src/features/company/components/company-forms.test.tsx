import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { demoPriceBook } from '@underfoot/core';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { resetCsrfToken } from '@/lib/api-client';
import { json, mockFetch, problem } from '@/test/fetch-mock';
import { renderWithProviders } from '@/test/render';
import type { FeeListItem } from '../api';
import { FeeItemForm } from './fee-item-form';
import { PriceBookEditor } from './price-book-editor';

beforeEach(() => {
  resetCsrfToken();
});
afterEach(() => {
  vi.unstubAllGlobals();
});

const baseFee: FeeListItem = {
  id: 'fee-1',
  kind: 'base',
  name: 'Sewer line camera inspection',
  description: '',
  priceCents: 32500,
  active: true,
  sortOrder: 0,
  orderCount: 3,
  updatedAt: '2026-12-01T00:00:00.000Z',
};

describe('FeeItemForm', () => {
  it('shows the price in dollars and sends it as cents', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'PUT /api/company/fees/fee-1': () => json({ item: { ...baseFee, priceCents: 34950 } }),
    });
    const onDone = vi.fn();
    renderWithProviders(<FeeItemForm item={baseFee} onDone={onDone} />);
    const price = screen.getByLabelText('Price (USD)');
    expect(price).toHaveValue('325');
    const person = userEvent.setup();
    await person.clear(price);
    await person.type(price, '349.50');
    await person.click(screen.getByRole('button', { name: 'Save the fee' }));
    await vi.waitFor(() => expect(onDone).toHaveBeenCalled());
    const sent = requests.find((r) => r.method === 'PUT');
    expect(sent?.body).toEqual({ kind: 'base', name: 'Sewer line camera inspection', description: '', priceCents: 34950, active: true });
  });

  it('refuses a price the shared schema refuses, before sending anything', async () => {
    const { requests } = mockFetch({});
    renderWithProviders(<FeeItemForm item={baseFee} onDone={() => {}} />);
    const person = userEvent.setup();
    await person.clear(screen.getByLabelText('Price (USD)'));
    await person.type(screen.getByLabelText('Price (USD)'), '12,000');
    await person.click(screen.getByRole('button', { name: 'Save the fee' }));
    expect(await screen.findByText('Check the price: at most $10,000.')).toBeInTheDocument();
    expect(requests).toEqual([]);
  });

  it('puts the server’s field error on the field it names', async () => {
    mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/company/fees': () =>
        problem(400, {
          code: 'invalid_input',
          detail: 'Some fields need attention.',
          errors: [{ path: 'kind', message: 'Orders carry one inspection fee.' }],
        }),
    });
    renderWithProviders(<FeeItemForm item={null} onDone={() => {}} />);
    const person = userEvent.setup();
    await person.type(screen.getByLabelText('Name'), 'Another inspection');
    await person.selectOptions(screen.getByLabelText('Kind'), 'base');
    await person.type(screen.getByLabelText('Price (USD)'), '300');
    await person.click(screen.getByRole('button', { name: 'Add the fee' }));
    expect(await screen.findByText('Orders carry one inspection fee.')).toBeInTheDocument();
    expect(screen.getByLabelText('Kind')).toHaveAttribute('aria-invalid', 'true');
  });
});

describe('PriceBookEditor', () => {
  const stored = { priceBook: demoPriceBook, isDefault: true, updatedAt: null, updatedBy: null };

  it('moves the sample’s ranges as a price is typed, and waits while an entry is invalid', async () => {
    mockFetch({});
    renderWithProviders(<PriceBookEditor stored={stored} />);
    const spotRepairs = () => screen.getByTestId('after-spot_repairs').textContent;
    const before = spotRepairs();
    const person = userEvent.setup();
    const high = screen.getByLabelText('Spot repair by excavation, high price');
    await person.clear(high);
    await person.type(high, '5000');
    expect(spotRepairs()).not.toBe(before);
    const bursting = document.querySelector('[data-option="burst_runs"]') as HTMLElement;
    expect(within(bursting).getByText('No change')).toBeInTheDocument();

    await person.clear(high);
    await person.type(high, 'lots');
    expect(await screen.findByText('Fix the marked fields to see the new ranges.')).toBeInTheDocument();
    expect(screen.getByText('"lots" is not an amount. Write it like 325 or 324.50.')).toBeInTheDocument();
  });
});
