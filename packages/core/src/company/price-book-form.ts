import { z } from 'zod';
import { formatFeetInches } from '../footage/footage.ts';
import { footageTextSchema } from '../model/schemas.ts';
import { priceBookSchema, priceItemKeys, priceUnits, type PriceBook, type PriceItemKey } from '../costing/price-book.ts';
import { centsToDollarsText, decimalTextSchema, dollarsTextSchema, wholeNumberTextSchema } from './money-text.ts';

/**
 * The price book as the office edits it: prices in dollars, the dig depth in
 * feet and inches, percentages as whole numbers. It parses to exactly the
 * `priceBookSchema` shape (same paths), then runs that schema, so the browser
 * and the API report the same errors on the same fields.
 */

const priceItemFormSchema = z.object({
  label: z.string({ error: 'Give the item a name.' }),
  unit: z.enum(priceUnits, { error: 'Choose a unit.' }),
  lowCents: dollarsTextSchema,
  highCents: dollarsTextSchema,
  note: z.string().optional(),
});

const itemsFormShape = Object.fromEntries(priceItemKeys.map((key) => [key, priceItemFormSchema])) as Record<
  PriceItemKey,
  typeof priceItemFormSchema
>;

export const priceBookFormSchema = z
  .object({
    currency: z.literal('USD').optional(),
    regionalFactor: decimalTextSchema,
    items: z.object(itemsFormShape),
    depth: z.object({
      includedDepth: footageTextSchema,
      extraPercentPerFootLow: wholeNumberTextSchema,
      extraPercentPerFootHigh: wholeNumberTextSchema,
    }),
  })
  .pipe(priceBookSchema);
export type PriceBookFormValues = z.input<typeof priceBookFormSchema>;

/** A stored price book as the form's starting values. */
export function priceBookToFormValues(book: PriceBook): PriceBookFormValues {
  const items = Object.fromEntries(
    priceItemKeys.map((key) => {
      const item = book.items[key];
      return [
        key,
        {
          label: item.label,
          unit: item.unit,
          lowCents: centsToDollarsText(item.lowCents),
          highCents: centsToDollarsText(item.highCents),
          note: item.note,
        },
      ];
    }),
  ) as PriceBookFormValues['items'];
  return {
    currency: 'USD',
    regionalFactor: String(book.regionalFactor),
    items,
    depth: {
      includedDepth: formatFeetInches(book.depth.includedDepth),
      extraPercentPerFootLow: String(book.depth.extraPercentPerFootLow),
      extraPercentPerFootHigh: String(book.depth.extraPercentPerFootHigh),
    },
  };
}

/** How the price book table groups its rows, in the order the office reads them. */
export const priceItemGroups: readonly { title: string; items: readonly PriceItemKey[] }[] = [
  { title: 'Cleaning and checks', items: ['root_cutting', 'hydro_jetting', 'camera_inspection'] },
  { title: 'Repairs', items: ['spot_repair', 'sectional_liner', 'full_lining', 'pipe_bursting', 'open_trench', 'add_cleanout'] },
  { title: 'Permits', items: ['permit'] },
  { title: 'Hard surfaces over a dig', items: ['surface_concrete', 'surface_asphalt', 'surface_pavers', 'surface_slab'] },
];
