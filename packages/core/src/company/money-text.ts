import { z } from 'zod';

/**
 * Amounts as people type them in a form ("325", "$1,250.50") and as the API
 * carries them (integer cents). The form schemas keep the API's field names, so
 * an error the server finds lands on the same field in the browser.
 */

const DOLLARS = /^\d+(\.\d{1,2})?$/;

/** "$1,250.50" → 125050; null when it is not an amount of dollars and cents. */
export function parseDollars(text: string): number | null {
  const cleaned = text
    .trim()
    .replace(/^\$/, '')
    .replace(/,(?=\d{3}(\D|$))/g, '')
    .trim();
  if (!DOLLARS.test(cleaned)) return null;
  const [whole = '0', fraction = ''] = cleaned.split('.');
  // String arithmetic, not floats: 0.29 * 100 is 28.999… in binary.
  return Number(whole) * 100 + Number(fraction.padEnd(2, '0'));
}

/** 125050 → "1250.50", 32500 → "325": what a price field shows. */
export function centsToDollarsText(cents: number): string {
  const whole = Math.trunc(cents / 100);
  const rest = Math.abs(cents % 100);
  return rest === 0 ? String(whole) : `${whole}.${String(rest).padStart(2, '0')}`;
}

/** A price field: dollars typed by a person, parsed to integer cents. */
export const dollarsTextSchema = z.string({ error: 'Enter an amount in dollars.' }).transform((text, ctx) => {
  const trimmed = text.trim();
  if (trimmed === '') {
    ctx.addIssue({ code: 'custom', message: 'Enter an amount in dollars, like 325 or 324.50.', input: text });
    return z.NEVER;
  }
  if (trimmed.startsWith('-')) {
    ctx.addIssue({ code: 'custom', message: 'A price cannot be negative.', input: text });
    return z.NEVER;
  }
  const cents = parseDollars(trimmed);
  if (cents === null) {
    ctx.addIssue({ code: 'custom', message: `"${trimmed}" is not an amount. Write it like 325 or 324.50.`, input: text });
    return z.NEVER;
  }
  return cents;
});

/** A plain decimal typed by a person ("1.15"), parsed to a number. */
export const decimalTextSchema = z.string({ error: 'Enter a number.' }).transform((text, ctx) => {
  const trimmed = text.trim();
  if (!/^\d+(\.\d+)?$/.test(trimmed)) {
    ctx.addIssue({ code: 'custom', message: 'Enter a number like 1 or 1.15.', input: text });
    return z.NEVER;
  }
  return Number(trimmed);
});

/** A whole number typed by a person ("25"). */
export const wholeNumberTextSchema = z.string({ error: 'Enter a whole number.' }).transform((text, ctx) => {
  const trimmed = text.trim();
  if (!/^\d+$/.test(trimmed)) {
    ctx.addIssue({ code: 'custom', message: 'Enter a whole number, like 10.', input: text });
    return z.NEVER;
  }
  return Number(trimmed);
});
