import { z } from 'zod';
import { roles } from '../permissions/permissions.ts';

/** E-mail addresses are compared and stored in lower case. */
export const emailSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .min(1, 'Enter an e-mail address.')
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.com.' }))
  .transform((value) => value.toLowerCase());

/** Long passphrases beat composition rules (NIST SP 800-63B §3.1.1.2: at least 8, allow at least 64). */
export const newPasswordSchema = z
  .string({ error: 'Enter a password.' })
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.');

export const personNameSchema = z.string({ error: 'Enter a name.' }).trim().min(1, 'Enter a name.').max(120, 'Use at most 120 characters.');

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200),
});
export type SignInInput = z.input<typeof signInSchema>;

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export type PasswordResetRequestInput = z.input<typeof passwordResetRequestSchema>;

export const tokenSchema = z.string().trim().min(20, 'This link is incomplete.').max(200, 'This link is not valid.');

export const passwordResetCompleteSchema = z.object({ token: tokenSchema, password: newPasswordSchema });
export type PasswordResetCompleteInput = z.input<typeof passwordResetCompleteSchema>;

export const invitationAcceptSchema = z.object({
  token: tokenSchema,
  name: personNameSchema,
  password: newPasswordSchema,
});
export type InvitationAcceptInput = z.input<typeof invitationAcceptSchema>;

export const invitationCreateSchema = z.object({
  email: emailSchema,
  name: personNameSchema,
  role: z.enum(roles, { error: 'Choose a role.' }),
});
export type InvitationCreateInput = z.input<typeof invitationCreateSchema>;

/** The signed-in person as the API describes them. */
export interface CurrentUser {
  id: string;
  email: string;
  name: string;
  role: (typeof roles)[number];
  companyId: string;
  companyName: string;
}
