import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../seeds/demo.ts';
import { collectPageErrors, launchBrowser, newPage, screenshot, signIn } from './browser.ts';

const baseUrl = inject('baseUrl');
const mailApiUrl = inject('mailApiUrl');

const agent = { email: 'theo@hearthline-realty.example.com', name: 'Theo Lindqvist' };
const office = { email: 'dana@bramblewood.example.com' };
const inspector = { email: 'marco@bramblewood.example.com', name: 'Marco Ruiz' };
const buyer = { name: 'Hollis Marsh', email: 'hollis.marsh@example.com' };
// An invented house that is not in the demo data, so the order is new.
const street = '52 Thistledown Court';

/** YYYY-MM-DD some days from today (UTC calendar; the margins below are days wide). */
const dayFromToday = (days: number) => {
  const now = new Date();
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() + days)).toISOString().slice(0, 10);
};
const visitDate = dayFromToday(3);

interface CaughtSummary {
  id: string;
  to: string[];
  subject: string;
}

async function messages(): Promise<CaughtSummary[]> {
  const res = await fetch(`${mailApiUrl}/messages`);
  return ((await res.json()) as { messages: CaughtSummary[] }).messages;
}

async function messageText(id: string): Promise<string> {
  const res = await fetch(`${mailApiUrl}/messages/${id}`);
  return ((await res.json()) as { text: string }).text;
}

/** The outbox worker sends within a moment; wait for a message rather than sleeping. */
async function waitForMessage(match: (m: CaughtSummary) => boolean, timeoutMs = 15_000): Promise<CaughtSummary> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await messages()).find(match);
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no such e-mail arrived; caught: ${JSON.stringify(await messages(), null, 1)}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

const linksIn = (text: string) => [...text.matchAll(/https?:\/\/[^\s<>"]+/g)].map((m) => m[0]);

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function withPage<T>(
  viewport: 'desktop' | 'phone',
  run: (page: Page, errors: string[], context: BrowserContext) => Promise<T>,
): Promise<T> {
  const { context, page } = await newPage(browser, viewport);
  const errors = collectPageErrors(page);
  try {
    return await run(page, errors, context);
  } catch (err) {
    // What the browser showed when a step failed, for the person reading the failure.
    await screenshot(page, `orders-failure-${Date.now()}`).catch(() => undefined);
    throw new Error(`${(err as Error).message}\nat ${page.url()}\npage errors: ${JSON.stringify(errors)}`, { cause: err });
  } finally {
    await context.close();
  }
}

async function noSidewaysScroll(page: Page) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow).toBeLessThanOrEqual(0);
}

/** The order page's id, once the browser is on it. */
let orderId = '';

describe('ordering, paying and scheduling an inspection', () => {
  it('an agent orders a pre-purchase inspection for a new buyer and pays on the checkout page', async () => {
    await withPage('desktop', async (page, errors) => {
      await signIn(page, baseUrl, agent.email, DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: 'Your reports' }).waitFor();
      // The demo agent already has orders: the table shows them with their days left and a dash for the grade.
      const table = page.getByRole('table', { name: 'Your orders' });
      await table.getByRole('link', { name: '418 Larkspur Lane' }).waitFor();
      await screenshot(page, 'orders-dashboard-agent-desktop');

      await page.getByRole('link', { name: 'Order an inspection' }).first().click();
      await page.getByRole('heading', { level: 1, name: 'Order an inspection' }).waitFor();
      await page.getByTestId('order-total').filter({ hasText: '$325.00' }).waitFor();
      await screenshot(page, 'order-form-desktop');

      await page.getByRole('radio', { name: /^Pre-purchase/ }).check();
      await page.getByLabel('Street address').fill(street);
      await page.getByLabel('City').fill('Alder Falls');
      await page.getByLabel('State or region').fill('OR');
      await page.getByLabel('Postal code').fill('97411');
      await page.getByLabel('Year built').fill('1948');
      await page.getByLabel('Property type').selectOption('single_family');
      await page.getByRole('radio', { name: /^Occupied/ }).check();
      await page.getByLabel(/Where is the cleanout/).fill('Cleanout in the side yard by the hose bib. Friendly dog.');
      await page.getByLabel('Contingency deadline').fill(dayFromToday(20));
      await page.getByRole('button', { name: 'Add a preferred date' }).click();
      await page.getByLabel('Preferred date 1').fill(visitDate);
      await page.getByRole('checkbox', { name: /Locating and depth readings/ }).check();
      await expect(page.getByTestId('order-total').textContent()).resolves.toBe('$410.00');
      await page.getByLabel("The buyer's name").fill(buyer.name);
      await page.getByLabel("The buyer's e-mail").fill(buyer.email);
      await page.getByRole('radio', { name: /I pay now by card/ }).check();
      await screenshot(page, 'order-form-filled-desktop');

      await page.getByRole('button', { name: 'Place the order' }).click();

      // The provider's hosted checkout: the local fake, on its own port.
      await page.waitForURL((url) => url.origin !== baseUrl);
      await page.getByRole('heading', { name: 'Test checkout' }).waitFor();
      await page.getByRole('button', { name: 'Pay $410.00' }).click();

      await page.waitForURL(/\/portal\/orders\/[^/?]+\?payment=success$/);
      orderId = new URL(page.url()).pathname.split('/').at(-1)!;
      await page.getByRole('heading', { level: 1, name: street }).waitFor();
      await page.getByText('Payment received').waitFor({ timeout: 25_000 });
      await page.getByRole('region', { name: 'Fee and payment' }).getByText('Paid', { exact: true }).waitFor();
      await expect(page.getByRole('button', { name: /Pay now/ }).count()).resolves.toBe(0);
      await screenshot(page, 'order-paid-desktop');
      expect(errors).toEqual([]);
    });
  });

  it('the office sees the order in its queue and assigns Marco Ruiz an arrival window', async () => {
    expect(orderId).not.toBe('');
    await withPage('desktop', async (page, errors) => {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: 'Office' }).waitFor();
      const toSchedule = page.getByRole('region', { name: /To schedule/ });
      const row = toSchedule.locator(`tr[data-order-id="${orderId}"]`);
      await row.getByRole('link', { name: street }).waitFor();
      await expect(row.getByText('Paid').isVisible()).resolves.toBe(true);
      await screenshot(page, 'office-queue-desktop');

      await row.getByRole('button', { name: `Schedule ${street}` }).click();
      const dialog = page.getByRole('dialog', { name: 'Schedule the visit' });
      await dialog.getByLabel('Inspector').selectOption({ label: inspector.name });
      // The preferred date from the order is already filled in.
      await expect(dialog.getByLabel('Visit date').inputValue()).resolves.toBe(visitDate);
      await dialog.getByLabel('Arrive from').fill('09:00');
      await dialog.getByLabel('Arrive by').fill('11:00');
      await dialog.getByLabel(/Note to everyone/).fill('Please leave the side gate unlatched.');
      await screenshot(page, 'office-schedule-dialog-desktop');
      await dialog.getByRole('button', { name: 'Schedule the visit' }).click();

      const scheduled = page.getByRole('region', { name: /^Scheduled/ });
      const bookedRow = scheduled.locator(`tr[data-order-id="${orderId}"]`);
      await bookedRow.getByText(inspector.name).waitFor();
      await expect(bookedRow.getByText('09:00–11:00').isVisible()).resolves.toBe(true);
      await expect(toSchedule.locator(`tr[data-order-id="${orderId}"]`).count()).resolves.toBe(0);

      // The order's own page shows the visit and the change in its history.
      await bookedRow.getByRole('link', { name: street }).click();
      await page.getByRole('heading', { level: 1, name: street }).waitFor();
      const history = page.getByRole('region', { name: 'History' });
      await history.getByText('Visit scheduled').waitFor();
      await expect(history.getByText('Fee paid').isVisible()).resolves.toBe(true);
      expect(errors).toEqual([]);
    });
  });

  it('the inspector finds the job on that day, with the access notes', async () => {
    await withPage('phone', async (page, errors) => {
      await signIn(page, baseUrl, inspector.email, DEMO_PASSWORD);
      await page.goto(`${baseUrl}/field?date=${visitDate}`);
      const job = page.getByRole('listitem').filter({ hasText: street });
      await job.getByText('Cleanout in the side yard by the hose bib.').waitFor();
      await expect(job.getByText('09:00–11:00').isVisible()).resolves.toBe(true);
      await noSidewaysScroll(page);
      await screenshot(page, 'field-day-phone');
      await job.getByRole('link', { name: 'Open the job' }).click();
      await page.getByRole('heading', { level: 1, name: street }).waitFor();
      expect(errors).toEqual([]);
    });
  });

  it('the confirmation, invitation, receipt and schedule e-mails arrive, and their links work', async () => {
    const address = `${street}, Alder Falls, OR 97411`;
    const confirmation = await waitForMessage((m) => m.to.includes(agent.email) && m.subject === `Order received: ${address}`);
    const invitation = await waitForMessage(
      (m) => m.to.includes(buyer.email) && m.subject === `Sewer line inspection ordered for ${address}`,
    );
    const receipt = await waitForMessage(
      (m) => m.to.includes(agent.email) && m.subject.startsWith('Receipt: $410.00') && m.subject.includes(street),
    );
    const scheduledForBuyer = await waitForMessage(
      (m) => m.to.includes(buyer.email) && m.subject === `Scheduled: sewer inspection at ${address}`,
    );
    await waitForMessage((m) => m.to.includes(agent.email) && m.subject === `Scheduled: sewer inspection at ${address}`);
    await waitForMessage((m) => m.to.includes(inspector.email) && m.subject === `Scheduled: sewer inspection at ${address}`);

    // Each "View the order" link opens the order for the agent who placed it.
    await withPage('desktop', async (page, errors) => {
      await signIn(page, baseUrl, agent.email, DEMO_PASSWORD);
      for (const message of [confirmation, receipt]) {
        const link = linksIn(await messageText(message.id)).find((l) => l.includes('/orders/'));
        expect(link).toBe(`${baseUrl}/portal/orders/${orderId}`);
        await page.goto(link!);
        await page.getByRole('heading', { level: 1, name: street }).waitFor();
      }
      expect(errors).toEqual([]);
    });

    // The new buyer accepts the invitation, chooses a password and lands on their portal with the order.
    const inviteLink = linksIn(await messageText(invitation.id)).find((l) => l.includes('/invitation?token='));
    expect(inviteLink).toBeDefined();
    const scheduleText = await messageText(scheduledForBuyer.id);
    expect(scheduleText).toContain(inspector.name);
    expect(scheduleText).toContain('between 09:00 and 11:00');

    await withPage('phone', async (page, errors) => {
      await page.goto(inviteLink!);
      await page.getByRole('heading', { name: 'Accept your invitation' }).waitFor();
      await page.getByLabel('Choose a password').fill('a lateral line passphrase');
      await page.getByRole('button', { name: 'Create my account' }).click();
      await page.waitForURL(`${baseUrl}/portal`);
      await page.getByRole('heading', { level: 1, name: 'Your reports' }).waitFor();
      const card = page.getByRole('list', { name: 'Your orders' }).getByRole('link', { name: new RegExp(street) });
      await card.waitFor();
      await noSidewaysScroll(page);
      await screenshot(page, 'orders-dashboard-buyer-phone');

      // The schedule e-mail's link opens the same order for them.
      const orderLink = linksIn(scheduleText).find((l) => l.includes('/orders/'));
      await page.goto(orderLink!);
      await page.getByRole('heading', { level: 1, name: street }).waitFor();
      await page.getByText(inspector.name).first().waitFor();
      await noSidewaysScroll(page);
      await screenshot(page, 'order-detail-buyer-phone');
      expect(errors).toEqual([]);
    });
  });
});

describe('order screens on a phone', () => {
  it('the agent dashboard, the order form and the office queue fit a 360 px screen', async () => {
    await withPage('phone', async (page, errors) => {
      await signIn(page, baseUrl, agent.email, DEMO_PASSWORD);
      await page
        .getByRole('list', { name: 'Your orders' })
        .getByRole('link', { name: new RegExp(street) })
        .waitFor();
      await noSidewaysScroll(page);
      await screenshot(page, 'orders-dashboard-agent-phone');

      await page.goto(`${baseUrl}/portal/orders/new`);
      await page.getByTestId('order-total').filter({ hasText: '$325.00' }).waitFor();
      await noSidewaysScroll(page);
      await screenshot(page, 'order-form-phone');
      expect(errors).toEqual([]);
    });

    await withPage('phone', async (page, errors) => {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: 'Office' }).waitFor();
      await page.getByRole('list', { name: 'To schedule' }).getByRole('listitem').first().waitFor();
      await noSidewaysScroll(page);
      await screenshot(page, 'office-queue-phone');
      expect(errors).toEqual([]);
    });
  });
});

describe('bad input', () => {
  it('a bad postal code and a past deadline show field errors, and nothing is saved', async () => {
    await withPage('desktop', async (page, errors) => {
      await signIn(page, baseUrl, agent.email, DEMO_PASSWORD);
      const countOrders = async () => ((await (await page.request.get(`${baseUrl}/api/orders?limit=1`)).json()) as { total: number }).total;
      const before = await countOrders();

      await page.goto(`${baseUrl}/portal/orders/new`);
      await page.getByTestId('order-total').waitFor();
      await page.getByLabel('Street address').fill('9 Wrenfield Way');
      await page.getByLabel('City').fill('Alder Falls');
      await page.getByLabel('State or region').fill('OR');
      await page.getByLabel('Postal code').fill('##');
      await page.getByLabel('Year built').fill('1990');
      await page.getByLabel('Property type').selectOption('townhouse');
      await page.getByRole('radio', { name: /^Vacant/ }).check();
      await page.getByLabel('Contingency deadline').fill(dayFromToday(-3));
      await page.getByLabel("The buyer's name").fill('Marin Tolle');
      await page.getByLabel("The buyer's e-mail").fill('marin.tolle@example.com');
      await page.getByRole('radio', { name: /pays before release/ }).check();
      await page.getByRole('button', { name: 'Place the order' }).click();

      await page.getByText('Enter a postal code, like 97035.').waitFor();
      await page.getByText('The deadline must be after today.').waitFor();
      await expect(page.getByLabel('Postal code').getAttribute('aria-invalid')).resolves.toBe('true');
      await expect(page.getByLabel('Contingency deadline').getAttribute('aria-invalid')).resolves.toBe('true');
      expect(new URL(page.url()).pathname).toBe('/portal/orders/new');
      // The form scrolled to the first error; a full-page picture reads better from the top.
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'order-form-errors-desktop');

      expect(await countOrders()).toBe(before);
      expect(errors).toEqual([]);
    });
  });

  it('another agent’s order answers "not found"', async () => {
    expect(orderId).not.toBe('');
    await withPage('desktop', async (page) => {
      await signIn(page, baseUrl, 'sam@millrace-homes.example.com', DEMO_PASSWORD);
      await page.goto(`${baseUrl}/portal/orders/${orderId}`);
      await page.getByRole('heading', { level: 1, name: 'We could not find that order' }).waitFor();
    });
  });
});

describe('changing a booked visit', () => {
  it('the office reschedules the visit, then cancels the order with a reason and the fee is refunded', async () => {
    expect(orderId).not.toBe('');
    await withPage('desktop', async (page, errors) => {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      await page.goto(`${baseUrl}/office/orders/${orderId}`);
      await page.getByRole('heading', { level: 1, name: street }).waitFor();
      const visit = page.getByRole('region', { name: 'Visit' });
      await visit.getByRole('button', { name: 'Reschedule' }).click();
      await visit.getByLabel('Visit date').fill(dayFromToday(5));
      await visit.getByLabel('Arrive from').fill('13:00');
      await visit.getByLabel('Arrive by').fill('15:00');
      await visit.getByRole('button', { name: 'Save the new time' }).click();
      await visit.getByText('13:00–15:00').waitFor();
      await page.getByRole('region', { name: 'History' }).getByText('Visit rescheduled').waitFor();

      await page.getByRole('button', { name: 'Cancel the order' }).click();
      const dialog = page.getByRole('dialog', { name: 'Cancel this order?' });
      await dialog.getByText(/is refunded to the card/).waitFor();
      // No reason, no cancellation.
      await dialog.getByRole('button', { name: 'Cancel the order' }).click();
      await dialog.getByText('Say why the order is cancelled.').waitFor();
      await dialog.getByLabel('Reason').fill('The buyers chose another house.');
      await screenshot(page, 'order-cancel-dialog-desktop');
      await dialog.getByRole('button', { name: 'Cancel the order' }).click();

      await page.getByText('This order is cancelled').waitFor();
      await page.getByText('Reason: The buyers chose another house.').waitFor();
      await page.getByRole('region', { name: 'Fee and payment' }).getByText('Refunded', { exact: true }).waitFor();
      await expect(page.getByRole('button', { name: 'Cancel the order' }).count()).resolves.toBe(0);
      expect(errors).toEqual([]);
    });

    const address = `${street}, Alder Falls, OR 97411`;
    await waitForMessage((m) => m.to.includes(buyer.email) && m.subject === `New time: sewer inspection at ${address}`);
    await waitForMessage((m) => m.to.includes(buyer.email) && m.subject === `Cancelled: sewer inspection at ${address}`);
  });
});
