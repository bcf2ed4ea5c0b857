import type { Knex } from 'knex';
import { badRequest, gone, HttpError } from '../../http/errors.ts';
import { isUniqueViolation } from '../../db.ts';
import { nowIso } from '../../lib/clock.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import { hashPassword, verifyPassword } from '../auth/passwords.ts';
import { endSessionsOf } from '../auth/sessions.repo.ts';
import { findUserByEmail, findUserById, publicUser, setPassword, type UserRecord } from '../auth/users.repo.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';
import {
  consumeEmailChange,
  countOtherSessions,
  EMAIL_CHANGE_LIFETIME_MS,
  issueEmailChange,
  lookupEmailChange,
  pendingEmailChange,
} from './email-changes.repo.ts';

export interface AccountServiceDeps {
  db: Knex;
  publicUrl: string;
  passwordHashCost: number;
  mailQueued: () => void;
  mailBrand: (companyId: string) => Promise<{ companyName: string; logoUrl: string | null }>;
}

const wrongPassword = () =>
  badRequest('Some fields need attention.', [{ path: 'currentPassword', message: 'That is not your current password.' }]);

/** Everyone's own account: name, sign-in address (re-verified), password, other devices. */
export function createAccountService(deps: AccountServiceDeps) {
  const { db, publicUrl } = deps;

  async function fresh(userId: string): Promise<UserRecord> {
    const user = await findUserById(db, userId);
    if (!user || user.disabledAt) throw new HttpError(401, 'unauthenticated', 'Please sign in.');
    return user;
  }

  async function checkPassword(userId: string, password: string) {
    const user = await fresh(userId);
    if (!user.passwordHash || !(await verifyPassword(password, user.passwordHash))) throw wrongPassword();
    return user;
  }

  async function overview(userId: string, sid: string) {
    const user = await fresh(userId);
    return {
      user: publicUser(user),
      emailVerified: user.emailVerifiedAt !== null,
      pendingEmail: await pendingEmailChange(db, user.id),
      otherSessions: await countOtherSessions(db, user.id, sid),
    };
  }

  async function changeName(userId: string, name: string, ip: string | undefined) {
    const user = await fresh(userId);
    if (user.name !== name) {
      await db.transaction(async (trx) => {
        await trx('users').where({ id: user.id }).update({ name, updated_at: nowIso() });
        await recordAudit(trx, {
          companyId: user.companyId,
          actorUserId: user.id,
          action: 'account.name_changed',
          subjectType: 'user',
          subjectId: user.id,
          detail: { field: 'name', from: user.name, to: name },
          ip,
        });
      });
    }
    return publicUser(await fresh(userId));
  }

  async function requestEmailChange(userId: string, newEmail: string, currentPassword: string, ip: string | undefined) {
    const user = await checkPassword(userId, currentPassword);
    if (newEmail === user.email) {
      throw badRequest('Some fields need attention.', [{ path: 'newEmail', message: 'This is already your e-mail address.' }]);
    }
    // An address that already has an account gets the same answer here (the answer must not say
    // who has an account); its owner is told by e-mail instead, and the change can never complete.
    const taken = Boolean(await findUserByEmail(db, newEmail));
    const brand = await deps.mailBrand(user.companyId);
    await db.transaction(async (trx) => {
      const token = await issueEmailChange(trx, user.id, newEmail);
      await enqueueMail(
        trx,
        taken
          ? {
              companyId: user.companyId,
              ...brand,
              to: newEmail,
              template: 'email_change_taken',
              vars: { signInUrl: `${publicUrl}/sign-in`, resetUrl: `${publicUrl}/forgot-password` },
            }
          : {
              companyId: user.companyId,
              ...brand,
              to: newEmail,
              template: 'email_change_confirm',
              vars: {
                name: user.name,
                url: `${publicUrl}/account/confirm-email?token=${token}`,
                validHours: EMAIL_CHANGE_LIFETIME_MS / 3_600_000,
              },
            },
      );
      // The current address hears about it too, in case someone else is at the keyboard.
      await enqueueMail(trx, {
        companyId: user.companyId,
        ...brand,
        to: user.email,
        template: 'email_change_requested',
        vars: { name: user.name, newEmail },
      });
      await recordAudit(trx, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'account.email_change_requested',
        subjectType: 'user',
        subjectId: user.id,
        detail: { from: user.email, to: newEmail },
        ip,
      });
    });
    deps.mailQueued();
    return pendingEmailChange(db, user.id);
  }

  /** Following the link sent to the new address. Works on any device; it signs nobody in. */
  const emailTaken = () => new HttpError(409, 'email_taken', 'This address has meanwhile been used for another Underfoot account.');

  async function confirmEmailChange(token: string, ip: string | undefined) {
    const found = await lookupEmailChange(db, token);
    if (found.state === 'unknown')
      throw new HttpError(404, 'invalid_link', 'This link is not valid. Check that you copied the whole address.');
    if (found.state === 'expired') throw gone('This link has expired. Ask for the change again from your account page.', 'link_expired');
    if (found.state === 'used') throw gone('This link has already been used, or a newer change replaced it.', 'link_used');
    const user = await findUserById(db, found.userId);
    if (!user || user.disabledAt) throw gone('This account is no longer active.', 'account_disabled');
    const brand = await deps.mailBrand(user.companyId);
    await db.transaction(async (trx) => {
      if (!(await consumeEmailChange(trx, found.id))) throw gone('This link has already been used.', 'link_used');
      const taken = await findUserByEmail(trx, found.newEmail);
      if (taken && taken.id !== user.id) throw emailTaken();
      const now = nowIso();
      // Another account can take the address between the check and this write (PostgreSQL serves requests side by side).
      await trx('users')
        .where({ id: user.id })
        .update({ email: found.newEmail, email_verified_at: now, updated_at: now })
        .catch((err: unknown) => {
          throw isUniqueViolation(err) ? emailTaken() : err;
        });
      // Reset links sent to the old address must not outlive it.
      await trx('one_time_tokens').where({ user_id: user.id, purpose: 'password_reset' }).whereNull('used_at').update({ used_at: now });
      await enqueueMail(trx, {
        companyId: user.companyId,
        ...brand,
        to: user.email,
        template: 'email_changed',
        vars: { name: user.name, newEmail: found.newEmail },
      });
      await recordAudit(trx, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'account.email_changed',
        subjectType: 'user',
        subjectId: user.id,
        detail: { from: user.email, to: found.newEmail },
        ip,
      });
    });
    deps.mailQueued();
    return { email: found.newEmail };
  }

  async function changePassword(userId: string, sid: string, currentPassword: string, newPassword: string, ip: string | undefined) {
    const user = await checkPassword(userId, currentPassword);
    const passwordHash = await hashPassword(newPassword, deps.passwordHashCost);
    const brand = await deps.mailBrand(user.companyId);
    let ended = 0;
    await db.transaction(async (trx) => {
      await setPassword(trx, user.id, passwordHash);
      // Whoever knew the old password is signed out everywhere else; this device stays signed in.
      ended = await endSessionsOf(trx, user.id, sid);
      await enqueueMail(trx, {
        companyId: user.companyId,
        ...brand,
        to: user.email,
        template: 'password_changed',
        vars: { name: user.name, otherSessionsEnded: ended },
      });
      await recordAudit(trx, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'account.password_changed',
        subjectType: 'user',
        subjectId: user.id,
        detail: { otherSessionsEnded: ended },
        ip,
      });
    });
    deps.mailQueued();
    return { otherSessionsEnded: ended };
  }

  async function signOutOthers(userId: string, sid: string, ip: string | undefined) {
    const user = await fresh(userId);
    const ended = await db.transaction(async (trx) => {
      const count = await endSessionsOf(trx, user.id, sid);
      await recordAudit(trx, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'account.other_sessions_ended',
        subjectType: 'user',
        subjectId: user.id,
        detail: { sessionsEnded: count },
        ip,
      });
      return count;
    });
    return { ended };
  }

  return { overview, changeName, requestEmailChange, confirmEmailChange, changePassword, signOutOthers };
}

export type AccountService = ReturnType<typeof createAccountService>;
