import type { Knex } from 'knex';
import { isStaffRole, type StaffRole } from '@underfoot/core';
import { conflict, notFound } from '../../http/errors.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import type { AuthService } from '../auth/auth.service.ts';
import { endSessionsOf } from '../auth/sessions.repo.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { activeOfficeIds, findPerson, listPeople, setDisabled, setRole, type PeopleFilter, type PersonRecord } from './people.repo.ts';

export interface PeopleServiceDeps {
  db: Knex;
  auth: AuthService;
}

/** The office's view of the people in its company: invitations, roles, disabling and re-enabling. */
export function createPeopleService(deps: PeopleServiceDeps) {
  const { db, auth } = deps;

  const withFlags = (actor: UserRecord, person: PersonRecord) => ({
    ...person,
    isYou: person.id === actor.id,
    allowed: {
      changeRole: isStaffRole(person.role) && person.status !== 'disabled',
      disable: person.status !== 'disabled' && person.id !== actor.id,
      enable: person.status === 'disabled',
      resendInvitation: person.status === 'invited',
    },
  });

  async function personIn(actor: UserRecord, id: string, trx: Knex = db) {
    const person = await findPerson(trx, actor.companyId, id);
    // Another company's people do not exist from here.
    if (!person) throw notFound('person');
    return person;
  }

  /** Refuse a change that would leave no active office user to run the company. */
  async function keepAnOffice(trx: Knex, actor: UserRecord, person: PersonRecord, change: 'role' | 'disable') {
    if (person.role !== 'office' || person.status !== 'active') return;
    const others = (await activeOfficeIds(trx, actor.companyId)).filter((id) => id !== person.id);
    if (others.length > 0) return;
    const who = person.id === actor.id ? 'You are' : `${person.name} is`;
    const what = change === 'role' ? 'lose the office role' : 'be disabled';
    throw conflict(
      `${who} the last office user who can sign in, so this account cannot ${what}. Invite another office user (or make an inspector an office user) first.`,
      'last_office_user',
    );
  }

  async function list(actor: UserRecord, filter: PeopleFilter) {
    const people = await listPeople(db, actor.companyId, filter);
    return people.map((p) => withFlags(actor, p));
  }

  async function changeRole(actor: UserRecord, id: string, role: StaffRole, ip: string | undefined) {
    await db.transaction(async (trx) => {
      const person = await personIn(actor, id, trx);
      if (!isStaffRole(person.role)) {
        throw conflict(
          'Agents and clients keep their role: they may be parties on orders. Invite staff with an account of their own.',
          'not_staff',
        );
      }
      if (person.status === 'disabled') throw conflict('Re-enable this account before changing its role.', 'account_disabled');
      if (person.role === role) return;
      if (role !== 'office') await keepAnOffice(trx, actor, person, 'role');
      await setRole(trx, id, role);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'user.role_changed',
        subjectType: 'user',
        subjectId: id,
        detail: { field: 'role', from: person.role, to: role },
        ip,
      });
    });
    return withFlags(actor, await personIn(actor, id));
  }

  async function disable(actor: UserRecord, id: string, ip: string | undefined) {
    await db.transaction(async (trx) => {
      const person = await personIn(actor, id, trx);
      if (person.status === 'disabled') return;
      await keepAnOffice(trx, actor, person, 'disable');
      await setDisabled(trx, id, true);
      // At once, not on their next request: every stored session of theirs goes.
      const ended = await endSessionsOf(trx, id);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'user.disabled',
        subjectType: 'user',
        subjectId: id,
        detail: { sessionsEnded: ended },
        ip,
      });
    });
    return withFlags(actor, await personIn(actor, id));
  }

  async function enable(actor: UserRecord, id: string, ip: string | undefined) {
    await db.transaction(async (trx) => {
      const person = await personIn(actor, id, trx);
      if (person.status !== 'disabled') return;
      await setDisabled(trx, id, false);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'user.enabled',
        subjectType: 'user',
        subjectId: id,
        ip,
      });
    });
    return withFlags(actor, await personIn(actor, id));
  }

  /** A fresh link for someone who has not accepted yet; the old link stops working. */
  async function resendInvitation(actor: UserRecord, id: string, ip: string | undefined) {
    const person = await personIn(actor, id);
    if (person.status === 'disabled')
      throw conflict('This account is disabled. Re-enable it before sending a new invitation.', 'account_disabled');
    if (person.status === 'active') throw conflict(`${person.name} has already accepted and can sign in.`, 'already_active');
    await auth.invite(actor, { email: person.email, name: person.name, role: person.role }, ip);
    return withFlags(actor, await personIn(actor, id));
  }

  return { list, changeRole, disable, enable, resendInvitation };
}

export type PeopleService = ReturnType<typeof createPeopleService>;
