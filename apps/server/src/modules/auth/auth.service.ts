import type { Knex } from 'knex';
import type { InvitationCreateInput, Role } from '@underfoot/core';
import { badRequest, conflict, gone, HttpError } from '../../http/errors.ts';
import { againOnUniqueViolation } from '../../db.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import type { MailBrand } from '../company/brand.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';
import { dummyHashFor, hashPassword, verifyPassword } from './passwords.ts';
import { endSessionsOf } from './sessions.repo.ts';
import { consumeToken, issueToken, lookupToken, tokenLifetimeMs, type TokenPurpose } from './tokens.repo.ts';
import { findUserByEmail, findUserById, insertUser, setPassword, type UserRecord } from './users.repo.ts';

export const roleLabels: Record<Role, string> = {
  office: 'an office user',
  inspector: 'an inspector',
  agent: 'an agent',
  client: 'a client',
};

export interface AuthServiceDeps {
  db: Knex;
  publicUrl: string;
  passwordHashCost: number;
  /** Called after a transaction that wrote mail commits. */
  mailQueued: () => void;
  /** The company as its mail shows it (company.service.ts mailBrand). */
  mailBrand: (companyId: string) => Promise<MailBrand>;
}

export type SignInResult = { outcome: 'ok'; user: UserRecord } | { outcome: 'invalid' } | { outcome: 'disabled' };

export function createAuthService(deps: AuthServiceDeps) {
  const { db, publicUrl, passwordHashCost } = deps;
  const dummyHash = dummyHashFor(passwordHashCost);

  async function checkCredentials(email: string, password: string): Promise<SignInResult> {
    const user = await findUserByEmail(db, email);
    if (!user?.passwordHash) {
      await verifyPassword(password, await dummyHash);
      return { outcome: 'invalid' };
    }
    if (!(await verifyPassword(password, user.passwordHash))) return { outcome: 'invalid' };
    // Only someone who knows the password learns the account is disabled.
    if (user.disabledAt) return { outcome: 'disabled' };
    return { outcome: 'ok', user };
  }

  /** Always succeeds from the caller's point of view, so the answer never says whether an account exists. */
  async function requestPasswordReset(email: string, ip: string | undefined): Promise<void> {
    const user = await findUserByEmail(db, email);
    if (!user || user.disabledAt) return;
    const brand = await deps.mailBrand(user.companyId);
    await db.transaction(async (trx) => {
      const token = await issueToken(trx, user.id, 'password_reset');
      await enqueueMail(trx, {
        companyId: user.companyId,
        ...brand,
        to: user.email,
        template: 'password_reset',
        vars: {
          name: user.name,
          url: `${publicUrl}/reset-password?token=${token}`,
          validMinutes: tokenLifetimeMs.password_reset / 60_000,
        },
      });
      await recordAudit(trx, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'auth.password_reset_requested',
        subjectType: 'user',
        subjectId: user.id,
        ip,
      });
    });
    deps.mailQueued();
  }

  async function validToken(token: string, purpose: TokenPurpose) {
    const found = await lookupToken(db, token, purpose);
    const what = purpose === 'invitation' ? 'invitation' : 'link';
    switch (found.state) {
      case 'unknown':
        throw new HttpError(404, 'invalid_link', `This ${what} is not valid. Check that you copied the whole address.`);
      case 'expired':
        throw gone(`This ${what} has expired. Ask for a new one.`, 'link_expired');
      case 'used':
        throw gone(`This ${what} has already been used. Ask for a new one if you still need it.`, 'link_used');
      case 'valid':
        return found;
    }
  }

  async function completePasswordReset(token: string, password: string, ip: string | undefined): Promise<UserRecord> {
    const found = await validToken(token, 'password_reset');
    const passwordHash = await hashPassword(password, passwordHashCost);
    await db.transaction(async (trx) => {
      if (!(await consumeToken(trx, found.tokenId))) throw gone('This link has already been used.', 'link_used');
      await setPassword(trx, found.userId, passwordHash);
      // A reset means the old password may be known to someone else: end every session.
      await endSessionsOf(trx, found.userId);
      const user = await findUserById(trx, found.userId);
      await recordAudit(trx, {
        companyId: user?.companyId ?? null,
        actorUserId: found.userId,
        action: 'auth.password_reset',
        subjectType: 'user',
        subjectId: found.userId,
        ip,
      });
    });
    const user = await findUserById(db, found.userId);
    if (!user || user.disabledAt) throw gone('This account is no longer active.', 'account_disabled');
    return user;
  }

  async function describeInvitation(token: string) {
    const found = await validToken(token, 'invitation');
    const user = await findUserById(db, found.userId);
    if (!user || user.disabledAt) throw gone('This invitation is no longer active.', 'link_used');
    return { email: user.email, name: user.name, role: user.role, companyName: user.companyName };
  }

  async function acceptInvitation(token: string, name: string, password: string, ip: string | undefined): Promise<UserRecord> {
    const found = await validToken(token, 'invitation');
    const passwordHash = await hashPassword(password, passwordHashCost);
    await db.transaction(async (trx) => {
      if (!(await consumeToken(trx, found.tokenId))) throw gone('This invitation has already been used.', 'link_used');
      await setPassword(trx, found.userId, passwordHash, name);
      const user = await findUserById(trx, found.userId);
      await recordAudit(trx, {
        companyId: user?.companyId ?? null,
        actorUserId: found.userId,
        action: 'auth.invitation_accepted',
        subjectType: 'user',
        subjectId: found.userId,
        ip,
      });
    });
    const user = await findUserById(db, found.userId);
    if (!user || user.disabledAt) throw gone('This invitation is no longer active.', 'link_used');
    return user;
  }

  /** Invite someone into the inviter's company; inviting a pending address again re-sends a fresh link. */
  async function invite(
    inviter: UserRecord,
    input: { email: string; name: string; role: InvitationCreateInput['role'] },
    ip: string | undefined,
  ) {
    const existing = await findUserByEmail(db, input.email);
    if (existing && (existing.companyId !== inviter.companyId || existing.passwordHash)) {
      throw conflict('This e-mail address already has an Underfoot account.', 'email_taken');
    }
    if (existing && existing.role !== input.role) {
      throw badRequest('An invitation to this address with another role is pending.', [
        { path: 'role', message: `The pending invitation is for ${roleLabels[existing.role]}.` },
      ]);
    }
    const brand = await deps.mailBrand(inviter.companyId);
    const userId = await db.transaction(async (trx) => {
      const id =
        existing?.id ??
        (await insertUser(trx, {
          companyId: inviter.companyId,
          email: input.email,
          name: input.name,
          role: input.role,
          passwordHash: null,
          emailVerified: false,
        }));
      const token = await issueToken(trx, id, 'invitation');
      await enqueueMail(trx, {
        companyId: inviter.companyId,
        ...brand,
        to: input.email,
        template: 'invitation',
        vars: {
          name: input.name,
          url: `${publicUrl}/invitation?token=${token}`,
          inviterName: inviter.name,
          roleLabel: roleLabels[input.role],
          validDays: tokenLifetimeMs.invitation / 86_400_000,
        },
      });
      await recordAudit(trx, {
        companyId: inviter.companyId,
        actorUserId: inviter.id,
        action: existing ? 'user.invitation_resent' : 'user.invited',
        subjectType: 'user',
        subjectId: id,
        detail: { email: input.email, role: input.role },
        ip,
      });
      return id;
    });
    deps.mailQueued();
    return { userId };
  }

  return {
    checkCredentials,
    requestPasswordReset,
    completePasswordReset,
    describeInvitation,
    acceptInvitation,
    // Two invitations to one new address at once: the second finds the first's pending account.
    invite: (...args: Parameters<typeof invite>) => againOnUniqueViolation(() => invite(...args)),
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
