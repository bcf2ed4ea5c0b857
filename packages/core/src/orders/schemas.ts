import { z } from 'zod';
import { emailSchema, personNameSchema } from '../accounts/schemas.ts';
import { propertyTypes } from '../model/kinds.ts';
import { orderStatuses, partyRoles, type OrderStatus, type PartyRole, type Side } from '../permissions/permissions.ts';

/** An order is for a pre-purchase inspection (buyer's side orders) or a pre-listing one (seller's side orders). */
export const orderKinds = ['pre_purchase', 'pre_listing'] as const;
export type OrderKind = (typeof orderKinds)[number];
export const orderKindLabels: Record<OrderKind, string> = {
  pre_purchase: 'Pre-purchase',
  pre_listing: 'Pre-listing',
};
export const orderingSideOf = (kind: OrderKind): Side => (kind === 'pre_purchase' ? 'buyer' : 'seller');

export const occupancies = ['occupied', 'vacant'] as const;
export type Occupancy = (typeof occupancies)[number];

export const orderStatusLabels: Record<OrderStatus, string> = {
  requested: 'Requested',
  scheduled: 'Scheduled',
  recorded: 'Recorded',
  in_review: 'In review',
  published: 'Published',
  cancelled: 'Cancelled',
};

export const partyRoleLabels: Record<PartyRole, string> = {
  buyers_agent: "Buyer's agent",
  listing_agent: 'Listing agent',
  buyer: 'Buyer',
  seller: 'Seller',
};

export const paymentStates = ['unpaid', 'paid', 'refunded'] as const;
export type PaymentState = (typeof paymentStates)[number];

/** Who pays the fee: the ordering agent at once, or the client before the report is released. */
export const payers = ['agent_now', 'client_before_release'] as const;
export type Payer = (typeof payers)[number];

/** Calendar dates travel as YYYY-MM-DD, the way people pick them; times of day never matter for a deadline. */
export const isoDateSchema = z.iso.date({ error: 'Use a date like 2027-03-14.' });

/** Today's date in the given time zone's calendar (the company's; defaults to UTC). */
/** One formatter per time zone: building an Intl.DateTimeFormat costs far more than using one. */
const dayFormatters = new Map<string, Intl.DateTimeFormat>();

export function todayIso(now: Date = new Date(), timeZone = 'UTC'): string {
  let format = dayFormatters.get(timeZone);
  if (!format) {
    format = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    dayFormatters.set(timeZone, format);
  }
  return format.format(now);
}

const CURRENT_YEAR = () => new Date().getUTCFullYear();

export const addressSchema = z.object({
  street: z.string().trim().min(3, 'Enter the street address, like 418 Larkspur Lane.').max(200, 'Use at most 200 characters.'),
  unit: z.string().trim().max(40, 'Use at most 40 characters.').optional().default(''),
  city: z.string().trim().min(2, 'Enter the city.').max(100, 'Use at most 100 characters.'),
  region: z.string().trim().min(2, 'Enter the state or region.').max(60, 'Use at most 60 characters.'),
  // US ZIP or ZIP+4, Canadian and most other postal formats: letters, digits, a space or hyphen.
  postalCode: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9][A-Za-z0-9 -]{1,8}[A-Za-z0-9]$/, 'Enter a postal code, like 97035.'),
});
export type Address = z.output<typeof addressSchema>;

export function formatAddress(a: Pick<Address, 'street' | 'unit' | 'city' | 'region' | 'postalCode'>): string {
  return `${a.street}${a.unit ? `, ${a.unit}` : ''}, ${a.city}, ${a.region} ${a.postalCode}`;
}

/** The property as the order form takes it (the inspection's own property record is built from this). */
export const orderPropertySchema = z.object({
  address: addressSchema,
  yearBuilt: z.coerce
    .number({ error: 'Enter the year the house was built.' })
    .int('Enter a whole year, like 1962.')
    .min(1800, 'Enter a year from 1800 on.')
    .refine((y) => y <= CURRENT_YEAR() + 1, 'The year built cannot be in the future.'),
  propertyType: z.enum(propertyTypes, { error: 'Choose the kind of property.' }),
  occupancy: z.enum(occupancies, { error: 'Say whether the property is occupied or vacant.' }),
  accessNotes: z.string().trim().max(1000, 'Use at most 1,000 characters.').optional().default(''),
});

/** Someone to invite onto the order by e-mail. */
export const partyInviteSchema = z.object({
  partyRole: z.enum(partyRoles, { error: 'Choose their role in the sale.' }),
  name: personNameSchema,
  email: emailSchema,
});
export type PartyInvite = z.output<typeof partyInviteSchema>;

/**
 * The order form. The ordering agent is added as the ordering side's agent; the
 * client of that side must be invited; the other side's people are optional.
 */
export function makeOrderCreateSchema(today: string = todayIso()) {
  return z
    .object({
      kind: z.enum(orderKinds, { error: 'Choose pre-purchase or pre-listing.' }),
      property: orderPropertySchema,
      contingencyDeadline: isoDateSchema.refine((d) => d > today, 'The deadline must be after today.'),
      preferredDates: z
        .array(isoDateSchema.refine((d) => d >= today, 'Preferred dates cannot be in the past.'))
        .max(3, 'Give at most three preferred dates.')
        .default([]),
      addOnIds: z.array(z.string().min(1)).max(20).default([]),
      parties: z.array(partyInviteSchema).min(1, 'Invite your client.').max(4),
      payer: z.enum(payers, { error: 'Choose who pays.' }),
      note: z.string().trim().max(2000, 'Use at most 2,000 characters.').optional().default(''),
    })
    .superRefine((order, ctx) => {
      const side = orderingSideOf(order.kind);
      const clientRole: PartyRole = side === 'buyer' ? 'buyer' : 'seller';
      if (!order.parties.some((p) => p.partyRole === clientRole)) {
        ctx.addIssue({ code: 'custom', path: ['parties'], message: `Invite the ${clientRole} you are ordering for.` });
      }
      const ownAgentRole: PartyRole = side === 'buyer' ? 'buyers_agent' : 'listing_agent';
      order.parties.forEach((p, i) => {
        if (p.partyRole === ownAgentRole) {
          ctx.addIssue({
            code: 'custom',
            path: ['parties', i, 'partyRole'],
            message: 'You are already on the order as the agent for this side.',
          });
        }
      });
      const emails = order.parties.map((p) => p.email);
      emails.forEach((e, i) => {
        if (emails.indexOf(e) !== i)
          ctx.addIssue({ code: 'custom', path: ['parties', i, 'email'], message: 'This person is already on the order.' });
      });
      order.preferredDates.forEach((d, i) => {
        if (d > order.contingencyDeadline) {
          ctx.addIssue({ code: 'custom', path: ['preferredDates', i], message: 'Preferred dates should fall before the deadline.' });
        }
      });
    });
}
export type OrderCreateInput = z.input<ReturnType<typeof makeOrderCreateSchema>>;
export type OrderCreate = z.output<ReturnType<typeof makeOrderCreateSchema>>;

/** An arrival window on one day, e.g. 2027-03-02 08:00–10:00 (company local time). */
export const arrivalWindowSchema = z
  .object({
    date: isoDateSchema,
    startTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a time like 08:00.'),
    endTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a time like 10:00.'),
  })
  .refine((w) => w.endTime > w.startTime, { path: ['endTime'], message: 'The window must end after it starts.' });
export type ArrivalWindow = z.output<typeof arrivalWindowSchema>;

export function makeScheduleSchema(today: string = todayIso()) {
  return z.object({
    inspectorId: z.string().min(1, 'Choose an inspector.'),
    window: arrivalWindowSchema.refine((w) => w.date >= today, { path: ['date'], message: 'Choose today or a later day.' }),
    note: z.string().trim().max(500).optional().default(''),
  });
}
export type ScheduleInput = z.input<ReturnType<typeof makeScheduleSchema>>;

export const cancelOrderSchema = z.object({
  reason: z.string().trim().min(3, 'Say why the order is cancelled.').max(500, 'Use at most 500 characters.'),
});

/** Fee list items (PRODUCT.md §2: the company's fee list). Amounts are integer cents. */
export const feeItemKinds = ['base', 'add_on'] as const;
export const feeItemSchema = z.object({
  kind: z.enum(feeItemKinds),
  name: z.string().trim().min(2, 'Name the fee.').max(100),
  description: z.string().trim().max(300).optional().default(''),
  priceCents: z.coerce
    .number()
    .int('Use whole cents.')
    .min(0, 'A price cannot be negative.')
    .max(10_000_00, 'Check the price: at most $10,000.'),
  active: z.boolean().default(true),
});
export type FeeItem = z.output<typeof feeItemSchema> & { id: string };

export const formatMoney = (cents: number, currency = 'USD') =>
  new Intl.NumberFormat('en-US', { style: 'currency', currency }).format(cents / 100);

/** Whole days from today until a YYYY-MM-DD date (negative once passed). */
export function daysUntil(date: string, today: string = todayIso()): number {
  return Math.round((Date.parse(`${date}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000);
}

export const orderStatusOrder: readonly OrderStatus[] = orderStatuses;
