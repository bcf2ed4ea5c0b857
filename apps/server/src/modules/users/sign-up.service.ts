import type { Knex } from 'knex';
import type { AgentSignUpInput } from '@underfoot/core';
import { gone, HttpError, notFound } from '../../http/errors.ts';
import { againOnUniqueViolation } from '../../db.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import { hashPassword } from '../auth/passwords.ts';
import { consumeToken, issueToken, lookupToken, tokenLifetimeMs } from '../auth/tokens.repo.ts';
import { findUserByEmail, findUserById, insertUser, setPassword, type UserRecord } from '../auth/users.repo.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';

export interface SignUpServiceDeps {
  db: Knex;
  publicUrl: string;
  passwordHashCost: number;
  mailQueued: () => void;
  /** The company's name and logo for pages (a same-site path) and for e-mails (an absolute URL). */
  brand: (companyId: string) => Promise<{ name: string; logoUrl: string | null }>;
  mailBrand: (companyId: string) => Promise<{ companyName: string; logoUrl: string | null }>;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * Agents joining a company that allows it (companies.agent_signup = 'self_signup').
 * Step one takes a name and an address and always answers the same, so it never
 * tells whether an address has an account; step two, from the e-mailed link,
 * proves the address and sets the password.
 */
export function createSignUpService(deps: SignUpServiceDeps) {
  const { db, publicUrl } = deps;

  /** A company that takes sign-ups, or 404 for one that does not (or does not exist). */
  async function openCompany(companyId: string) {
    if (!UUID.test(companyId)) throw notFound('sign-up page');
    const company = await db('companies').where({ id: companyId }).first('id', 'name', 'agent_signup');
    if (!company || company.agent_signup !== 'self_signup') throw notFound('sign-up page');
    return company as { id: string; name: string };
  }

  async function describe(companyId: string) {
    const company = await openCompany(companyId);
    const brand = await deps.brand(company.id);
    return { companyId: company.id, companyName: company.name, logoUrl: brand.logoUrl };
  }

  async function request(companyId: string, input: Required<AgentSignUpInput>, ip: string | undefined): Promise<void> {
    const company = await openCompany(companyId);
    const brand = await deps.mailBrand(company.id);
    const existing = await findUserByEmail(db, input.email);
    const pendingAgentHere =
      existing && existing.companyId === company.id && existing.role === 'agent' && !existing.passwordHash && !existing.disabledAt;

    await db.transaction(async (trx) => {
      if (existing && !pendingAgentHere) {
        // An address with an account: tell its owner, not the person at the form.
        await enqueueMail(trx, {
          companyId: company.id,
          ...brand,
          to: existing.email,
          template: 'sign_up_existing',
          vars: { name: existing.name, signInUrl: `${publicUrl}/sign-in`, resetUrl: `${publicUrl}/forgot-password` },
        });
        return;
      }
      const userId =
        existing?.id ??
        (await insertUser(trx, {
          companyId: company.id,
          email: input.email,
          name: input.name,
          role: 'agent',
          passwordHash: null,
          emailVerified: false,
        }));
      const token = await issueToken(trx, userId, 'email_verification');
      await enqueueMail(trx, {
        companyId: company.id,
        ...brand,
        to: input.email,
        template: 'agent_sign_up',
        vars: {
          name: input.name,
          url: `${publicUrl}/join/verify?token=${token}`,
          validHours: tokenLifetimeMs.email_verification / 3_600_000,
        },
      });
      await recordAudit(trx, {
        companyId: company.id,
        actorUserId: userId,
        action: 'user.signed_up',
        subjectType: 'user',
        subjectId: userId,
        detail: { email: input.email, repeated: Boolean(existing) },
        ip,
      });
    });
    deps.mailQueued();
  }

  async function validToken(token: string) {
    const found = await lookupToken(db, token, 'email_verification');
    switch (found.state) {
      case 'unknown':
        throw new HttpError(404, 'invalid_link', 'This link is not valid. Check that you copied the whole address.');
      case 'expired':
        throw gone('This link has expired. Sign up again to get a new one.', 'link_expired');
      case 'used':
        throw gone('This link has already been used. Sign in with your e-mail address and password.', 'link_used');
      case 'valid':
        return found;
    }
  }

  async function describeToken(token: string) {
    const found = await validToken(token);
    const user = await findUserById(db, found.userId);
    if (!user || user.disabledAt) throw gone('This sign-up is no longer active. Contact the company office.', 'link_used');
    return { email: user.email, name: user.name, companyName: user.companyName };
  }

  async function complete(token: string, name: string, password: string, ip: string | undefined): Promise<UserRecord> {
    const found = await validToken(token);
    const passwordHash = await hashPassword(password, deps.passwordHashCost);
    await db.transaction(async (trx) => {
      if (!(await consumeToken(trx, found.tokenId))) throw gone('This link has already been used.', 'link_used');
      const user = await findUserById(trx, found.userId);
      if (!user || user.disabledAt) throw gone('This sign-up is no longer active. Contact the company office.', 'link_used');
      // Following the link proves the address; setPassword marks it verified.
      await setPassword(trx, found.userId, passwordHash, name);
      await recordAudit(trx, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'user.sign_up_completed',
        subjectType: 'user',
        subjectId: user.id,
        ip,
      });
    });
    const user = await findUserById(db, found.userId);
    if (!user) throw gone('This sign-up is no longer active.', 'link_used');
    return user;
  }

  return {
    describe,
    // Two sign-ups for one new address at once: the second finds the first's account.
    request: (...args: Parameters<typeof request>) => againOnUniqueViolation(() => request(...args)),
    describeToken,
    complete,
  };
}

export type SignUpService = ReturnType<typeof createSignUpService>;
