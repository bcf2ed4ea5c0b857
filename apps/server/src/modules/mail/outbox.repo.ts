import type { Knex } from 'knex';
import { isoIn, nowIso } from '../../lib/clock.ts';
import { newId } from '../../lib/ids.ts';
import { mailTemplates, type MailTemplateName, type MailVars } from './templates.ts';

export interface OutboxMessage {
  id: number;
  to: string;
  subject: string;
  text: string;
  html: string;
  messageId: string;
  attempts: number;
}

/**
 * Write a message to the outbox. Call it inside the same transaction as the
 * change it reports, so a message exists exactly when its change does.
 */
export async function enqueueMail<T extends MailTemplateName>(
  db: Knex,
  message: {
    companyId: string | null;
    /** The company as its mail shows it, from mailBrandOf (company/brand.ts): every message carries both. */
    companyName: string;
    logoUrl: string | null;
    to: string;
    template: T;
    vars: MailVars<T>;
  },
): Promise<void> {
  const render = mailTemplates[message.template] as (
    ctx: { companyName: string; logoUrl?: string | null },
    vars: MailVars<T>,
  ) => ReturnType<(typeof mailTemplates)[T]>;
  const rendered = render({ companyName: message.companyName, logoUrl: message.logoUrl }, message.vars);
  const now = nowIso();
  await db('mail_outbox').insert({
    company_id: message.companyId,
    to_address: message.to,
    subject: rendered.subject,
    text_body: rendered.text,
    html_body: rendered.html,
    template: message.template,
    message_id: `<${newId()}@underfoot.invalid>`,
    status: 'pending',
    attempts: 0,
    next_attempt_at: now,
    created_at: now,
  });
}

const LEASE_MS = 60_000;

/** Claim due messages with a lease, so two server instances never send the same message at once. */
export async function claimDueMessages(db: Knex, limit: number): Promise<OutboxMessage[]> {
  const now = nowIso();
  const due = await db('mail_outbox')
    .select('id')
    .where('status', 'pending')
    .where('next_attempt_at', '<=', now)
    .where((q) => q.whereNull('locked_until').orWhere('locked_until', '<', now))
    .orderBy('id')
    .limit(limit);
  const claimed: OutboxMessage[] = [];
  for (const { id } of due) {
    const won = await db('mail_outbox')
      .where({ id, status: 'pending' })
      .where((q) => q.whereNull('locked_until').orWhere('locked_until', '<', now))
      .update({ locked_until: isoIn(LEASE_MS) });
    if (won !== 1) continue;
    const row = await db('mail_outbox').where({ id }).first();
    claimed.push({
      id: row.id,
      to: row.to_address,
      subject: row.subject,
      text: row.text_body,
      html: row.html_body,
      messageId: row.message_id,
      attempts: row.attempts,
    });
  }
  return claimed;
}

export async function markSent(db: Knex, id: number): Promise<void> {
  await db('mail_outbox').where({ id }).update({ status: 'sent', sent_at: nowIso(), locked_until: null, last_error: null });
}

/**
 * Back off 5 s, 10 s, 20 s … up to 30 min (the base is MAIL_RETRY_BASE_MS); after MAX_ATTEMPTS
 * (about half a day at the default base) give up and keep it as failed.
 */
export const MAX_ATTEMPTS = 30;
export function retryDelayMs(attempts: number, baseMs = 5_000): number {
  return Math.min(baseMs * 2 ** Math.max(0, attempts - 1), 30 * 60_000);
}

export async function markAttemptFailed(db: Knex, message: OutboxMessage, error: string, retryBaseMs = 5_000): Promise<void> {
  const attempts = message.attempts + 1;
  await db('mail_outbox')
    .where({ id: message.id })
    .update({
      attempts,
      status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
      next_attempt_at: isoIn(retryDelayMs(attempts, retryBaseMs)),
      locked_until: null,
      last_error: error.slice(0, 1000),
    });
}
