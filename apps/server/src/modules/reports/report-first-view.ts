import { existsSync, readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import path from 'node:path';
import Beasties from 'beasties';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { LRUCache } from 'lru-cache';
import { homeAreaOf, revisionFromQuery, type CurrentUser } from '@underfoot/core';
import type { Logger } from 'pino';
import { HttpError } from '../../http/errors.ts';
import { publicUser, type UserRecord } from '../auth/users.repo.ts';
import type { ReportsService } from './reports.service.ts';

/** The web app's server entry (apps/web/src/app/report-first-view.server.tsx, built by `npm run build`). */
interface FirstViewRenderer {
  renderReportFirstView(input: { url: string; user: CurrentUser; report: unknown; revision: number | null }): Promise<string>;
  renderSharedReportFirstView(input: { url: string; token: string; report: unknown }): Promise<string>;
}

const ROOT_ELEMENT = '<div id="root"></div>';
const STYLESHEET_LINK = /<link rel="stylesheet"[^>]*href="\/assets\/[\w.-]+\.css"[^>]*>/g;
const MODULE_PRELOAD = /<link rel="modulepreload"[^>]*>/g;
const ENTRY_SCRIPT = /<script type="module"[^>]*src="(\/assets\/[\w.-]+\.js)"[^>]*><\/script>/;
/** A tiny external script (the content security policy allows no inline one) that starts the app after the first paint. */
export const FIRST_VIEW_BOOT_PATH = '/first-view-boot.js';

/**
 * The page around a first view. On a slow line every byte before the first paint counts:
 *  - only the CSS the first view uses goes inline in the head (computed with beasties);
 *  - the app's stylesheet and scripts start loading after the first paint (the boot script at
 *    FIRST_VIEW_BOOT_PATH), not before: on a slow line they would share it with the page, and
 *    on a slow phone their parsing would hold the paint back. The page is readable meanwhile.
 * The content security policy allows inline styles (and no inline script, which none of this needs).
 */
function firstViewPage(indexHtml: string) {
  const shell = indexHtml
    .replace(STYLESHEET_LINK, '')
    .replace(MODULE_PRELOAD, '')
    .replace(ENTRY_SCRIPT, `<script type="module" src="${FIRST_VIEW_BOOT_PATH}"></script>`);
  return (criticalCss: string, rootHtml: string) =>
    shell
      .replace('</head>', `<style>${criticalCss}</style></head>`)
      .replace(ROOT_ELEMENT, `<div id="root" data-first-view="">${rootHtml}</div>`);
}

/**
 * After the first paint (requestAnimationFrame runs just before a paint, the timeout just after
 * it): add the app's stylesheet, and once it is in, load the app, so it never draws unstyled.
 */
function bootScript(stylesheetHrefs: string[], entry: string): string {
  return `requestAnimationFrame(() => setTimeout(() => {
  const sheets = ${JSON.stringify(stylesheetHrefs)}.map((href) => new Promise((done) => {
    const link = Object.assign(document.createElement('link'), { rel: 'stylesheet', href });
    link.addEventListener('load', done);
    link.addEventListener('error', done);
    document.head.append(link);
  }));
  Promise.all(sheets).then(() => import(${JSON.stringify(entry)}));
}));
`;
}

/**
 * What decides which CSS rules a fragment needs: its element names, ids and classes. Two
 * first views with the same set share their critical CSS, so it is worked out once per set.
 */
function selectorSignature(html: string): string {
  const tokens = new Set<string>();
  for (const m of html.matchAll(/<([a-z][\w-]*)/g)) tokens.add(m[1]!);
  for (const m of html.matchAll(/\s(?:class|id)="([^"]*)"/g)) for (const t of m[1]!.split(/\s+/)) if (t) tokens.add(t);
  return [...tokens].sort().join(' ');
}

/**
 * The report pages with the top of the report (header, grade, what it means) already in the
 * HTML: a reader on a slow phone sees the grade after a few kilobytes instead of after the
 * whole app; the app then renders over it.
 *  - GET /portal/reports/:orderId for a signed-in reader of the portal;
 *  - GET /shared/:token for a guest with a working share or disclosure link.
 * Anyone else (signed out, another area, a report they may not see, a link that does not work)
 * gets the plain app page, which shows them what it shows everyone: sign-in, or "not found".
 */
export function reportFirstView(deps: { reports: ReportsService; webDistDir: string; serverEntry: string; log: Logger }): {
  page: RequestHandler;
  sharedPage: RequestHandler;
  boot: RequestHandler;
} {
  const indexHtml = readFileSync(path.join(deps.webDistDir, 'index.html'), 'utf8');
  const stylesheets = indexHtml.match(STYLESHEET_LINK) ?? [];
  const pageAround = firstViewPage(indexHtml);
  const entry = ENTRY_SCRIPT.exec(indexHtml)?.[1];
  const boot: RequestHandler = (_req, res) => {
    const hrefs = stylesheets.map((link) => /href="([^"]+)"/.exec(link)?.[1]).filter((href): href is string => Boolean(href));
    res
      .set('Cache-Control', 'no-cache')
      .type('text/javascript')
      .send(entry ? bootScript(hrefs, entry) : '');
  };
  // Beasties leaves out every @font-face; the local fallbacks adjusted to Inter's measurements
  // (no download) go back in, so the first view already breaks its lines as the app will.
  const fallbackFaces = stylesheets
    .flatMap((link) => {
      const href = /href="([^"]+)"/.exec(link)?.[1];
      const file = href ? path.join(deps.webDistDir, href) : '';
      return file && existsSync(file)
        ? (readFileSync(file, 'utf8').match(/@font-face\{font-family:"?Inter fallback"?;[^}]*\}/g) ?? [])
        : [];
    })
    .join('');
  const beasties = new Beasties({
    path: deps.webDistDir,
    publicPath: '/',
    logLevel: 'silent',
    pruneSource: false,
    inlineFonts: false,
    // Tailwind's spacing between children (`:where(.space-y-8 > :not(:last-child))`) is not matched
    // against the page by beasties; without it the first view would sit tighter than the app.
    allowRules: [/^:where\(/],
  });
  const criticalCss = new LRUCache<string, Promise<string>>({ max: 50 });
  const criticalCssFor = (rootHtml: string) => {
    const key = selectorSignature(rootHtml);
    let css = criticalCss.get(key);
    if (!css) {
      css = beasties
        .process(`<html><head>${stylesheets.join('')}</head><body>${rootHtml}</body></html>`)
        .then((processed) => fallbackFaces + [...processed.matchAll(/<style>([\s\S]*?)<\/style>/g)].map((m) => m[1]).join('\n'));
      criticalCss.set(key, css);
    }
    return css;
  };
  let renderer: Promise<FirstViewRenderer | null> | undefined;
  const loadRenderer = () =>
    (renderer ??= existsSync(deps.serverEntry)
      ? (import(pathToFileURL(deps.serverEntry).href) as Promise<FirstViewRenderer>)
      : Promise.resolve(null));

  const firstViewUrl = (req: Request) => new URL(req.originalUrl, 'http://underfoot.local').href;

  /**
   * Reads the report the page is about (or gives way to the app page when that is refused) and
   * sends the page with its first view. The read is the reader's first view in the view log; the
   * app's own read moments later falls in the same repeat window, so it is one view.
   */
  async function sendFirstView(
    res: Response,
    next: NextFunction,
    read: () => Promise<unknown>,
    render: (renderer: FirstViewRenderer, report: unknown) => Promise<string>,
  ) {
    if (!entry || !indexHtml.includes(ROOT_ELEMENT)) return next();
    const renderer = await loadRenderer();
    if (!renderer) return next();
    let report: unknown;
    try {
      report = await read();
    } catch (error) {
      // Not found, not theirs, a link that does not work: the app page says so in its own words.
      if (error instanceof HttpError && error.status < 500) return next();
      throw error;
    }
    let html: string;
    try {
      const rootHtml = await render(renderer, report);
      html = pageAround(await criticalCssFor(rootHtml), rootHtml);
    } catch (error) {
      // The page still works without its head start.
      deps.log.error({ err: error }, 'the report first view could not be rendered');
      return next();
    }
    res.set('Cache-Control', 'no-store').type('html').send(html);
  }

  const page: RequestHandler = async (req, res, next) => {
    const user = req.user as UserRecord | undefined;
    // Only the portal's readers get a first view; everyone else gets the app shell at once.
    if (!user || homeAreaOf[user.role] !== 'portal') return next();
    const revision = revisionFromQuery(typeof req.query.revision === 'string' ? req.query.revision : null);
    await sendFirstView(
      res,
      next,
      () => deps.reports.read(user, String(req.params.orderId), { revision: revision ?? undefined, ip: req.ip }),
      (renderer, report) => renderer.renderReportFirstView({ url: firstViewUrl(req), user: publicUser(user), report, revision }),
    );
  };

  const sharedPage: RequestHandler = async (req, res, next) => {
    const token = String(req.params.token);
    await sendFirstView(
      res,
      next,
      () => deps.reports.readShared(token, { ip: req.ip }),
      (renderer, report) => renderer.renderSharedReportFirstView({ url: firstViewUrl(req), token, report }),
    );
  };
  return { page, sharedPage, boot };
}
