import { z } from 'zod';
import { emailSchema, newPasswordSchema, personNameSchema, tokenSchema } from '../accounts/schemas.ts';
import { feeItemSchema } from '../orders/schemas.ts';
import type { Role } from '../permissions/permissions.ts';
import { dollarsTextSchema } from './money-text.ts';

/**
 * The office's forms for running the company (PRODUCT.md §2, §10: "price book,
 * company settings, users"), shared by the API and the web forms.
 */

/** Whether an IANA time zone name is known to this JavaScript runtime. */
export function isKnownTimeZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max.toLocaleString('en-US')} characters.`)
    .optional()
    .default('');

// Digits with the usual separators and an optional extension: "(555) 014-2290", "+1 555 014 2290 ext. 12".
const PHONE = /^\+?[0-9 ().-]{7,25}((ext\.?|x) ?[0-9]{1,6})?$/i;

export const companyProfileSchema = z.object({
  name: z.string({ error: 'Enter the company name.' }).trim().min(2, 'Enter the company name.').max(200, 'Use at most 200 characters.'),
  licenceNumber: optionalText(100),
  phone: optionalText(50).refine((v) => v === '' || PHONE.test(v), 'Enter a phone number, like (555) 014-2290.'),
  email: z
    .string()
    .trim()
    .max(254, 'That e-mail address is too long.')
    .optional()
    .default('')
    .refine((v) => v === '' || z.email().safeParse(v).success, 'Enter a valid e-mail address, like office@example.com.')
    .transform((v) => v.toLowerCase()),
  /** Where the company works, in its own words ("Alder Falls and the river towns"). */
  serviceArea: optionalText(500),
  /** The company's own line at the foot of every report, after Underfoot's cautions. */
  reportFooter: optionalText(1000),
  timeZone: z
    .string({ error: 'Choose a time zone.' })
    .trim()
    .min(1, 'Choose a time zone.')
    .max(60)
    .refine(isKnownTimeZone, 'Choose a time zone from the list, like America/Los_Angeles.'),
});
export type CompanyProfileInput = z.input<typeof companyProfileSchema>;
export type CompanyProfile = z.output<typeof companyProfileSchema>;

export const agentSignupModes = ['invite_only', 'self_signup'] as const;
export type AgentSignupMode = (typeof agentSignupModes)[number];
export const agentSignupModeLabels: Record<AgentSignupMode, string> = {
  invite_only: 'Only agents the office invites',
  self_signup: 'Agents may also sign up themselves',
};

/** Share links last at most a year by default; a link can always be revoked sooner. */
export const MAX_SHARE_LINK_DAYS = 365;

/** Report and people settings; PATCH sends only the ones that change. */
export const companySettingsSchema = z.object({
  requirePaymentBeforeRelease: z.boolean({ error: 'Choose yes or no.' }),
  inspectorsMayPublish: z.boolean({ error: 'Choose yes or no.' }),
  shareLinkDays: z.coerce
    .number({ error: 'Enter a number of days.' })
    .int('Use whole days.')
    .min(1, 'A share link lives at least 1 day.')
    .max(MAX_SHARE_LINK_DAYS, `A share link lives at most ${MAX_SHARE_LINK_DAYS} days.`),
  guestCostsDefault: z.boolean({ error: 'Choose yes or no.' }),
  agentSignup: z.enum(agentSignupModes, { error: 'Choose how agents join.' }),
});
export type CompanySettings = z.output<typeof companySettingsSchema>;
export type CompanySettingsInput = z.input<typeof companySettingsSchema>;

export const companySettingsPatchSchema = companySettingsSchema
  .partial()
  .refine((patch) => Object.values(patch).some((v) => v !== undefined), 'Change at least one setting.');
export type CompanySettingsPatch = z.input<typeof companySettingsPatchSchema>;

// ---------- people ----------

/** Roles the office can move a person between. Agents and clients are never turned into staff: they may be parties on orders. */
export const staffRoles = ['office', 'inspector'] as const satisfies readonly Role[];
export type StaffRole = (typeof staffRoles)[number];
export const isStaffRole = (role: Role): role is StaffRole => (staffRoles as readonly Role[]).includes(role);

export const roleChangeSchema = z.object({
  role: z.enum(staffRoles, { error: 'Choose office or inspector.' }),
});
export type RoleChangeInput = z.input<typeof roleChangeSchema>;

export const personStatuses = ['active', 'invited', 'disabled'] as const;
export type PersonStatus = (typeof personStatuses)[number];
export const personStatusLabels: Record<PersonStatus, string> = {
  active: 'Active',
  invited: 'Invited',
  disabled: 'Disabled',
};

export const peopleQuerySchema = z.object({
  role: z.enum(['office', 'inspector', 'agent', 'client', 'staff'] as const).optional(),
  status: z.enum(personStatuses).optional(),
  q: z.string().trim().max(100).optional(),
});

/** An agent asks to join a company that allows it; the e-mail link proves the address, then they choose a password. */
export const agentSignUpSchema = z.object({
  name: personNameSchema,
  email: emailSchema,
});
export type AgentSignUpInput = z.input<typeof agentSignUpSchema>;

/** Following the sign-up e-mail: the person's name and a password. */
export const agentSignUpCompleteSchema = z.object({
  token: tokenSchema,
  name: personNameSchema,
  password: newPasswordSchema,
});
export type AgentSignUpCompleteInput = z.input<typeof agentSignUpCompleteSchema>;

// ---------- own account ----------

const currentPasswordSchema = z
  .string({ error: 'Enter your current password.' })
  .min(1, 'Enter your current password.')
  .max(200, 'Use at most 200 characters.');

export const accountNameSchema = z.object({ name: personNameSchema });
export type AccountNameInput = z.input<typeof accountNameSchema>;

export const emailChangeSchema = z.object({
  newEmail: emailSchema,
  currentPassword: currentPasswordSchema,
});
export type EmailChangeInput = z.input<typeof emailChangeSchema>;

export const emailChangeConfirmSchema = z.object({ token: tokenSchema });

export const passwordChangeSchema = z
  .object({
    currentPassword: currentPasswordSchema,
    newPassword: newPasswordSchema,
  })
  .refine((v) => v.newPassword !== v.currentPassword, {
    path: ['newPassword'],
    message: 'Choose a password different from the current one.',
  });
export type PasswordChangeInput = z.input<typeof passwordChangeSchema>;

// ---------- fee list ----------

/** The fee form: the price typed in dollars, sent and checked as `priceCents`. */
export const feeItemFormSchema = feeItemSchema.extend({
  // The API's cents rule (whole, 0 to $10,000) checks the parsed amount; its coercion takes any input, the pipe gives it numbers.
  priceCents: dollarsTextSchema.pipe(feeItemSchema.shape.priceCents as unknown as z.ZodType<number, number>),
});
export type FeeItemFormInput = z.input<typeof feeItemFormSchema>;
export type FeeItemInput = z.input<typeof feeItemSchema>;

export const feeOrderSchema = z.object({
  ids: z.array(z.string().min(1)).min(1, 'List the fees in their new order.').max(200),
});

// ---------- audit trail ----------

export const AUDIT_PAGE_SIZES = [25, 50, 100] as const;

export const auditQuerySchema = z
  .object({
    action: z.string().trim().max(80).optional(),
    actorId: z.string().trim().max(64).optional(),
    /** Instants (ISO-8601); the browser turns the chosen days into its own midnight. */
    from: z.iso.datetime({ offset: true, error: 'Use a date and time like 2027-03-14T00:00:00Z.' }).optional(),
    to: z.iso.datetime({ offset: true, error: 'Use a date and time like 2027-03-14T00:00:00Z.' }).optional(),
    q: z.string().trim().max(100, 'Search for at most 100 characters.').optional(),
    page: z.coerce.number().int().min(0).default(0),
    pageSize: z.coerce
      .number()
      .int()
      .refine((n) => (AUDIT_PAGE_SIZES as readonly number[]).includes(n), `Use ${AUDIT_PAGE_SIZES.join(', ')} rows per page.`)
      .default(50),
  })
  .refine((q) => !q.from || !q.to || Date.parse(q.from) <= Date.parse(q.to), {
    path: ['to'],
    message: 'The end of the range must be after its start.',
  });
export type AuditQuery = z.output<typeof auditQuerySchema>;
export type AuditQueryInput = z.input<typeof auditQuerySchema>;
