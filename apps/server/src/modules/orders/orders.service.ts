import type { Knex } from 'knex';
import {
  can,
  daysUntil,
  formatAddress,
  formatMoney,
  gradeInfo,
  orderingSideOf,
  orderKindLabels,
  partyRoleLabels,
  todayIso,
  type Actor,
  type GradeLevel,
  type OrderCreate,
  type OrderStatus,
  type PartyRole,
  type Role,
} from '@underfoot/core';
import { againOnUniqueViolation } from '../../db.ts';
import { badRequest, conflict, forbidden, HttpError, notFound } from '../../http/errors.ts';
import { nowIso } from '../../lib/clock.ts';
import { newId } from '../../lib/ids.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import { issueToken, tokenLifetimeMs } from '../auth/tokens.repo.ts';
import { findUserByEmail, insertUser, type UserRecord } from '../auth/users.repo.ts';
import { mailBrandOf } from '../company/brand.ts';
import { listActiveFeeItems } from '../fees/fees.repo.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';
import { longDate, mailOrderParties, propertyAddressOf, windowText } from './order-mail.ts';
import {
  addOrderEvent,
  addressKey,
  findOrderRow,
  listOrderEvents,
  listOrders,
  listParties,
  loadOrderAccess,
  openOrdersForAddress,
  type OrderListFilter,
  type OrderRow,
} from './orders.repo.ts';

export interface OrdersServiceDeps {
  db: Knex;
  publicUrl: string;
  mailQueued: () => void;
  /** Refund a paid order's payment through the provider (payments module); resolves with the refunded amount. */
  refundOrderPayment: (order: OrderRow, actor: UserRecord) => Promise<number | null>;
}

const actorOf = (user: UserRecord): Actor => ({ kind: 'user', userId: user.id, role: user.role, companyId: user.companyId });

/** The account role a person invited in a party role gets. */
const accountRoleFor = (partyRole: PartyRole): Role => (partyRole === 'buyers_agent' || partyRole === 'listing_agent' ? 'agent' : 'client');

export function createOrdersService(deps: OrdersServiceDeps) {
  const { db, publicUrl } = deps;
  const orderUrl = (id: string, role: Role) =>
    `${publicUrl}${role === 'office' ? '/office' : role === 'inspector' ? '/field' : '/portal'}/orders/${id}`;

  /** Load an order the actor may see, or answer 404 — never 403, which would confirm it exists. */
  async function visibleOrder(actor: UserRecord, id: string) {
    const order = await findOrderRow(db, id);
    if (!order) throw notFound('order');
    const access = await loadOrderAccess(db, order);
    if (!can(actorOf(actor), 'order.view', { order: access })) throw notFound('order');
    return { order, access };
  }

  async function companyOf(companyId: string) {
    return db('companies').where({ id: companyId }).first();
  }

  async function createOrder(actor: UserRecord, input: OrderCreate, options: { confirmDuplicate: boolean; ip?: string | undefined }) {
    if (!can(actorOf(actor), 'order.create', { companyId: actor.companyId }))
      throw forbidden('Only agents and the office can place orders.');
    const company = await companyOf(actor.companyId);

    const fees = await listActiveFeeItems(db, actor.companyId);
    const base = fees.find((f) => f.kind === 'base');
    if (!base) throw conflict('The company has no inspection fee set up yet. Ask the office to add one to the fee list.', 'no_base_fee');
    const unknownAddOn = input.addOnIds.findIndex((id) => !fees.some((f) => f.id === id && f.kind === 'add_on'));
    if (unknownAddOn >= 0)
      throw badRequest('Some fields need attention.', [{ path: `addOnIds.${unknownAddOn}`, message: 'This add-on is no longer offered.' }]);
    const lines = [base, ...fees.filter((f) => input.addOnIds.includes(f.id))];
    const total = lines.reduce((sum, f) => sum + f.priceCents, 0);

    const key = addressKey(input.property.address);
    const open = await openOrdersForAddress(db, actor.companyId, key);
    if (open.length > 0 && !options.confirmDuplicate) {
      throw new HttpError(
        409,
        'duplicate_property',
        'This address already has an open inspection order with us. If it is yours, find it on your dashboard; if not, you can still place this order.',
      );
    }

    // People to invite: each must not already hold an account elsewhere under another company.
    const invited: { partyRole: PartyRole; user: UserRecord | undefined; name: string; email: string }[] = [];
    for (const [i, party] of input.parties.entries()) {
      const user = await findUserByEmail(db, party.email);
      if (user && user.companyId !== actor.companyId) {
        throw badRequest('Some fields need attention.', [
          { path: `parties.${i}.email`, message: 'This address cannot be added to an order here.' },
        ]);
      }
      if (user && (user.role === 'office' || user.role === 'inspector')) {
        throw badRequest('Some fields need attention.', [
          { path: `parties.${i}.email`, message: 'Company staff cannot be a party to an order.' },
        ]);
      }
      invited.push({ partyRole: party.partyRole, user, name: party.name, email: party.email });
    }

    const side = orderingSideOf(input.kind);
    const orderId = newId();
    const now = nowIso();
    const address = formatAddress(input.property.address);

    await db.transaction(async (trx) => {
      const propertyId = newId();
      await trx('properties').insert({
        id: propertyId,
        company_id: actor.companyId,
        street: input.property.address.street,
        unit: input.property.address.unit,
        city: input.property.address.city,
        region: input.property.address.region,
        postal_code: input.property.address.postalCode.toUpperCase(),
        address_key: key,
        year_built: input.property.yearBuilt,
        property_type: input.property.propertyType,
        occupancy: input.property.occupancy,
        access_notes: input.property.accessNotes,
        created_at: now,
      });
      await trx('orders').insert({
        id: orderId,
        company_id: actor.companyId,
        property_id: propertyId,
        kind: input.kind,
        ordering_side: side,
        status: 'requested',
        contingency_deadline: input.contingencyDeadline,
        preferred_dates: JSON.stringify(input.preferredDates),
        payer: input.payer,
        fee_total_cents: total,
        payment_state: 'unpaid',
        note: input.note,
        created_by: actor.id,
        created_at: now,
        updated_at: now,
      });
      await trx('order_fee_lines').insert(
        lines.map((f) => ({ order_id: orderId, fee_item_id: f.id, name: f.name, price_cents: f.priceCents })),
      );

      const parties: { user_id: string; party_role: PartyRole }[] = [];
      if (actor.role === 'agent') parties.push({ user_id: actor.id, party_role: side === 'buyer' ? 'buyers_agent' : 'listing_agent' });
      const confirmations: { name: string; email: string; role: Role }[] = [{ name: actor.name, email: actor.email, role: actor.role }];
      for (const person of invited) {
        let userId = person.user?.id;
        if (!userId) {
          userId = await insertUser(trx, {
            companyId: actor.companyId,
            email: person.email,
            name: person.name,
            role: accountRoleFor(person.partyRole),
            passwordHash: null,
            emailVerified: false,
          });
        }
        parties.push({ user_id: userId, party_role: person.partyRole });
        if (person.user?.passwordHash) {
          confirmations.push({ name: person.user.name, email: person.user.email, role: person.user.role });
        } else {
          const token = await issueToken(trx, userId, 'invitation');
          await enqueueMail(trx, {
            companyId: actor.companyId,
            ...mailBrandOf(company, publicUrl),
            to: person.email,
            template: 'order_invitation',
            vars: {
              name: person.user?.name ?? person.name,
              url: `${publicUrl}/invitation?token=${token}`,
              inviterName: actor.name,
              address,
              partyLabel: partyRoleLabels[person.partyRole],
              kindLabel: orderKindLabels[input.kind],
              validDays: tokenLifetimeMs.invitation / 86_400_000,
            },
          });
        }
      }
      await trx('order_parties').insert(
        parties.map((p) => ({
          ...p,
          order_id: orderId,
          company_id: actor.companyId,
          contingency_deadline: input.contingencyDeadline,
          created_at: now,
        })),
      );

      const payerText =
        input.payer === 'agent_now'
          ? 'It is paid by card when the order is placed.'
          : 'The client pays it online before the report is released.';
      for (const person of confirmations) {
        await enqueueMail(trx, {
          companyId: actor.companyId,
          ...mailBrandOf(company, publicUrl),
          to: person.email,
          template: 'order_confirmation',
          vars: {
            name: person.name,
            url: orderUrl(orderId, person.role),
            address,
            kindLabel: orderKindLabels[input.kind],
            deadline: longDate(input.contingencyDeadline),
            feeText: formatMoney(total),
            payerText,
          },
        });
      }
      await addOrderEvent(trx, {
        orderId,
        actorUserId: actor.id,
        type: 'created',
        detail: { feeTotalCents: total, duplicateConfirmed: open.length > 0 },
      });
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'order.created',
        subjectType: 'order',
        subjectId: orderId,
        ip: options.ip,
      });
    });
    deps.mailQueued();
    return getOrder(actor, orderId);
  }

  /** The latest published revision's grade and number, and whether payment holds it. */
  async function reportSummary(orderId: string, order: OrderRow) {
    const latest = await db('report_revisions').where({ order_id: orderId }).orderBy('number', 'desc').first('number', 'grade');
    return latest ? { revision: latest.number as number, grade: latest.grade as string, releaseHeld: Boolean(order.release_held) } : null;
  }

  async function getOrder(actor: UserRecord, id: string) {
    const { order, access } = await visibleOrder(actor, id);
    const property = await db('properties').where({ id: order.property_id }).first();
    const inspector = order.assigned_inspector_id ? await db('users').where({ id: order.assigned_inspector_id }).first() : undefined;
    const feeLines = await db('order_fee_lines').where({ order_id: id }).orderBy('id').select('name', 'price_cents');
    const parties = await listParties(db, id);
    const payment = await db('payments').where({ order_id: id }).orderBy('created_at', 'desc').first();
    const actorAsCore = actorOf(actor);
    const company = await companyOf(order.company_id);
    return {
      id: order.id,
      kind: order.kind,
      orderingSide: order.ordering_side,
      status: order.status,
      contingencyDeadline: order.contingency_deadline,
      daysLeft: daysUntil(order.contingency_deadline, todayIso(new Date(), company.time_zone)),
      preferredDates: JSON.parse(order.preferred_dates) as string[],
      payer: order.payer,
      feeTotalCents: order.fee_total_cents,
      paymentState: order.payment_state,
      property: {
        street: property.street,
        unit: property.unit,
        city: property.city,
        region: property.region,
        postalCode: property.postal_code,
        address: formatAddress({
          street: property.street,
          unit: property.unit,
          city: property.city,
          region: property.region,
          postalCode: property.postal_code,
        }),
        yearBuilt: property.year_built,
        propertyType: property.property_type,
        occupancy: property.occupancy,
        accessNotes: property.access_notes,
      },
      inspector: inspector ? { id: inspector.id as string, name: inspector.name as string } : null,
      window: order.window_date ? { date: order.window_date, startTime: order.window_start!, endTime: order.window_end! } : null,
      note: order.note,
      cancelReason: order.cancel_reason,
      createdAt: order.created_at,
      feeLines: feeLines.map((l) => ({ name: l.name as string, priceCents: l.price_cents as number })),
      // Staff see everyone's e-mail; parties see names and roles.
      parties: parties.map((p) => ({
        userId: p.userId,
        name: p.name,
        partyRole: p.partyRole,
        active: p.active,
        ...(actor.role === 'office' || p.userId === actor.id ? { email: p.email } : {}),
      })),
      history: actor.role === 'client' ? [] : await listOrderEvents(db, id),
      payment: payment
        ? { status: payment.status as string, amountCents: payment.amount_cents as number, updatedAt: payment.updated_at as string }
        : null,
      yourPartyRoles: parties.filter((p) => p.userId === actor.id).map((p) => p.partyRole),
      // The published report, for those who may read it (reports module); null otherwise.
      report: can(actorAsCore, 'report.read', { order: access }) ? await reportSummary(id, order) : null,
      allowed: {
        schedule: can(actorAsCore, 'order.schedule', { order: access }) && (order.status === 'requested' || order.status === 'scheduled'),
        cancel: can(actorAsCore, 'order.cancel', { order: access }) && (order.status === 'requested' || order.status === 'scheduled'),
        pay: can(actorAsCore, 'order.pay', { order: access }) && order.payment_state === 'unpaid' && order.status !== 'cancelled',
        recordInspection:
          can(actorAsCore, 'inspection.edit', { order: access }) && ['scheduled', 'recorded', 'in_review'].includes(order.status),
        finishRecording: can(actorAsCore, 'inspection.edit', { order: access }) && order.status === 'scheduled',
      },
    };
  }

  /** Latest published grade names of the listed orders that this person may read. */
  async function readableGrades(actor: UserRecord, rows: OrderRow[]): Promise<Map<string, string>> {
    const ids = rows.map((r) => r.id);
    if (ids.length === 0) return new Map();
    const revisions = await db('report_revisions').whereIn('order_id', ids).orderBy('number').select('order_id', 'grade');
    const latest = new Map<string, string>(revisions.map((r) => [r.order_id as string, r.grade as string]));
    // None published (the office queue): an empty IN list would read every party row.
    if (latest.size === 0) return new Map();
    const partyRows = await db('order_parties')
      .whereIn('order_id', [...latest.keys()])
      .select('order_id', 'user_id', 'party_role');
    const grades = new Map<string, string>();
    for (const row of rows) {
      const grade = latest.get(row.id);
      if (!grade) continue;
      const access = {
        companyId: row.company_id,
        status: row.status,
        assignedInspectorId: row.assigned_inspector_id,
        orderingSide: row.ordering_side,
        parties: partyRows
          .filter((p) => p.order_id === row.id)
          .map((p) => ({ userId: p.user_id as string, partyRole: p.party_role as PartyRole })),
        releasedTo: JSON.parse(row.released_to || '[]'),
        reportId: row.id,
        published: row.status === 'published',
      };
      if (can(actorOf(actor), 'report.read', { order: access })) grades.set(row.id, gradeInfo[grade as GradeLevel]?.name ?? grade);
    }
    return grades;
  }

  async function list(actor: UserRecord, query: Omit<OrderListFilter, 'companyId' | 'partyUserId' | 'inspectorId'>) {
    const filter: OrderListFilter = { ...query, companyId: actor.companyId };
    if (actor.role === 'agent' || actor.role === 'client') filter.partyUserId = actor.id;
    if (actor.role === 'inspector') filter.inspectorId = actor.id;
    const company = await companyOf(actor.companyId);
    const today = todayIso(new Date(), company.time_zone);
    const { rows, total } = await listOrders(db, filter);
    const gradeOf = await readableGrades(actor, rows as OrderRow[]);
    return {
      total,
      orders: rows.map((r) => ({
        id: r.id as string,
        kind: r.kind,
        status: r.status as OrderStatus,
        address: formatAddress({ street: r.street, unit: r.unit, city: r.city, region: r.region, postalCode: r.postal_code }),
        street: r.street as string,
        city: r.city as string,
        contingencyDeadline: r.contingency_deadline as string,
        daysLeft: daysUntil(r.contingency_deadline, today),
        paymentState: r.payment_state,
        payer: r.payer,
        feeTotalCents: r.fee_total_cents as number,
        inspectorName: (r.inspector_name as string | null) ?? null,
        accessNotes: r.access_notes as string,
        preferredDates: JSON.parse(r.preferred_dates as string) as string[],
        window: r.window_date
          ? { date: r.window_date as string, startTime: r.window_start as string, endTime: r.window_end as string }
          : null,
        createdAt: r.created_at as string,
        // The published grade, for those who may read the report (PRODUCT.md §10).
        grade: gradeOf.get(r.id as string) ?? null,
      })),
    };
  }

  async function schedule(
    actor: UserRecord,
    id: string,
    input: { inspectorId: string; window: { date: string; startTime: string; endTime: string }; note: string },
    ip?: string,
  ) {
    const { order, access } = await visibleOrder(actor, id);
    if (!can(actorOf(actor), 'order.schedule', { order: access })) throw forbidden('Only the office schedules visits.');
    if (order.status !== 'requested' && order.status !== 'scheduled') {
      throw conflict(
        `This order is ${order.status.replace('_', ' ')}; only requested or scheduled orders can be (re)scheduled.`,
        'wrong_status',
      );
    }
    const inspector = await db('users')
      .where({ id: input.inspectorId, company_id: actor.companyId, role: 'inspector' })
      .whereNull('disabled_at')
      .first();
    if (!inspector)
      throw badRequest('Some fields need attention.', [{ path: 'inspectorId', message: 'Choose one of your active inspectors.' }]);
    const rescheduled = order.status === 'scheduled';
    const company = await companyOf(order.company_id);
    await db.transaction(async (trx) => {
      const updated = await trx('orders').where({ id, status: order.status, updated_at: order.updated_at }).update({
        status: 'scheduled',
        assigned_inspector_id: inspector.id,
        window_date: input.window.date,
        window_start: input.window.startTime,
        window_end: input.window.endTime,
        updated_at: nowIso(),
      });
      if (updated !== 1) throw conflict('Someone else changed this order just now. Reload it and try again.', 'stale');
      await addOrderEvent(trx, {
        orderId: id,
        actorUserId: actor.id,
        type: rescheduled ? 'rescheduled' : 'scheduled',
        detail: {
          inspectorName: inspector.name,
          ...input.window,
          note: input.note,
          previous: rescheduled ? { date: order.window_date, startTime: order.window_start, endTime: order.window_end } : undefined,
        },
      });
      const fresh = (await findOrderRow(trx, id))!;
      const address = await propertyAddressOf(trx, fresh);
      await mailOrderParties(
        trx,
        fresh,
        mailBrandOf(company, publicUrl),
        'schedule_change',
        (person) => ({
          name: person.name,
          url: person.email === inspector.email ? orderUrl(id, 'inspector') : orderUrl(id, 'client'),
          address,
          windowText: windowText(input.window.date, input.window.startTime, input.window.endTime),
          inspectorName: inspector.name,
          rescheduled,
          note: input.note,
        }),
        { includeInspector: true },
      );
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: rescheduled ? 'order.rescheduled' : 'order.scheduled',
        subjectType: 'order',
        subjectId: id,
        ip,
      });
    });
    deps.mailQueued();
    return getOrder(actor, id);
  }

  async function cancel(actor: UserRecord, id: string, reason: string, ip?: string) {
    const { order, access } = await visibleOrder(actor, id);
    if (!can(actorOf(actor), 'order.cancel', { order: access })) {
      throw forbidden(
        actor.role === 'agent' ? 'Once a visit is scheduled, only the office can cancel. Contact them.' : 'You cannot cancel this order.',
      );
    }
    if (order.status !== 'requested' && order.status !== 'scheduled')
      throw conflict('The visit has already happened; this order can no longer be cancelled.', 'wrong_status');
    // The refund goes first: if the provider fails, nothing here changes and the person can retry.
    const refunded = order.payment_state === 'paid' ? await deps.refundOrderPayment(order, actor) : null;
    const company = await companyOf(order.company_id);
    await db.transaction(async (trx) => {
      await trx('orders')
        .where({ id })
        .update({
          status: 'cancelled',
          cancel_reason: reason,
          updated_at: nowIso(),
          ...(refunded !== null ? { payment_state: 'refunded' } : {}),
        });
      await addOrderEvent(trx, { orderId: id, actorUserId: actor.id, type: 'cancelled', detail: { reason, refundedCents: refunded } });
      const address = await propertyAddressOf(trx, order);
      await mailOrderParties(
        trx,
        order,
        mailBrandOf(company, publicUrl),
        'order_cancelled',
        (person) => ({
          name: person.name,
          url: orderUrl(id, 'client'),
          address,
          reason,
          refundText: refunded !== null ? `The fee of ${formatMoney(refunded)} has been refunded to the card it was paid with.` : '',
        }),
        { includeInspector: true },
      );
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'order.cancelled',
        subjectType: 'order',
        subjectId: id,
        detail: { reason },
        ip,
      });
    });
    deps.mailQueued();
    return getOrder(actor, id);
  }

  /** The inspector (or office) says the camera work is done: scheduled → recorded, ready for review. */
  async function markRecorded(actor: UserRecord, id: string, ip?: string) {
    const { order, access } = await visibleOrder(actor, id);
    if (!can(actorOf(actor), 'inspection.edit', { order: access }))
      throw forbidden('Only the assigned inspector or the office can finish the recording.');
    if (order.status !== 'scheduled')
      throw conflict(`This order is ${order.status.replace('_', ' ')}; only a scheduled visit can be marked recorded.`, 'wrong_status');
    const inspection = await db('inspections').where({ order_id: id }).first('document');
    const runs = inspection ? ((JSON.parse(inspection.document) as { runs?: unknown[] }).runs ?? []) : [];
    if (runs.length === 0) throw conflict('Record at least one run before finishing.', 'no_runs');
    await db.transaction(async (trx) => {
      await trx('orders').where({ id, status: 'scheduled' }).update({ status: 'recorded', updated_at: nowIso() });
      await addOrderEvent(trx, { orderId: id, actorUserId: actor.id, type: 'recorded', detail: { runs: runs.length } });
      await recordAudit(trx, {
        companyId: order.company_id,
        actorUserId: actor.id,
        action: 'order.recorded',
        subjectType: 'order',
        subjectId: id,
        ip,
      });
    });
    return getOrder(actor, id);
  }

  async function listInspectors(actor: UserRecord) {
    if (actor.role !== 'office') throw forbidden();
    const rows = await db('users')
      .where({ company_id: actor.companyId, role: 'inspector' })
      .whereNull('disabled_at')
      .whereNotNull('password_hash')
      .orderBy('name')
      .select('id', 'name');
    return rows.map((r) => ({ id: r.id as string, name: r.name as string }));
  }

  return {
    // Two orders inviting one new client at once: the second finds the first's pending account.
    createOrder: (...args: Parameters<typeof createOrder>) => againOnUniqueViolation(() => createOrder(...args)),
    getOrder,
    list,
    schedule,
    cancel,
    markRecorded,
    listInspectors,
    visibleOrder,
  };
}

export type OrdersService = ReturnType<typeof createOrdersService>;
