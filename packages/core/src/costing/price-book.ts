import { z } from 'zod';
import { UNITS_PER_FOOT } from '../footage/footage.ts';
import { footageSchema } from '../model/schemas.ts';
import type { SurfaceKind } from '../model/kinds.ts';

export const priceUnits = ['per_visit', 'per_location', 'per_foot', 'per_square_foot'] as const;
export type PriceUnit = (typeof priceUnits)[number];

export const priceUnitNames: Record<PriceUnit, { singular: string; plural: string; per: string }> = {
  per_visit: { singular: 'visit', plural: 'visits', per: 'per visit' },
  per_location: { singular: 'location', plural: 'locations', per: 'per location' },
  per_foot: { singular: 'ft', plural: 'ft', per: 'per foot' },
  per_square_foot: { singular: 'sq ft', plural: 'sq ft', per: 'per square foot' },
};

/** Every item the cost engine knows, with the unit it is priced in. */
export const priceItemUnits = {
  root_cutting: 'per_visit',
  hydro_jetting: 'per_visit',
  spot_repair: 'per_location',
  sectional_liner: 'per_location',
  full_lining: 'per_foot',
  pipe_bursting: 'per_foot',
  open_trench: 'per_foot',
  add_cleanout: 'per_location',
  camera_inspection: 'per_visit',
  permit: 'per_visit',
  surface_concrete: 'per_square_foot',
  surface_asphalt: 'per_square_foot',
  surface_pavers: 'per_square_foot',
  surface_slab: 'per_square_foot',
} as const satisfies Record<string, PriceUnit>;

export type PriceItemKey = keyof typeof priceItemUnits;
export const priceItemKeys = Object.keys(priceItemUnits) as PriceItemKey[];

/** Which price item restores which surface; soil and lawn are put back as part of the digging price. */
export const surfaceRestorationItem: Record<SurfaceKind, PriceItemKey | null> = {
  soil: null,
  concrete: 'surface_concrete',
  asphalt: 'surface_asphalt',
  pavers: 'surface_pavers',
  building_slab: 'surface_slab',
};

const centsSchema = z
  .int({ error: 'Prices are whole cents.' })
  .min(0, 'A price cannot be negative.')
  .max(10_000_000_00, 'That price looks wrong.');

export const priceItemSchema = z
  .object({
    label: z.string().trim().min(1, 'Give the item a name.').max(120),
    unit: z.enum(priceUnits, { error: 'Choose a unit.' }),
    lowCents: centsSchema,
    highCents: centsSchema,
    /** Where the price came from, shown to the office. */
    note: z.string().trim().max(300).default(''),
  })
  .refine((item) => item.lowCents <= item.highCents, {
    error: 'The low price must not be above the high price.',
    path: ['highCents'],
  });
export type PriceItem = z.output<typeof priceItemSchema>;

const itemsShape = Object.fromEntries(priceItemKeys.map((key) => [key, priceItemSchema])) as Record<PriceItemKey, typeof priceItemSchema>;

const percentSchema = z.int({ error: 'Use a whole percent.' }).min(0).max(200);

export const priceBookSchema = z
  .object({
    currency: z.literal('USD').default('USD'),
    /** Multiplies every price, for the local market; 1 = as listed. */
    regionalFactor: z
      .number({ error: 'Enter a regional factor like 1 or 1.15.' })
      .min(0.5, 'The regional factor is between 0.5 and 3.')
      .max(3, 'The regional factor is between 0.5 and 3.')
      .refine((value) => Math.abs(value * 100 - Math.round(value * 100)) < 1e-9, 'Use at most two decimals.'),
    items: z.object(itemsShape),
    depth: z
      .object({
        /** Digging to this depth is inside the listed digging prices. */
        includedDepth: footageSchema,
        /** Extra per foot deeper than that, as a percent of the digging line. */
        extraPercentPerFootLow: percentSchema,
        extraPercentPerFootHigh: percentSchema,
      })
      .refine((d) => d.extraPercentPerFootLow <= d.extraPercentPerFootHigh, {
        error: 'The low percentage must not be above the high one.',
        path: ['extraPercentPerFootHigh'],
      }),
  })
  .superRefine((book, ctx) => {
    for (const key of priceItemKeys) {
      const expected = priceItemUnits[key];
      if (book.items[key].unit !== expected) {
        ctx.addIssue({
          code: 'custom',
          message: `${book.items[key].label} is priced ${priceUnitNames[expected].per}.`,
          path: ['items', key, 'unit'],
        });
      }
    }
  });
export type PriceBook = z.output<typeof priceBookSchema>;
export type PriceBookInput = z.input<typeof priceBookSchema>;

const dollars = (value: number) => value * 100;

const CONSUMER_GUIDES = 'Demo default from consumer cost guides (weak; CHECKS.md repair cost bands), not a quote.';
const INVENTED = 'Demo default invented for the demo: no published band in CHECKS.md.';

/**
 * The demo price book. Method prices are the CHECKS.md repair-cost bands from
 * consumer cost guides (weak, demo defaults only); items with no band there are
 * invented demo values and say so. A company replaces all of it with its own prices.
 */
export const demoPriceBook: PriceBook = {
  currency: 'USD',
  regionalFactor: 1,
  items: {
    root_cutting: {
      label: 'Root cutting',
      unit: 'per_visit',
      lowCents: dollars(150),
      highCents: dollars(500),
      note: CONSUMER_GUIDES,
    },
    hydro_jetting: {
      label: 'Hydro-jetting',
      unit: 'per_visit',
      lowCents: dollars(250),
      highCents: dollars(800),
      note: CONSUMER_GUIDES,
    },
    spot_repair: {
      label: 'Spot repair by excavation',
      unit: 'per_location',
      lowCents: dollars(1000),
      highCents: dollars(3000),
      note: CONSUMER_GUIDES,
    },
    sectional_liner: {
      label: 'Sectional liner',
      unit: 'per_location',
      lowCents: dollars(1000),
      highCents: dollars(2500),
      note: INVENTED,
    },
    full_lining: {
      label: 'Cured-in-place lining',
      unit: 'per_foot',
      lowCents: dollars(80),
      highCents: dollars(250),
      note: CONSUMER_GUIDES,
    },
    pipe_bursting: {
      label: 'Pipe bursting',
      unit: 'per_foot',
      lowCents: dollars(60),
      highCents: dollars(200),
      note: CONSUMER_GUIDES,
    },
    open_trench: {
      label: 'Open-trench replacement',
      unit: 'per_foot',
      lowCents: dollars(50),
      highCents: dollars(250),
      note: CONSUMER_GUIDES,
    },
    add_cleanout: {
      label: 'Add an outdoor cleanout',
      unit: 'per_location',
      lowCents: dollars(500),
      highCents: dollars(1500),
      note: INVENTED,
    },
    camera_inspection: {
      label: 'Camera check',
      unit: 'per_visit',
      lowCents: dollars(150),
      highCents: dollars(400),
      note: CONSUMER_GUIDES,
    },
    permit: { label: 'Permit', unit: 'per_visit', lowCents: dollars(100), highCents: dollars(500), note: INVENTED },
    surface_concrete: {
      label: 'Concrete cut and replace',
      unit: 'per_square_foot',
      lowCents: dollars(10),
      highCents: dollars(20),
      note: INVENTED,
    },
    surface_asphalt: {
      label: 'Asphalt cut and patch',
      unit: 'per_square_foot',
      lowCents: dollars(6),
      highCents: dollars(15),
      note: INVENTED,
    },
    surface_pavers: {
      label: 'Pavers lifted and relaid',
      unit: 'per_square_foot',
      lowCents: dollars(8),
      highCents: dollars(20),
      note: INVENTED,
    },
    surface_slab: {
      label: 'Floor slab cut and patch',
      unit: 'per_square_foot',
      lowCents: dollars(15),
      highCents: dollars(35),
      note: INVENTED,
    },
  },
  // Invented demo values: CHECKS.md only says digging costs "more when deep".
  depth: { includedDepth: 5 * UNITS_PER_FOOT, extraPercentPerFootLow: 10, extraPercentPerFootHigh: 25 },
};
