import { createHash } from 'node:crypto';
import type { CheckoutLine } from './session-params.ts';

/**
 * The hosted checkout page of the local payment stand-in: our own plain design, no scripts, two real
 * form buttons. It says plainly that it is a test page, so nobody mistakes it for a real payment.
 */

const STYLE = `
:root { color-scheme: light; --ink: #1c2426; --muted: #55605f; --paper: #f3f1ea; --card: #ffffff; --line: #d6d1c4;
  --go: #1d5a44; --go-dark: #143f30; --warn-bg: #fff1c7; --warn-line: #9a6100; --focus: #1f4fd1; }
* { box-sizing: border-box; }
body { margin: 0; font: 1rem/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif;
  color: var(--ink); background: var(--paper); }
.test-notice { margin: 0; padding: 0.75rem 1rem; background: var(--warn-bg); border-bottom: 2px solid var(--warn-line); text-align: center; }
main { max-width: 32rem; margin: 2rem auto; padding: 1.5rem; background: var(--card); border: 1px solid var(--line); border-radius: 0.5rem; }
h1 { font-size: 1.5rem; line-height: 1.25; margin: 0 0 0.5rem; }
p { margin: 0.5rem 0; }
.muted { color: var(--muted); }
table { width: 100%; border-collapse: collapse; margin: 1.25rem 0 0.5rem; }
caption { text-align: left; font-weight: 600; padding-bottom: 0.25rem; }
th, td { padding: 0.5rem 0; border-bottom: 1px solid var(--line); text-align: left; vertical-align: top; }
thead th { font-size: 0.875rem; color: var(--muted); font-weight: 600; }
.num { text-align: right; padding-left: 1rem; white-space: nowrap; font-variant-numeric: tabular-nums; }
.item-note { display: block; font-size: 0.875rem; color: var(--muted); }
tfoot th, tfoot td { border-bottom: 0; font-weight: 700; font-size: 1.125rem; padding-top: 0.75rem; }
.actions { display: flex; flex-direction: column; gap: 0.75rem; margin-top: 1.5rem; }
form { margin: 0; }
button, .link-button { display: block; width: 100%; min-height: 2.75rem; padding: 0.75rem 1rem; border-radius: 0.375rem;
  font: inherit; font-weight: 600; text-align: center; text-decoration: none; cursor: pointer; }
.pay { color: #ffffff; background: var(--go); border: 2px solid var(--go); font-variant-numeric: tabular-nums; }
.pay:hover { background: var(--go-dark); border-color: var(--go-dark); }
.decline, .link-button { color: var(--ink); background: transparent; border: 2px solid var(--ink); }
.decline:hover, .link-button:hover { background: var(--paper); }
button:focus-visible, a:focus-visible { outline: 3px solid var(--focus); outline-offset: 2px; }
@media (max-width: 36rem) { main { margin: 0; border-left: 0; border-right: 0; border-radius: 0; } }
`;

const STYLE_HASH = `'sha256-${createHash('sha256').update(STYLE).digest('base64')}'`;

const escapeHtml = (text: string): string =>
  text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

/** Minor units to a display amount, e.g. 35000 usd → "$350.00"; zero-decimal currencies keep their units. */
export function formatMoney(minor: number, currency: string): string {
  const format = new Intl.NumberFormat('en-US', { style: 'currency', currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(minor / 10 ** digits);
}

/**
 * Headers for every page: a CSP that allows only this page's own stylesheet (by hash) and form posts to
 * itself plus the sites it redirects to (browsers apply form-action to the redirect after a post too).
 */
export function pageHeaders(redirectTargets: (string | null)[]): Record<string, string> {
  const origins = new Set<string>();
  for (const target of redirectTargets) if (target) origins.add(new URL(target).origin);
  const formAction = ["'self'", ...origins].join(' ');
  return {
    'Content-Type': 'text/html; charset=utf-8',
    'Content-Security-Policy': `default-src 'none'; style-src ${STYLE_HASH}; form-action ${formAction}; base-uri 'none'; frame-ancestors 'none'`,
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer',
    'Cache-Control': 'no-store',
  };
}

function layout(heading: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>Test checkout — no real money moves</title>
<style>${STYLE}</style>
</head>
<body>
<p class="test-notice" role="note"><strong>Local test checkout.</strong> This page stands in for the payment provider on this machine. No card is asked for and no real money moves.</p>
<main>
<h1>${escapeHtml(heading)}</h1>
${body}
</main>
</body>
</html>
`;
}

export interface CheckoutView {
  lines: CheckoutLine[];
  currency: string;
  amountTotal: number;
  customerEmail: string | null;
  clientReferenceId: string | null;
}

/** The open checkout: what is being paid for, the total, and the two choices. Form actions are relative so a path prefix in front of the fake still works. */
export function renderCheckoutPage(sessionId: string, view: CheckoutView): string {
  const money = (minor: number) => escapeHtml(formatMoney(minor, view.currency));
  const rows = view.lines
    .map(
      (line) => `<tr>
<td>${escapeHtml(line.name)}${line.description ? `<span class="item-note">${escapeHtml(line.description)}</span>` : ''}</td>
<td class="num">${line.quantity}</td>
<td class="num">${money(line.amountTotal)}</td>
</tr>`,
    )
    .join('\n');
  const total = money(view.amountTotal);
  const id = encodeURIComponent(sessionId);
  const body = `<p class="muted">Check the amount, then pay or decline. Either way you return to the site that sent you here.</p>
${view.clientReferenceId ? `<p>Reference: <strong>${escapeHtml(view.clientReferenceId)}</strong></p>` : ''}
<table>
<caption>What you are paying for</caption>
<thead><tr><th scope="col">Item</th><th scope="col" class="num">Qty</th><th scope="col" class="num">Amount</th></tr></thead>
<tbody>
${rows}
</tbody>
<tfoot><tr><th scope="row" colspan="2">Total</th><td class="num">${total}</td></tr></tfoot>
</table>
${view.customerEmail ? `<p class="muted">Receipt to ${escapeHtml(view.customerEmail)}</p>` : ''}
<div class="actions">
<form method="post" action="${id}/pay"><button type="submit" class="pay">Pay ${total}</button></form>
<form method="post" action="${id}/decline"><button type="submit" class="decline">Decline payment</button></form>
</div>`;
  return layout('Test checkout', body);
}

/** A short page for every other state: already paid, expired, declined, not found, provider down. */
export function renderNoticePage(heading: string, message: string, link?: { href: string; label: string }): string {
  const action = link
    ? `<div class="actions"><a class="link-button" href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></div>`
    : '';
  return layout(heading, `<p>${escapeHtml(message)}</p>\n${action}`);
}
