import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, demoAccounts } from '../../seeds/demo.ts';
import { collectPageErrors, launchBrowser, newPage, screenshot, screenshotDir, signIn } from './browser.ts';

const baseUrl = inject('baseUrl');
const office = demoAccounts.find((a) => a.role === 'office')!;

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function noSidewaysScroll(page: Page) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow).toBeLessThanOrEqual(0);
}

describe('running the company', () => {
  it('the office invites an inspector, who accepts from the mailbox and lands in the field area', async () => {
    const invitee = { name: 'Ola Newhire', email: 'ola.newhire@bramblewood.example.com' };
    const { context, page } = await newPage(browser);
    const errors = collectPageErrors(page);
    try {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Company' }).click();
      await page.getByRole('heading', { level: 1, name: 'Company profile' }).waitFor();
      await page.getByRole('navigation', { name: 'Company' }).getByRole('link', { name: 'People' }).click();
      await page.getByRole('heading', { level: 1, name: 'People' }).waitFor();

      await page.getByLabel('Name', { exact: true }).fill(invitee.name);
      await page.getByLabel('E-mail address', { exact: true }).fill(invitee.email);
      await page.getByLabel('Role', { exact: true }).selectOption('inspector');
      await page.getByRole('button', { name: 'Send invitation' }).click();
      await page.getByText(`Invitation sent to ${invitee.email}.`).waitFor();
      const row = page.getByRole('row').filter({ hasText: invitee.email });
      await row.getByText('Invited').waitFor();
      await row.getByRole('button', { name: 'Resend invitation' }).waitFor();
      await screenshot(page, 'company-people-desktop');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }

    // The invitee, on a phone, reads the message in the demo mailbox and follows the link.
    const phone = await newPage(browser, 'phone');
    const phoneErrors = collectPageErrors(phone.page);
    try {
      const p = phone.page;
      await p.goto(`${baseUrl}/mailbox`);
      await p
        .getByRole('link')
        .filter({ hasText: `To ${invitee.email}` })
        .first()
        .click();
      await p
        .getByRole('link', { name: /\/invitation\?token=/ })
        .first()
        .click();
      await p.waitForURL(/\/invitation\?token=/);
      await p.getByText('invited you to Underfoot as an inspector').waitFor();
      await p.getByLabel('Choose a password').fill('a new inspector passphrase');
      await p.getByRole('button', { name: 'Create my account' }).click();
      await p.waitForURL(`${baseUrl}/field`);
      await p.getByRole('heading', { level: 1 }).waitFor();
      await noSidewaysScroll(p);
      await screenshot(p, 'company-invitee-field-phone');
      expect(phoneErrors).toEqual([]);
    } finally {
      await phone.context.close();
    }

    // Back at the office, the person is active now.
    const again = await newPage(browser);
    try {
      await signIn(again.page, baseUrl, office.email, DEMO_PASSWORD);
      await again.page.goto(`${baseUrl}/office/company/people`);
      await again.page.getByRole('row').filter({ hasText: invitee.email }).getByText('Active').waitFor();
    } finally {
      await again.context.close();
    }
  });

  it('the office edits a price book item, the preview changes before saving, and the save is recorded', async () => {
    const { context, page } = await newPage(browser);
    const errors = collectPageErrors(page);
    try {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      await page.goto(`${baseUrl}/office/company/price-book`);
      await page.getByRole('heading', { level: 1, name: 'Price book' }).waitFor();
      await page.getByText('These are Underfoot’s documented defaults, not your prices').waitFor();

      const spotRepairs = page.getByTestId('after-spot_repairs');
      const before = await spotRepairs.innerText();
      const high = page.getByLabel('Spot repair by excavation, high price');
      expect(await high.inputValue()).toBe('3000');

      // A low above the high is refused on the spot, and the preview waits for a valid book.
      await page.getByLabel('Spot repair by excavation, low price').fill('3500');
      await page.getByText('The low price must not be above the high price.').waitFor();
      await page.getByText('Fix the marked fields to see the new ranges.').waitFor();
      await page.getByLabel('Spot repair by excavation, low price').fill('1000');

      await high.fill('4200');
      await page.waitForFunction(([selector, previous]) => document.querySelector(selector)?.textContent !== previous, [
        '[data-testid="after-spot_repairs"]',
        before,
      ] as const);
      const after = await spotRepairs.innerText();
      expect(after).not.toBe(before);
      await page
        .locator('li[data-option="spot_repairs"]')
        .getByText(/▲ up \d+ %/)
        .waitFor();
      // Pipe bursting digs no repair pits: its range stays.
      await page.locator('li[data-option="burst_runs"]').getByText('No change').waitFor();
      await screenshot(page, 'company-price-book-desktop');
      // As seen in the window: the save bar stays at the bottom while the table scrolls.
      await page.screenshot({ path: path.join(screenshotDir, 'company-price-book-window-desktop.png') });

      await page.getByRole('button', { name: 'Save the price book' }).click();
      await page.getByText('Price book saved. Reports not yet published use it from now on.').waitFor();
      await page.getByText(/Saved .* by Dana Whitlock\./).waitFor();
      await page.reload();
      expect(await page.getByLabel('Spot repair by excavation, high price').inputValue()).toBe('4200');

      // The audit trail shows the change, filtered by its action.
      await page.getByRole('navigation', { name: 'Company' }).getByRole('link', { name: 'Audit trail' }).click();
      await page.getByRole('heading', { level: 1, name: 'Audit trail' }).waitFor();
      await page.getByLabel('Action').selectOption({ label: 'Changed the price book' });
      await page.waitForURL(/action=price_book\.updated/);
      const entry = page.getByRole('row').filter({ hasText: 'Changed the price book' }).first();
      await entry.getByText('Dana Whitlock').waitFor();
      await entry.getByText('changed: Spot repair by excavation').waitFor();
      expect(await page.getByRole('link', { name: 'Export as CSV' }).getAttribute('href')).toBe(
        '/api/company/audit/export?action=price_book.updated',
      );
      await screenshot(page, 'company-audit-desktop');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('every company page fits a phone screen', async () => {
    const { context, page } = await newPage(browser, 'phone');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      for (const [section, heading] of [
        ['', 'Company profile'],
        ['/people', 'People'],
        ['/fees', 'Fee list'],
        ['/price-book', 'Price book'],
        ['/settings', 'Report settings'],
        ['/audit', 'Audit trail'],
      ] as const) {
        await page.goto(`${baseUrl}/office/company${section}`);
        await page.getByRole('heading', { level: 1, name: heading }).waitFor();
        await page
          .locator('main [role="status"] svg.animate-spin')
          .first()
          .waitFor({ state: 'detached' })
          .catch(() => undefined);
        await noSidewaysScroll(page);
        await screenshot(page, `company${section.replace('/', '-') || '-profile'}-phone`);
      }
      await page.goto(`${baseUrl}/account`);
      await page.getByRole('heading', { level: 1, name: 'Account' }).waitFor();
      await page.getByRole('heading', { name: 'Signed-in devices' }).waitFor();
      await noSidewaysScroll(page);
      await screenshot(page, 'account-phone');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('company pages at desktop width', async () => {
    const { context, page } = await newPage(browser);
    const errors = collectPageErrors(page);
    try {
      await signIn(page, baseUrl, office.email, DEMO_PASSWORD);
      for (const [section, heading, name] of [
        ['', 'Company profile', 'profile'],
        ['/fees', 'Fee list', 'fees'],
        ['/settings', 'Report settings', 'settings'],
      ] as const) {
        await page.goto(`${baseUrl}/office/company${section}`);
        await page.getByRole('heading', { level: 1, name: heading }).waitFor();
        await page
          .getByRole('status')
          .filter({ hasText: 'Loading' })
          .waitFor({ state: 'detached' })
          .catch(() => undefined);
        await screenshot(page, `company-${name}-desktop`);
      }
      await page.goto(`${baseUrl}/account`);
      await page.getByRole('heading', { level: 1, name: 'Account' }).waitFor();
      await screenshot(page, 'account-desktop');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
