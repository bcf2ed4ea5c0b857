import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD, demoAccounts } from '../../seeds/demo.ts';
import { writeDemoVideo } from '../../seeds/media/demo-media.ts';
import { collectPageErrors, launchBrowser, newPage, screenshot, screenshotDir } from './browser.ts';

const baseUrl = inject('baseUrl');
const account = (prefix: string) => demoAccounts.find((a) => a.email.startsWith(prefix))!;

/** A signed-in API client for arranging data (the office places and schedules an order of its own). */
async function apiSession(email: string) {
  let cookie = '';
  let token = '';
  const call = async (method: string, url: string, body?: unknown) => {
    const res = await fetch(`${baseUrl}${url}`, {
      method,
      headers: { 'content-type': 'application/json', cookie, ...(token ? { 'x-csrf-token': token } : {}) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const setCookie = res.headers.get('set-cookie');
    const sid = setCookie?.match(/underfoot\.sid=[^;]+/)?.[0];
    if (sid) cookie = sid;
    const json = (await res.json().catch(() => ({}))) as Record<string, unknown>;
    if (typeof json.csrfToken === 'string') token = json.csrfToken;
    if (!res.ok) throw new Error(`${method} ${url}: ${res.status} ${JSON.stringify(json)}`);
    return json;
  };
  token = ((await call('GET', '/api/auth/csrf')) as { token: string }).token;
  await call('POST', '/api/auth/sign-in', { email, password: DEMO_PASSWORD });
  return call;
}

const isoDay = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

/** A fresh order at an invented address, scheduled for today with Marco, so this test owns it. */
async function orderForMarco(street: string): Promise<string> {
  const office = await apiSession(account('dana').email);
  const created = (await office('POST', '/api/orders', {
    kind: 'pre_purchase',
    property: {
      address: { street, city: 'Alder Falls', region: 'OR', postalCode: '97411' },
      yearBuilt: 1951,
      propertyType: 'single_family',
      occupancy: 'occupied',
      accessNotes: 'Two-way cleanout left of the garage door.',
    },
    contingencyDeadline: isoDay(10),
    parties: [{ partyRole: 'buyer', name: 'Ada Greenlaw', email: `ada.${Date.now()}@example.com` }],
    payer: 'client_before_release',
    confirmDuplicate: true,
  })) as { order: { id: string } };
  await office('POST', `/api/orders/${created.order.id}/schedule`, {
    inspectorId: account('marco').id,
    window: { date: isoDay(0), startTime: '08:00', endTime: '10:00' },
  });
  return created.order.id;
}

async function signIn(page: Page, email: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

/** What is on the screen now (dialogs sit in the viewport, so a full-page picture would lose them). */
async function viewShot(page: Page, name: string) {
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`) });
}

const saveState = (page: Page) => page.locator('[data-save-state]').first();
async function waitSaved(page: Page) {
  await expect.poll(() => saveState(page).getAttribute('data-save-state'), { timeout: 15_000 }).toBe('saved');
}

async function addFinding(page: Page, footage: string, kind: string, severity?: number) {
  await page.getByRole('button', { name: 'Add finding' }).first().click();
  const sheet = page.getByRole('dialog', { name: 'Add a finding' });
  await sheet.getByLabel('Where, from the access point').fill(footage);
  await sheet.getByText(kind, { exact: true }).click();
  if (severity) await sheet.getByRole('radio', { name: new RegExp(`^${severity} ·`) }).check();
  await sheet.getByRole('button', { name: 'Add finding' }).click();
  await sheet.waitFor({ state: 'hidden' });
}

let browser: Browser;
/** The order the first test records, looked at again by the office in the last. */
let recordedOrderId: string | null = null;
let videoDir: string;
let videoFile: string;
beforeAll(async () => {
  browser = await launchBrowser();
  videoDir = mkdtempSync(path.join(tmpdir(), 'underfoot-video-'));
  videoFile = await writeDemoVideo(path.join(videoDir, 'run-toward-main.mp4'));
});
afterAll(async () => {
  await browser?.close();
  rmSync(videoDir, { recursive: true, force: true });
});

describe('recording the line on a phone', () => {
  it('an inspector records a run with sections and findings, uploads the video, grabs and marks up a still, and finds it all after a reload', async () => {
    const orderId = await orderForMarco(`${Math.floor(Math.random() * 900) + 100} Culvert Row`);
    recordedOrderId = orderId;
    const { context, page } = await newPage(browser, 'phone');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, account('marco').email);
      await page.goto(`${baseUrl}/field/orders/${orderId}/inspection`);
      await page.getByRole('heading', { level: 1, name: /Culvert Row/ }).waitFor();
      await screenshot(page, 'field-editor-empty-phone');

      // The cleanout and a run toward the main.
      await page.getByRole('button', { name: /Start with a two-way cleanout/ }).click();
      await page.getByLabel('Where it is').fill('Left of the garage door');
      const run = page.getByRole('region', { name: /^Run 1/ });
      await run.getByLabel('Distance reached').fill(`62' 0"`);
      await run.getByLabel('Distance reached').press('Tab');
      await expect.poll(() => run.getByText(/Reached 62' 0"/).count()).toBe(1);

      // Two pipe sections, typed the trade's way.
      const sections = run.getByRole('region', { name: 'Pipe sections' });
      await sections.getByLabel('To').fill('30 ft');
      await sections.getByLabel('Material').selectOption({ label: 'Cast iron' });
      await sections.getByRole('button', { name: 'Add section' }).click();
      await expect.poll(() => sections.getByLabel('From').inputValue()).toBe(`30' 0"`);
      await sections.getByLabel('To').fill(`62'`);
      await sections.getByLabel('Material').selectOption({ label: 'Clay' });
      await sections.getByRole('button', { name: 'Add section' }).click();
      await sections.getByText(`30' 0" – 62' 0"`).waitFor();

      // Findings through the quick-add sheet, with the severity guide on screen.
      await page.getByRole('button', { name: 'Add finding' }).first().click();
      const sheet = page.getByRole('dialog', { name: 'Add a finding' });
      await sheet.getByLabel('Where, from the access point').fill(`24' 6"`);
      await sheet.getByText('Roots', { exact: true }).click();
      await sheet.getByText('The guide for roots:').waitFor();
      await viewShot(page, 'field-editor-quick-add-phone');
      await sheet.getByRole('radio', { name: /^3 ·/ }).check();
      await sheet.getByLabel('Clock position').selectOption({ label: "12 o'clock (top)" });
      await sheet.getByRole('button', { name: 'Add finding' }).click();
      await sheet.waitFor({ state: 'hidden' });
      await addFinding(page, '41 ft', 'Joint offset', 4);
      await addFinding(page, '12', 'Bend');
      const findings = run.getByRole('region', { name: 'Findings' });
      await expect.poll(() => findings.locator('ol > li').count()).toBe(3);
      // The core's grade, live: a severity-4 joint offset means "Repair now".
      await page.locator('.fixed').getByText('Repair now').waitFor();
      await waitSaved(page);
      await screenshot(page, 'field-editor-run-phone');

      // The run video, with a real progress bar (upload slowed so it can be seen).
      const cdp = await context.newCDPSession(page);
      await cdp.send('Network.enable');
      await cdp.send('Network.emulateNetworkConditions', {
        offline: false,
        latency: 0,
        downloadThroughput: -1,
        uploadThroughput: 2_500_000,
      });
      await run.getByLabel(/Upload the run’s video/).setInputFiles(videoFile);
      const progress = run.getByRole('progressbar');
      await progress.waitFor();
      await expect.poll(async () => Number(await progress.getAttribute('aria-valuenow')), { timeout: 20_000 }).toBeGreaterThan(0);
      await viewShot(page, 'field-editor-upload-progress-phone');
      await progress.waitFor({ state: 'hidden', timeout: 60_000 });
      await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
      const player = run.locator('video');
      await expect.poll(() => player.getAttribute('src')).toMatch(/^\/api\/media\/[\w-]+\/file#t=0\.1$/);

      // Pause at a frame and grab it (the player seeks by range requests).
      await player.evaluate(async (video: HTMLVideoElement) => {
        if (video.readyState < 1) await new Promise((r) => video.addEventListener('loadedmetadata', r, { once: true }));
        video.currentTime = 3;
        await new Promise((r) => video.addEventListener('seeked', r, { once: true }));
      });
      await run.getByRole('button', { name: 'Grab this frame' }).click();
      const attach = page.getByRole('dialog', { name: 'Attach this frame' });
      await attach.getByText('From the video at 0:03.').waitFor();
      await attach.getByLabel('Attach to the finding').selectOption({ label: `41' 0" · Joint offset` });
      await viewShot(page, 'field-editor-attach-frame-phone');
      await attach.getByRole('button', { name: 'Attach still' }).click();
      await attach.waitFor({ state: 'hidden' });
      const thumb = findings.getByRole('button', { name: /Still 1 of Joint offset at 41' 0"/ });
      await thumb.waitFor();

      // Mark it up: an arrow by dragging, a label by tapping; undo and redo.
      await thumb.click();
      const editor = page.getByRole('dialog', { name: 'Mark up the still' });
      const canvas = editor.getByRole('application', { name: 'Still to mark up' });
      await canvas.waitFor();
      const box = (await canvas.boundingBox())!;
      await page.mouse.move(box.x + box.width * 0.8, box.y + box.height * 0.8);
      await page.mouse.down();
      await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.6, { steps: 5 });
      await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.45, { steps: 5 });
      await page.mouse.up();
      await editor.getByRole('button', { name: /^1\. Arrow, Flare orange/ }).waitFor();
      await editor.getByRole('button', { name: 'Label', exact: true }).click();
      await editor.getByLabel('Label text').fill('Offset joint');
      await canvas.click({ position: { x: box.width * 0.08, y: box.height * 0.1 } });
      await editor.getByRole('button', { name: /^2\. Label “Offset joint”/ }).waitFor();
      await editor.getByRole('button', { name: 'Undo' }).click();
      await expect.poll(() => editor.getByRole('button', { name: /^2\. Label/ }).count()).toBe(0);
      await editor.getByRole('button', { name: 'Redo' }).click();
      await editor.getByRole('button', { name: /^2\. Label “Offset joint”/ }).waitFor();
      await viewShot(page, 'field-editor-markup-phone');
      await editor.getByRole('button', { name: 'Save markup' }).click();
      await page.getByText('Markup saved.').waitFor();
      await editor.getByRole('button', { name: 'Done', exact: true }).click();
      await findings.getByRole('button', { name: /Still 1 of Joint offset at 41' 0", marked up/ }).waitFor();
      await waitSaved(page);

      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow).toBeLessThanOrEqual(0);

      // Everything is on the server: reload and find it.
      await page.reload();
      await page.getByRole('heading', { level: 1, name: /Culvert Row/ }).waitFor();
      const reloaded = page.getByRole('region', { name: /^Run 1/ });
      await expect.poll(() => reloaded.getByRole('region', { name: 'Findings' }).locator('ol > li').count()).toBe(3);
      await reloaded.getByText(`0' 0" – 30' 0"`).waitFor();
      await reloaded.getByText(`30' 0" – 62' 0"`).waitFor();
      await expect.poll(() => reloaded.locator('video').getAttribute('src')).toMatch(/^\/api\/media\//);
      await reloaded.getByRole('button', { name: /Still 1 of Joint offset at 41' 0", marked up/ }).waitFor();
      await expect.poll(() => page.getByLabel('Where it is').inputValue()).toBe('Left of the garage door');
      await waitSaved(page);
      await screenshot(page, 'field-editor-after-reload-phone');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('a stale save from a second tab gets the conflict prompt, and merging keeps both changes', async () => {
    const orderId = await orderForMarco(`${Math.floor(Math.random() * 900) + 100} Weir Street`);
    const { context, page: first } = await newPage(browser, 'phone');
    const errors = collectPageErrors(first);
    try {
      await signIn(first, account('marco').email);
      const url = `${baseUrl}/field/orders/${orderId}/inspection`;
      await first.goto(url);
      await first.getByRole('button', { name: /Start with a two-way cleanout/ }).click();
      await waitSaved(first);

      const second = await context.newPage();
      await second.goto(url);
      await second.getByRole('heading', { level: 1, name: /Weir Street/ }).waitFor();

      await first.getByRole('checkbox', { name: 'Grease' }).check();
      await waitSaved(first);

      await second.getByRole('checkbox', { name: 'Blockage' }).check();
      const prompt = second.getByRole('dialog', { name: 'This inspection changed elsewhere' });
      await prompt.waitFor();
      await expect.poll(() => saveState(second).getAttribute('data-save-state')).toBe('conflict');
      await viewShot(second, 'field-editor-conflict-phone');
      await prompt.getByRole('button', { name: 'Merge my changes' }).click();
      await waitSaved(second);

      await first.reload();
      await first.getByRole('heading', { level: 1, name: /Weir Street/ }).waitFor();
      expect(await first.getByRole('checkbox', { name: 'Grease' }).isChecked()).toBe(true);
      expect(await first.getByRole('checkbox', { name: 'Blockage' }).isChecked()).toBe(true);
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('a change made offline is kept on the phone, and saved when a page opens again online', async () => {
    const orderId = await orderForMarco(`${Math.floor(Math.random() * 900) + 100} Sump Lane`);
    const { context, page } = await newPage(browser, 'phone');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, account('marco').email);
      const url = `${baseUrl}/field/orders/${orderId}/inspection`;
      await page.goto(url);
      await page.getByRole('button', { name: /Start with a two-way cleanout/ }).click();
      await waitSaved(page);

      await context.setOffline(true);
      await page.getByRole('checkbox', { name: 'Standing water' }).check();
      await expect.poll(() => saveState(page).getAttribute('data-save-state'), { timeout: 15_000 }).toBe('retrying');
      await page.getByText(/Your changes are kept on this phone/).waitFor();
      await screenshot(page, 'field-editor-offline-phone');
      const kept = await page.evaluate((id) => localStorage.getItem(`underfoot:inspection-draft:${id}`), orderId);
      expect(kept).toContain('standing_water');
      await page.close();

      // Back online, a fresh page picks the kept change up and saves it.
      await context.setOffline(false);
      const again = await context.newPage();
      await again.goto(url);
      // The page says it picked the kept change up, unless the server already had it (a save can
      // land just as the phone goes offline; then the kept copy is dropped without a word).
      await waitSaved(again);
      expect(await again.evaluate((id) => localStorage.getItem(`underfoot:inspection-draft:${id}`), orderId)).toBeNull();
      await again.reload();
      await again.getByRole('heading', { level: 1, name: /Sump Lane/ }).waitFor();
      expect(await again.getByRole('checkbox', { name: 'Standing water' }).isChecked()).toBe(true);
      expect(errors.filter((e) => !/Failed to load resource|ERR_INTERNET_DISCONNECTED/.test(e))).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('the office opens the same inspection on a desktop, with the live preview', async () => {
    expect(recordedOrderId, 'the first test records the inspection this one opens').not.toBeNull();
    const { context, page } = await newPage(browser, 'desktop');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, account('dana').email);
      await page.goto(`${baseUrl}/office/orders/${recordedOrderId}/inspection`);
      await page.getByRole('heading', { level: 1, name: /Culvert Row/ }).waitFor();
      await page.getByRole('heading', { name: 'What this adds up to' }).waitFor();
      await page.locator('#preview').getByText('Repair now').waitFor();
      await screenshot(page, 'field-editor-office-desktop');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
