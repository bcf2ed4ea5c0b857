import { describe, expect, it } from 'vitest';
import { demoPriceBook, priceBookSchema } from '../costing/price-book.ts';
import { feet } from '../footage/footage.ts';
import { auditActionLabel } from './audit-actions.ts';
import { centsToDollarsText, parseDollars } from './money-text.ts';
import { compareSampleCosts, sampleCostOptions } from './price-book-preview.ts';
import { priceBookFormSchema, priceBookToFormValues } from './price-book-form.ts';
import { auditQuerySchema, companyProfileSchema, feeItemFormSchema, passwordChangeSchema } from './schemas.ts';

describe('dollar amounts typed in forms', () => {
  it.each([
    ['325', 32500],
    ['324.5', 32450],
    ['324.50', 32450],
    ['$1,250.05', 125005],
    ['0.29', 29],
    [' 12 ', 1200],
  ])('"%s" is %i cents', (text, cents) => {
    expect(parseDollars(text)).toBe(cents);
  });

  it.each(['', 'abc', '1.234', '1,25', '12..5', '-5'])('"%s" is not an amount', (text) => {
    expect(parseDollars(text)).toBeNull();
  });

  it('round-trips cents through the text a field shows', () => {
    for (const cents of [0, 5, 29, 100, 32450, 125005]) expect(parseDollars(centsToDollarsText(cents))).toBe(cents);
  });
});

describe('fee form', () => {
  it('parses the price to cents under the API field name', () => {
    const parsed = feeItemFormSchema.parse({ kind: 'add_on', name: 'Second access point', priceCents: '95' });
    expect(parsed).toMatchObject({ priceCents: 9500, description: '', active: true });
  });

  it('says why a price is refused, on priceCents', () => {
    const result = feeItemFormSchema.safeParse({ kind: 'add_on', name: 'X ray', priceCents: '-4' });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]).toMatchObject({ path: ['priceCents'], message: 'A price cannot be negative.' });
  });
});

describe('price book form', () => {
  it('turns the defaults into form values and back without change', () => {
    const parsed = priceBookFormSchema.parse(priceBookToFormValues(demoPriceBook));
    expect(parsed).toEqual(demoPriceBook);
  });

  it('reports low above high on the same path as the API schema', () => {
    const values = priceBookToFormValues(demoPriceBook);
    values.items.spot_repair.lowCents = '4000';
    const form = priceBookFormSchema.safeParse(values);
    const book = structuredClone(demoPriceBook);
    book.items.spot_repair.lowCents = 400_000;
    const api = priceBookSchema.safeParse(book);
    const pathOf = (r: typeof form | typeof api) => r.error?.issues.map((i) => i.path.join('.'));
    expect(pathOf(form)).toEqual(['items.spot_repair.highCents']);
    expect(pathOf(api)).toEqual(pathOf(form));
  });

  it('refuses a unit outside the item’s fixed unit', () => {
    const book = structuredClone(demoPriceBook) as unknown as { items: Record<string, { unit: string }> };
    book.items.full_lining!.unit = 'per_visit';
    const result = priceBookSchema.safeParse(book);
    expect(result.error?.issues[0]).toMatchObject({
      path: ['items', 'full_lining', 'unit'],
      message: 'Cured-in-place lining is priced per foot.',
    });
  });

  it('parses the dig depth as the trade writes it', () => {
    const values = priceBookToFormValues(demoPriceBook);
    values.depth.includedDepth = '6 ft';
    expect(priceBookFormSchema.parse(values).depth.includedDepth).toBe(feet(6));
  });
});

describe('price book preview on the sample inspection', () => {
  it('offers cleaning, spot repairs, liners and the full-length methods', () => {
    const kinds = sampleCostOptions(demoPriceBook).options.map((o) => o.kind);
    expect(kinds).toEqual(['cleaning', 'spot_repairs', 'sectional_liners', 'line_runs', 'burst_runs', 'replace_runs']);
  });

  it('moves the ranges that use an edited price, and only those', () => {
    const edited = structuredClone(demoPriceBook);
    edited.items.spot_repair = { ...edited.items.spot_repair, lowCents: 200_000, highCents: 500_000 };
    const rows = compareSampleCosts(demoPriceBook, edited);
    const byKind = Object.fromEntries(rows.map((r) => [r.kind, r]));
    expect(byKind.spot_repairs!.after!.highCents).toBeGreaterThan(byKind.spot_repairs!.before.highCents);
    // Bursting never digs a repair pit: its range stays.
    expect(byKind.burst_runs!.after).toEqual(byKind.burst_runs!.before);
    // Cleaning uses no dig price either.
    expect(byKind.cleaning!.after).toEqual(byKind.cleaning!.before);
  });

  it('shows no new range while the edits do not validate', () => {
    expect(compareSampleCosts(demoPriceBook, null).every((r) => r.after === null)).toBe(true);
  });

  it('scales every range with the regional factor', () => {
    const rows = compareSampleCosts(demoPriceBook, { ...demoPriceBook, regionalFactor: 2 });
    for (const row of rows) expect(row.after!.highCents).toBeGreaterThan(row.before.highCents);
  });
});

describe('other company forms', () => {
  it('knows real time zones and refuses made-up ones', () => {
    const base = { name: 'Bramblewood Drain & Camera', timeZone: 'America/Los_Angeles' };
    expect(companyProfileSchema.safeParse(base).success).toBe(true);
    const wrong = companyProfileSchema.safeParse({ ...base, timeZone: 'Alder/Falls' });
    expect(wrong.error?.issues[0]?.path).toEqual(['timeZone']);
  });

  it('refuses a new password equal to the current one', () => {
    const result = passwordChangeSchema.safeParse({ currentPassword: 'same old passphrase', newPassword: 'same old passphrase' });
    expect(result.error?.issues[0]?.path).toEqual(['newPassword']);
  });

  it('refuses an audit date range that ends before it starts', () => {
    const result = auditQuerySchema.safeParse({ from: '2027-03-14T00:00:00Z', to: '2027-03-13T00:00:00Z' });
    expect(result.error?.issues[0]?.path).toEqual(['to']);
  });

  it('names known audit actions and shows unknown codes as they are', () => {
    expect(auditActionLabel('user.role_changed')).toBe('Changed a role');
    expect(auditActionLabel('something.new')).toBe('something.new');
  });
});
