import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { feet, feetAndInches } from '@underfoot/core';
import { DEMO_PASSWORD, demoAccounts } from '../../seeds/demo.ts';
import { demoStill, writeDemoVideo } from '../../seeds/media/demo-media.ts';
import { collectPageErrors, launchBrowser, newPage, screenshot, screenshotDir } from './browser.ts';

const axePath = path.resolve(import.meta.dirname, '../../node_modules/axe-core/axe.min.js');

/**
 * A phone at 390 px (the width the report's screenshots are reviewed at) or a desktop. `bypassCSP`
 * only so the axe checker can be injected; the app's own scripts run under its policy either way.
 */
async function sized(b: Browser, size: 'phone-390' | 'desktop', options: { axe?: boolean } = {}) {
  const phone = size === 'phone-390';
  const context = await b.newContext({
    viewport: phone ? { width: 390, height: 844 } : { width: 1280, height: 860 },
    deviceScaleFactor: phone ? 2 : 1,
    isMobile: phone,
    hasTouch: phone,
    bypassCSP: options.axe === true,
  });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  return { context, page };
}

/** axe-core on the page as it stands; the serious and critical findings, one line each. */
async function seriousViolations(page: Page): Promise<string[]> {
  await page.addScriptTag({ path: axePath });
  const result = await page.evaluate(async () => {
    const run = (window as unknown as { axe: { run: (ctx: Document) => Promise<AxeResult> } }).axe.run;
    type AxeResult = { violations: { id: string; impact: string | null; help: string; nodes: { target: unknown[] }[] }[] };
    return run(document);
  });
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.impact} ${v.id}: ${v.help} — ${v.nodes.map((n) => JSON.stringify(n.target)).join(', ')}`);
}

/*
 * Journeys 4–6 in the browser: the office reviews and publishes, the buyer reads the report
 * on a phone (pins, stills, the video, a question, the PDF), the agent makes a share link
 * that a guest opens, then revokes it.
 */

const baseUrl = inject('baseUrl');
const account = (prefix: string) => demoAccounts.find((a) => a.email.startsWith(prefix))!;
const isoDay = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

/** A signed-in API client for arranging data, as the people themselves would through the app. */
async function apiSession(email: string) {
  let cookie = '';
  let token = '';
  const call = async (method: string, url: string, body?: unknown) => {
    const form = body instanceof FormData;
    const res = await fetch(`${baseUrl}${url}`, {
      method,
      headers: { ...(form ? {} : { 'content-type': 'application/json' }), cookie, ...(token ? { 'x-csrf-token': token } : {}) },
      body: body === undefined ? undefined : form ? body : JSON.stringify(body),
    });
    const sid = res.headers.get('set-cookie')?.match(/underfoot\.sid=[^;]+/)?.[0];
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

async function signIn(page: Page, email: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

let browser: Browser;
let workDir: string;
let orderId: string;
const street = `${Math.floor(Math.random() * 900) + 100} Weir Gate Road`;

/** Theo orders for Riley and pays; Dana schedules Marco; Marco records the line with the video and a marked-up still. */
async function arrangeRecordedOrder(page: Page) {
  const theo = await apiSession(account('theo').email);
  const created = (await theo('POST', '/api/orders', {
    kind: 'pre_purchase',
    property: {
      address: { street, city: 'Alder Falls', region: 'OR', postalCode: '97411' },
      yearBuilt: 1931,
      propertyType: 'single_family',
      occupancy: 'occupied',
      accessNotes: 'Cleanout by the sidewalk.',
    },
    contingencyDeadline: isoDay(10),
    parties: [
      { partyRole: 'buyer', name: 'Riley Hartmann', email: account('riley').email },
      // The seller is on the order too, and reads nothing until the buyer's side shares it.
      { partyRole: 'seller', name: 'Walt Emerson', email: account('walt').email },
    ],
    payer: 'agent_now',
    confirmDuplicate: true,
  })) as { order: { id: string } };
  const id = created.order.id;
  const checkout = (await theo('POST', `/api/orders/${id}/checkout`)) as { url: string };
  await page.goto(checkout.url);
  await page.getByRole('button', { name: /^Pay / }).click();
  await page.waitForURL(/payment=success/);

  const dana = await apiSession(account('dana').email);
  await dana('POST', `/api/orders/${id}/schedule`, {
    inspectorId: account('marco').id,
    window: { date: isoDay(0), startTime: '08:00', endTime: '10:00' },
  });

  const marco = await apiSession(account('marco').email);
  const videoForm = new FormData();
  videoForm.append('runId', 'run-1');
  videoForm.append(
    'video',
    new Blob([new Uint8Array(readFileSync(await writeDemoVideo(path.join(workDir, 'run.mp4'))))], { type: 'video/mp4' }),
    'run.mp4',
  );
  const video = (await marco('POST', `/api/orders/${id}/media/videos`, videoForm)) as { media: { id: string } };
  const stillForm = new FormData();
  stillForm.append('origin', 'frame_grab');
  stillForm.append('runId', 'run-1');
  stillForm.append('observationId', 'obs-offset');
  stillForm.append('videoTime', '2.7');
  stillForm.append('image', new Blob([new Uint8Array(await demoStill('offset'))], { type: 'image/jpeg' }), 'offset.jpg');
  const still = (await marco('POST', `/api/orders/${id}/media/stills`, stillForm)) as { media: { id: string } };
  await marco('PUT', `/api/media/${still.media.id}/markup`, {
    baseVersion: 0,
    markup: { shapes: [{ id: 'm1', type: 'ellipse', colour: 'flare', x: 0.62, y: 0.18, w: 0.34, h: 0.62 }] },
  });
  await marco('PUT', `/api/orders/${id}/inspection`, {
    baseVersion: 0,
    document: {
      id,
      property: { yearBuilt: 1931, type: 'single_family', notes: '' },
      accessPoints: [{ id: 'ap-1', kind: 'cleanout_two_way', locationNote: 'By the sidewalk', offsetFromBuilding: feet(30) }],
      runs: [
        {
          id: 'run-1',
          accessPointId: 'ap-1',
          direction: 'toward_main',
          distanceReached: feet(24),
          endReason: 'reached_main',
          videoFileId: video.media.id,
          sections: [{ id: 'sec-1', from: 0, to: feet(24), material: 'vitrified_clay', diameterIn: 4 }],
          observations: [
            { id: 'obs-roots', kind: 'roots', at: feetAndInches(6, 8), severity: 3, videoTime: 1.6 },
            {
              id: 'obs-offset',
              kind: 'joint_offset',
              at: feet(9),
              severity: 4,
              note: 'Step at the joint catches paper.',
              videoTime: 2.7,
              stillIds: [still.media.id],
            },
            { id: 'obs-main', kind: 'main_connection', at: feet(24) },
          ],
        },
      ],
      checkedNotFound: ['collapse', 'sag'],
    },
  });
  return id;
}

beforeAll(async () => {
  browser = await launchBrowser();
  workDir = mkdtempSync(path.join(tmpdir(), 'underfoot-portal-'));
  const { context, page } = await newPage(browser, 'desktop');
  try {
    orderId = await arrangeRecordedOrder(page);
  } finally {
    await context.close();
  }
});
afterAll(async () => {
  await browser?.close();
  rmSync(workDir, { recursive: true, force: true });
});

describe('review, publish and read', () => {
  it('the office reviews the computed grade and publishes the report', async () => {
    const { context, page } = await newPage(browser, 'desktop');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, account('dana').email);
      await page.goto(`${baseUrl}/office/reports/${orderId}`);
      await page.getByRole('heading', { level: 1, name: new RegExp(street) }).waitFor();
      await page.getByRole('region', { name: 'Condition grade' }).getByText('Repair now').first().waitFor();
      await screenshot(page, 'report-review-desktop');
      await page.getByRole('button', { name: 'Publish the report' }).click();
      await page.getByRole('tab', { name: /Published report \(1\)/, selected: true }).waitFor();
      await page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('the buyer reads it on a phone: the grade first, a pin to its finding, the still, the video, a question and the PDF', async () => {
    const { context, page } = await newPage(browser, 'phone');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, account('riley').email);
      await page.getByRole('heading', { level: 1, name: 'Your reports' }).waitFor();
      await page
        .getByRole('link', { name: new RegExp(street) })
        .first()
        .click();
      await page.waitForURL(new RegExp(`/portal/reports/${orderId}`));
      await page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
      await page.getByRole('heading', { level: 3, name: 'What this means for you' }).waitFor();
      // Phone first: nothing wider than the screen.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
      await screenshot(page, 'report-buyer-phone');

      // A pin on the diagram leads to its finding.
      await page.locator('#diagram svg a[href="#report-finding-obs-offset"] path').first().click();
      await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('report-finding-obs-offset');
      const finding = page.locator('#report-finding-obs-offset');
      await finding.getByRole('heading', { name: '2. Joint offset' }).waitFor();

      // The marked-up still, enlarged.
      await finding.getByRole('button', { name: /Joint offset, picture 1, marked up/ }).click();
      const still = page.getByRole('dialog', { name: /Joint offset/ });
      await still.waitFor();
      await expect.poll(() => still.locator('img').evaluate((img: HTMLImageElement) => img.naturalWidth)).toBeGreaterThan(0);
      // The dialog as the phone shows it (a full-page picture would put it mid-page).
      await page.screenshot({ path: path.join(screenshotDir, 'report-still-phone.png') });
      await still.getByRole('button', { name: 'Close' }).click();
      await still.waitFor({ state: 'hidden' });

      // The video, at the moment of the finding (served with byte ranges).
      await finding.getByRole('button', { name: /Watch in the video/ }).click();
      const player = page.getByRole('dialog', { name: /in the video at 0:02/ });
      await player.waitFor();
      await expect
        .poll(() => player.locator('video').evaluate((v: HTMLVideoElement) => v.currentTime), { timeout: 10_000 })
        .toBeCloseTo(2.7, 0);
      await player.getByRole('button', { name: 'Close' }).click();

      // A question for the inspector.
      await page.getByLabel('Your question').fill('Does the offset need fixing before we close?');
      await page.getByRole('button', { name: 'Send the question' }).click();
      await page.getByRole('region', { name: 'Questions' }).getByText('Does the offset need fixing before we close?').waitFor();

      // The PDF.
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.getByRole('link', { name: 'Download the PDF' }).first().click(),
      ]);
      expect(download.suggestedFilename()).toMatch(/^sewer-line-report-.*weir-gate-road\.pdf$/);
      const file = await download.path();
      const bytes = readFileSync(file);
      expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
      expect(bytes.length).toBeLessThan(3_000_000);
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }

    const desktop = await newPage(browser, 'desktop');
    try {
      await signIn(desktop.page, account('riley').email);
      await desktop.page.goto(`${baseUrl}/portal/reports/${orderId}`);
      await desktop.page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
      await screenshot(desktop.page, 'report-buyer-desktop');
    } finally {
      await desktop.context.close();
    }
  });

  it("sends the grade in the page's first HTML to its reader only, and the app then takes the page over", async () => {
    /** The raw HTML of the report page, as a browser's first request gets it. */
    const firstHtml = async (email: string | null) => {
      let cookie = '';
      if (email) {
        const csrf = await fetch(`${baseUrl}/api/auth/csrf`);
        cookie = csrf.headers.get('set-cookie')!.match(/underfoot\.sid=[^;]+/)![0];
        const { token } = (await csrf.json()) as { token: string };
        const signedIn = await fetch(`${baseUrl}/api/auth/sign-in`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': token },
          body: JSON.stringify({ email, password: DEMO_PASSWORD }),
        });
        expect(signedIn.status).toBe(200);
        cookie = signedIn.headers.get('set-cookie')!.match(/underfoot\.sid=[^;]+/)![0];
      }
      const res = await fetch(`${baseUrl}/portal/reports/${orderId}`, { headers: { cookie } });
      expect(res.status).toBe(200);
      return { html: await res.text(), cacheControl: res.headers.get('cache-control') };
    };
    const { html: buyers, cacheControl } = await firstHtml(account('riley').email);
    // The page holds a person's report: never kept by a shared cache.
    expect(cacheControl).toBe('no-store');
    expect(buyers).toContain('data-first-view');
    expect(buyers).toMatch(/<h2 id="grade-title"[^>]*>Repair now<\/h2>/);
    expect(buyers).toContain('What this means for you');
    // Signed out, or the seller before the buyer's side shares it: the plain app page, nothing of the report.
    for (const { html } of [await firstHtml(null), await firstHtml(account('walt').email)]) {
      expect(html).not.toContain('data-first-view');
      expect(html).not.toContain('Repair now');
      expect(html).not.toContain(street);
    }

    // In the browser the app renders over the first view, and the page works as usual.
    const { context, page } = await newPage(browser, 'phone');
    const errors = collectPageErrors(page);
    try {
      await signIn(page, account('riley').email);
      await page.goto(`${baseUrl}/portal/reports/${orderId}`);
      await page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
      await page.getByRole('region', { name: 'Questions' }).waitFor();
      expect(await page.getByRole('heading', { level: 2, name: 'Repair now' }).count()).toBe(1);
      await page.getByRole('heading', { name: 'In short' }).waitFor();
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('the agent shares a link that a guest opens without an account, then revokes it', async () => {
    const { context, page } = await newPage(browser, 'desktop');
    const errors = collectPageErrors(page);
    await signIn(page, account('theo').email);
    await page.goto(`${baseUrl}/portal/reports/${orderId}`);
    const links = page.getByRole('region', { name: 'Share links' });
    await links.getByLabel('Who is it for?').fill('Lender');
    await links.getByRole('button', { name: 'Make a link' }).click();
    const url = await links.getByRole('textbox', { name: 'The new link' }).inputValue();
    expect(url).toContain('/shared/');
    // The buyer opened it: the ordering agent sees who, and when.
    await page.getByRole('region', { name: 'Who opened it' }).getByText('Riley Hartmann').first().waitFor();
    await screenshot(page, 'report-agent-desktop');
    expect(errors).toEqual([]);

    /** The raw HTML of the link's page, as a browser's first request gets it. */
    const firstHtml = async () => {
      const res = await fetch(url);
      expect(res.status).toBe(200);
      return { html: await res.text(), cacheControl: res.headers.get('cache-control') };
    };
    // The guest's phone gets the grade in the page's first HTML too; the page is never kept by a shared cache.
    const first = await firstHtml();
    expect(first.cacheControl).toBe('no-store');
    expect(first.html).toContain('data-first-view');
    expect(first.html).toMatch(/<h2 id="grade-title"[^>]*>Repair now<\/h2>/);
    // The server cannot know the reader's time zone, so its copy of the expiry says which zone it is in.
    expect(first.html).toMatch(/Shared with you to read\. This link works until [^<]+ UTC\./);

    const guest = await newPage(browser, 'phone');
    const guestErrors = collectPageErrors(guest.page);
    try {
      await guest.page.goto(url);
      await guest.page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
      await guest.page.getByText(/Shared with you to read/).waitFor();
      // The app has taken over from the first view: one grade, and the rest of the report below it.
      await guest.page.getByRole('heading', { name: 'In short' }).waitFor();
      expect(await guest.page.getByRole('heading', { level: 2, name: 'Repair now' }).count()).toBe(1);
      const img = guest.page.locator('#report-finding-obs-offset img').first();
      await img.scrollIntoViewIfNeeded();
      await expect.poll(() => img.evaluate((i: HTMLImageElement) => i.naturalWidth)).toBeGreaterThan(0);
      await screenshot(guest.page, 'report-guest-phone');
      // (Checked before the link is revoked: then the app's read is a 404, which the console reports.)
      expect(guestErrors).toEqual([]);

      await page
        .getByRole('region', { name: 'Share links' })
        .getByRole('button', { name: /Revoke/ })
        .click();
      await page
        .getByRole('region', { name: 'Share links' })
        .getByText(/Revoked/)
        .waitFor();
      // A revoked link's page carries nothing of the report, not even in its first HTML.
      const revoked = await firstHtml();
      expect(revoked.html).not.toContain('data-first-view');
      expect(revoked.html).not.toContain('Repair now');
      expect(revoked.html).not.toContain(street);
      await guest.page.reload();
      await guest.page.getByRole('heading', { name: 'This link does not open a report' }).waitFor();
    } finally {
      await guest.context.close();
      await context.close();
    }
  });

  it('passes axe with no serious or critical violations, on a 390 px phone and on a desktop', async () => {
    for (const size of ['phone-390', 'desktop'] as const) {
      const { context, page } = await sized(browser, size, { axe: true });
      try {
        await signIn(page, account('riley').email);
        await page.goto(`${baseUrl}/portal/reports/${orderId}`);
        await page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
        await page.getByRole('region', { name: 'Questions' }).waitFor();
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(size === 'desktop' ? 1280 : 390);
        // The desktop picture is taken by the reading test above.
        if (size === 'phone-390') await screenshot(page, 'report-buyer-phone-390');
        expect(await seriousViolations(page), size).toEqual([]);
      } finally {
        await context.close();
      }
    }
  });

  it("the buyer's agent shares the report with the seller's side; the seller reads it then, and not before", async () => {
    const seller = await sized(browser, 'phone-390');
    try {
      await signIn(seller.page, account('walt').email);
      await seller.page.goto(`${baseUrl}/portal/reports/${orderId}`);
      await seller.page.getByRole('heading', { name: 'We could not find that report' }).waitFor();
      expect(await seller.page.getByText('Repair now').count()).toBe(0);
      await screenshot(seller.page, 'report-seller-before-phone-390');

      const agent = await newPage(browser, 'desktop');
      try {
        await signIn(agent.page, account('theo').email);
        await agent.page.goto(`${baseUrl}/portal/reports/${orderId}`);
        await agent.page.getByRole('button', { name: 'Share with the seller’s side' }).click();
        await agent.page.getByText('Shared with the seller’s side').first().waitFor();
        await agent.page.getByRole('button', { name: 'Withdraw sharing' }).waitFor();
      } finally {
        await agent.context.close();
      }

      const errors = collectPageErrors(seller.page);
      await seller.page.reload();
      await seller.page.getByRole('heading', { level: 2, name: 'Repair now' }).waitFor();
      // The other side reads; sharing onward and the view log stay with the buyer's side.
      expect(await seller.page.getByRole('region', { name: 'Share links' }).count()).toBe(0);
      expect(await seller.page.getByRole('button', { name: /Share with the/ }).count()).toBe(0);
      expect(await seller.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
      await screenshot(seller.page, 'report-seller-phone-390');
      expect(errors).toEqual([]);
    } finally {
      await seller.context.close();
    }
  });
});
