import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, demoAccounts } from '../../seeds/demo.ts';
import { collectPageErrors, launchBrowser, newPage, screenshot, signIn, submitSignIn } from './browser.ts';

const baseUrl = inject('baseUrl');
const mailApiUrl = inject('mailApiUrl');

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const firstOf = (role: string) => demoAccounts.find((a) => a.role === role)!;

const landings = [
  { role: 'office', path: '/office', heading: 'Office' },
  { role: 'inspector', path: '/field', heading: "Today's jobs" },
  { role: 'agent', path: '/portal', heading: 'Your reports' },
  { role: 'client', path: '/portal', heading: 'Your reports' },
] as const;

describe('signing in', () => {
  for (const { role, path, heading } of landings) {
    it(`the demo ${role} signs in and lands in their own area`, async () => {
      const account = firstOf(role);
      const { context, page } = await newPage(browser);
      const errors = collectPageErrors(page);
      try {
        await signIn(page, baseUrl, account.email, DEMO_PASSWORD);
        await page.waitForURL(`${baseUrl}${path}`);
        await page.getByRole('heading', { level: 1, name: heading }).waitFor();
        await expect(page.getByText(account.name).first().isVisible()).resolves.toBe(true);
        await screenshot(page, `home-${role}-desktop`);
        expect(errors).toEqual([]);
      } finally {
        await context.close();
      }
    });
  }

  it('the portal works on a phone-sized screen', async () => {
    const { context, page } = await newPage(browser, 'phone');
    try {
      await page.goto(`${baseUrl}/sign-in`);
      await screenshot(page, 'sign-in-phone');
      await submitSignIn(page, firstOf('client').email, DEMO_PASSWORD);
      await page.waitForURL(`${baseUrl}/portal`);
      await page.getByRole('heading', { level: 1, name: 'Your reports' }).waitFor();
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await screenshot(page, 'home-client-phone');
    } finally {
      await context.close();
    }
  });

  it('a wrong password shows its error and stays on the sign-in page', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.goto(`${baseUrl}/sign-in`);
      await submitSignIn(page, firstOf('agent').email, 'not-the-password');
      await page.getByText('E-mail or password is incorrect.').waitFor();
      expect(new URL(page.url()).pathname).toBe('/sign-in');
      await screenshot(page, 'sign-in-wrong-password');
    } finally {
      await context.close();
    }
  });

  it('a signed-out visitor to an area is sent to sign in, and back afterwards', async () => {
    const { context, page } = await newPage(browser);
    try {
      await page.goto(`${baseUrl}/office`);
      await page.waitForURL(/\/sign-in\?next=/);
      await submitSignIn(page, firstOf('office').email, DEMO_PASSWORD);
      await page.waitForURL(`${baseUrl}/office`);
    } finally {
      await context.close();
    }
  });
});

describe('forgotten password', () => {
  it('a reset link from the mailbox sets a new password and signs the person in', async () => {
    const account = demoAccounts.find((a) => a.email.startsWith('walt'))!;
    const { context, page } = await newPage(browser);
    const errors = collectPageErrors(page);
    try {
      await page.goto(`${baseUrl}/sign-in`);
      await page.getByRole('link', { name: /forgot/i }).click();
      await page.getByRole('heading', { name: 'Forgot your password?' }).waitFor();
      await page.getByLabel('E-mail address').fill(account.email);
      await page.getByRole('button', { name: 'Send me a link' }).click();
      await page.getByText(/If an account exists for that address/).waitFor();

      // Read the message as a person would: in the demo mailbox page.
      await page.goto(`${baseUrl}/mailbox`);
      await page.getByText('Reset your Underfoot password').first().click();
      // The formatted (HTML) part renders in its sandboxed frame, with the company's name.
      const formatted = page.frameLocator('iframe[title^="Formatted message"]');
      await formatted.getByRole('link', { name: 'Choose a new password' }).waitFor();
      await formatted.getByText('Bramblewood Drain & Camera').first().waitFor();
      await screenshot(page, 'mailbox-reset-message');
      const link = page.getByRole('link', { name: /\/reset-password\?token=/ }).first();
      await link.click();
      await page.waitForURL(/\/reset-password\?token=/);
      await page.getByLabel('New password').fill('a fresh sewer passphrase');
      await page.getByRole('button', { name: 'Save the new password and sign in' }).click();
      await page.waitForURL(`${baseUrl}/portal`);
      await page.getByRole('heading', { level: 1, name: 'Your reports' }).waitFor();
      expect(errors).toEqual([]);

      // The fake mail server really received it, once.
      const caught = (await (await fetch(`${mailApiUrl}/messages`)).json()) as { messages: { to: string[]; subject: string }[] };
      expect(caught.messages.filter((m) => m.to.includes(account.email) && m.subject.includes('Reset'))).toHaveLength(1);
    } finally {
      await context.close();
    }
  });
});
