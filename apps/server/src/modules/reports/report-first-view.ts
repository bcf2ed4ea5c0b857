import { existsSync, readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import path from 'node:path';
import Beasties from 'beasties';
import type { RequestHandler } from 'express';
import { LRUCache } from 'lru-cache';
import { homeAreaOf, type CurrentUser } from '@underfoot/core';
import type { Logger } from 'pino';
import { HttpError } from '../../http/errors.ts';
import { publicUser, type UserRecord } from '../auth/users.repo.ts';
import type { ReportsService } from './reports.service.ts';

/** The web app's server entry (apps/web/src/app/report-first-view.server.tsx, built by `npm run build`). */
interface FirstViewRenderer {
  renderReportFirstView(input: { url: string; user: CurrentUser; report: unknown; revision: number | null }): Promise<string>;
}

const ROOT_ELEMENT = '<div id="root"></div>';
const STYLESHEET_LINK = /<link rel="stylesheet"[^>]*href="\/assets\/[\w.-]+\.css"[^>]*>/g;
const MODULE_PRELOAD = /<link rel="modulepreload"[^>]*>/g;

/**
 * The page around a first view. On a slow line every byte before the first paint counts:
 *  - only the CSS the first view uses goes inline in the head (computed with beasties);
 *  - the app's whole stylesheet moves to the end of the body, where it no longer holds back
 *    the paint of what comes before it;
 *  - the module preloads go and the app's script is fetched at low priority: they would share
 *    the line with the page, and the page is already readable while the scripts arrive.
 * The content security policy allows inline styles (and no inline script, which none of this needs).
 */
function firstViewPage(indexHtml: string) {
  const stylesheets = indexHtml.match(STYLESHEET_LINK) ?? [];
  const shell = indexHtml
    .replace(STYLESHEET_LINK, '')
    .replace(MODULE_PRELOAD, '')
    .replace('<script type="module"', '<script type="module" fetchpriority="low"');
  return (criticalCss: string, rootHtml: string) =>
    shell
      .replace('</head>', `<style>${criticalCss}</style></head>`)
      .replace(ROOT_ELEMENT, `<div id="root" data-first-view="">${rootHtml}</div>`)
      .replace('</body>', `${stylesheets.join('')}</body>`);
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
 * GET /portal/reports/:orderId for a signed-in reader: the app's page with the top of the
 * report (header, grade, what it means) already in the HTML. A reader on a slow phone sees the
 * grade after a few kilobytes instead of after the whole app; the app then renders over it.
 * Anyone else (signed out, another area, a report they may not see) gets the plain app page,
 * which shows them what it shows everyone: sign-in, or "not found".
 */
export function reportFirstView(deps: { reports: ReportsService; webDistDir: string; serverEntry: string; log: Logger }): RequestHandler {
  const indexHtml = readFileSync(path.join(deps.webDistDir, 'index.html'), 'utf8');
  const stylesheets = indexHtml.match(STYLESHEET_LINK) ?? [];
  const page = firstViewPage(indexHtml);
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
  const beasties = new Beasties({ path: deps.webDistDir, publicPath: '/', logLevel: 'silent', pruneSource: false, inlineFonts: false });
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

  return async (req, res, next) => {
    const user = req.user as UserRecord | undefined;
    const render = await loadRenderer();
    if (!user || !render || homeAreaOf[user.role] !== 'portal' || !indexHtml.includes(ROOT_ELEMENT)) return next();
    const revisionParam = Number(req.query.revision);
    const revision = Number.isInteger(revisionParam) && revisionParam > 0 ? revisionParam : null;
    let report: unknown;
    try {
      report = await deps.reports.read(user, String(req.params.orderId), { revision: revision ?? undefined, ip: req.ip });
    } catch (error) {
      // Not found, not theirs: the app page says so in its own words.
      if (error instanceof HttpError && error.status < 500) return next();
      throw error;
    }
    let html: string;
    try {
      const rootHtml = await render.renderReportFirstView({
        url: new URL(req.originalUrl, 'http://underfoot.local').href,
        user: publicUser(user),
        report,
        revision,
      });
      html = page(await criticalCssFor(rootHtml), rootHtml);
    } catch (error) {
      // The page still works without its head start.
      deps.log.error({ err: error }, 'the report first view could not be rendered');
      return next();
    }
    res.set('Cache-Control', 'no-store').type('html').send(html);
  };
}
