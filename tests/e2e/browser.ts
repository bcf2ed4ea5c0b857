import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

export const chromiumPath = () => process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

/** Screenshots land here (git-ignored) for people to look at after a run. */
export const screenshotDir = path.resolve(import.meta.dirname, '../../test-results/screenshots');

// Debian's chromium as root, with the networking it would otherwise try to do switched off (STACK.md trap 12).
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-dev-shm-usage',
];

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: chromiumPath(), headless: true, args: CHROMIUM_ARGS });
}

export const viewports = {
  desktop: { width: 1280, height: 860 },
  phone: { width: 360, height: 780 },
} as const;

export async function newPage(
  browser: Browser,
  viewport: keyof typeof viewports = 'desktop',
): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({
    viewport: viewports[viewport],
    deviceScaleFactor: viewport === 'phone' ? 2 : 1,
    isMobile: viewport === 'phone',
    hasTouch: viewport === 'phone',
  });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  return { context, page };
}

export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

/** Fail a test on any uncaught page error or console error, so broken screens cannot pass silently. */
export function collectPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (err) => errors.push(`pageerror: ${err.message}`));
  page.on('console', (msg) => {
    if (msg.type() === 'error' && !/status of 40[13]/.test(msg.text())) errors.push(`console: ${msg.text()}`);
  });
  return errors;
}

/** Fills in the sign-in form the browser is showing and presses Sign in; it does not wait for what follows. */
export async function submitSignIn(page: Page, email: string, password: string): Promise<void> {
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Opens the sign-in page and signs in, then waits until the app has moved on from it. */
export async function signIn(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await submitSignIn(page, email, password);
  await page.waitForURL((url) => url.pathname !== '/sign-in');
}
