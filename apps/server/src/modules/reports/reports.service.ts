import type { Knex } from 'knex';
import { LRUCache } from 'lru-cache';
import {
  analyseInspection,
  can,
  compareRevisions,
  formatAddress,
  gradeInfo,
  inspectionSchema,
  otherSide,
  propertyTypeNames,
  sideOf,
  sides,
  type Actor,
  type GradeOverride,
  type PartyRole,
  type Side,
} from '@underfoot/core';
import { badRequest, conflict, fieldErrorsFrom, forbidden, HttpError, notFound } from '../../http/errors.ts';
import { nowIso } from '../../lib/clock.ts';
import { hashToken, newId, newSecretToken } from '../../lib/ids.ts';
import type { MediaStorage } from '../../storage/media-storage.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { mailBrandOf, type MailBrand } from '../company/brand.ts';
import { loadPriceBook } from '../company/price-book.repo.ts';
import { referencedMediaIds } from '../inspections/inspection-rules.ts';
import { findInspection, updateIfVersion } from '../inspections/inspections.repo.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';
import { findMedia } from '../media/media.repo.ts';
import { addOrderEvent, findOrderRow, listParties, loadOrderAccess, type OrderRow } from '../orders/orders.repo.ts';
import { renderReportPdf } from './report-pdf.ts';
import {
  findShareLinkByTokenHash,
  latestRevision,
  listRevisionRows,
  listRevisions,
  recordView,
  revisionListItem,
  revisionByNumber,
  revisionSnapshot,
  snapshotMediaIds,
  type ReportSnapshot,
  type RevisionRow,
  type ShareLinkRow,
} from './reports.repo.ts';

export interface ReportsServiceDeps {
  db: Knex;
  publicUrl: string;
  mailQueued: () => void;
  /** Where the stills live, for guests' media and the PDF. */
  storage: MediaStorage;
}

export type RevisionKind = RevisionRow['kind'];

const actorOf = (u: UserRecord): Actor => ({ kind: 'user', userId: u.id, role: u.role, companyId: u.companyId });
const isStaff = (u: UserRecord) => u.role === 'office' || u.role === 'inspector';

/** Orders a report can be published from: recorded in the field, not yet published, not cancelled. */
const publishableStatuses = new Set(['requested', 'scheduled', 'recorded', 'in_review']);

/** The one answer for every link that does not work: unknown, expired and revoked look the same. */
const linkNotWorking = () =>
  new HttpError(
    404,
    'not_found',
    'This link does not work. It may have expired or been withdrawn; ask the person who sent it for a new one.',
  );

/** "2204-beacon-hill-road" for file names. */
const slug = (text: string) =>
  text
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .toLowerCase()
    .replace(/[\s_-]+/g, '-')
    .slice(0, 60) || 'report';

export function createReportsService(deps: ReportsServiceDeps) {
  const { db, publicUrl, storage } = deps;

  async function orderFor(user: UserRecord, orderId: string) {
    const order = await findOrderRow(db, orderId);
    if (!order) throw notFound('report');
    const access = await loadOrderAccess(db, order);
    return { order, access, actor: actorOf(user) };
  }

  const companyOf = async (order: OrderRow) => db('companies').where({ id: order.company_id }).first();

  /** Mail the parties on the given sides that a report (or its new revision) is there to read. */
  async function mailReleased(trx: Knex, order: OrderRow, brand: MailBrand, toSides: readonly Side[], revisionNumber: number) {
    const parties = await listParties(trx, order.id);
    const address = await addressOf(trx, order);
    const seen = new Set<string>();
    for (const p of parties) {
      if (!toSides.includes(sideOf(p.partyRole)) || seen.has(p.email)) continue;
      seen.add(p.email);
      await enqueueMail(trx, {
        companyId: order.company_id,
        ...brand,
        to: p.email,
        template: 'report_released',
        vars: { name: p.name, url: `${publicUrl}/portal/reports/${order.id}`, address, revised: revisionNumber > 1 },
      });
    }
  }

  async function addressOf(trx: Knex, order: OrderRow) {
    const p = await trx('properties').where({ id: order.property_id }).first();
    return formatAddress({ street: p.street, unit: p.unit, city: p.city, region: p.region, postalCode: p.postal_code });
  }

  const publishAllowed = (
    actor: Actor,
    access: Awaited<ReturnType<typeof loadOrderAccess>>,
    company: { inspectors_may_publish: unknown },
  ) => can(actor, 'report.publish', { order: access, inspectorsMayPublish: Boolean(company.inspectors_may_publish) });

  /** Freeze the inspection and what core computes from it as a new revision, and release it unless payment holds it. */
  async function publish(
    user: UserRecord,
    orderId: string,
    input: { note: string; kind?: 'amendment' | 'reinspection' | undefined; inspectionVersion?: number | undefined },
    ip?: string,
  ) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!publishAllowed(actor, access, company)) {
      throw forbidden(user.role === 'inspector' ? 'Your company has the office publish reports.' : 'You cannot publish this report.');
    }
    if (!publishableStatuses.has(order.status)) {
      throw conflict(
        order.status === 'published'
          ? 'This report is already published. Reopen it for an amendment first.'
          : 'This order was cancelled; there is no report to publish.',
        'wrong_status',
      );
    }
    const stored = await findInspection(db, orderId);
    if (!stored) throw conflict('There is no recorded inspection to publish yet.', 'no_inspection');
    if (input.inspectionVersion !== undefined && input.inspectionVersion !== stored.version) {
      throw conflict(
        `${stored.updatedBy?.name ?? 'Someone'} changed the inspection after you opened this review. Look at the new results before publishing.`,
        'inspection_changed',
      );
    }
    const parsed = inspectionSchema.safeParse(stored.document);
    if (!parsed.success) throw badRequest('The inspection has problems to fix before it can be published.', fieldErrorsFrom(parsed.error));
    if (parsed.data.runs.length === 0) throw conflict('Add at least one run before publishing.', 'no_runs');
    const previous = await latestRevision(db, orderId);
    const kind: RevisionKind = previous ? (input.kind ?? 'amendment') : 'original';
    if (previous && input.note.trim().length < 3) {
      throw badRequest('Say what changed in this revision.', [{ path: 'note', message: 'Say what changed in this revision.' }]);
    }

    const book = await loadPriceBook(db, order.company_id);
    const analysis = analyseInspection(parsed.data, book.priceBook, { demoPrices: book.isDefault });
    const property = await db('properties').where({ id: order.property_id }).first();
    const inspector = order.assigned_inspector_id ? await db('users').where({ id: order.assigned_inspector_id }).first('name') : undefined;
    const mediaIds = new Set(referencedMediaIds(parsed.data));
    const mediaRows = mediaIds.size
      ? await db('media')
          .whereIn('id', [...mediaIds])
          .where({ order_id: orderId })
      : [];
    const rendered = mediaRows.length
      ? await db('media')
          .whereIn(
            'source_media_id',
            mediaRows.map((m) => m.id),
          )
          .where({ kind: 'rendered' })
      : [];
    const snapshot: ReportSnapshot = {
      orderId,
      kind: order.kind,
      orderingSide: order.ordering_side,
      property: {
        address: formatAddress({
          street: property.street,
          unit: property.unit,
          city: property.city,
          region: property.region,
          postalCode: property.postal_code,
        }),
        yearBuilt: property.year_built,
        propertyType: propertyTypeNames[property.property_type as keyof typeof propertyTypeNames] ?? property.property_type,
      },
      company: {
        name: company.name,
        licenceNumber: company.licence_number,
        phone: company.phone,
        email: company.email,
        footer: company.report_footer ?? null,
      },
      inspector: inspector ? { name: inspector.name } : null,
      inspectedOn: order.window_date,
      inspection: parsed.data,
      analysis,
      media: mediaRows.map((m) => ({
        id: m.id,
        kind: m.kind === 'video' ? 'video' : 'still',
        observationId: m.observation_id,
        runId: m.run_id,
        renderedId: rendered.find((r) => r.source_media_id === m.id)?.id ?? null,
        hasThumbnail: Boolean(m.thumbnail_key),
        videoTime: m.video_time,
        footage: m.footage,
      })),
    };

    const requirePayment = Boolean(company.require_payment_before_release) && order.payment_state !== 'paid';
    const releasedBefore = JSON.parse(order.released_to || '[]') as Side[];
    const release: Side[] = requirePayment ? releasedBefore : [...new Set([...releasedBefore, order.ordering_side])];
    const number = (previous?.number ?? 0) + 1;
    await db.transaction(async (trx) => {
      const moved = await trx('orders')
        .where({ id: orderId, status: order.status })
        .update({ status: 'published', released_to: JSON.stringify(release), release_held: requirePayment, updated_at: nowIso() });
      if (moved !== 1) throw conflict('Someone else changed this order just now. Reload and try again.', 'stale');
      await trx('report_revisions').insert({
        id: newId(),
        order_id: orderId,
        number,
        kind,
        note: input.note,
        snapshot: JSON.stringify(snapshot),
        grade: analysis.grade.level,
        published_by: user.id,
        published_at: nowIso(),
      });
      await addOrderEvent(trx, {
        orderId,
        actorUserId: user.id,
        type: number === 1 ? 'published' : 'revised',
        detail: { revision: number, kind, grade: analysis.grade.level, held: requirePayment },
      });
      await recordAudit(trx, {
        companyId: order.company_id,
        actorUserId: user.id,
        action: number === 1 ? 'report.published' : 'report.amended',
        subjectType: 'order',
        subjectId: orderId,
        detail: {
          revision: number,
          kind,
          grade: analysis.grade.level,
          computedGrade: analysis.grade.computedLevel,
          override: parsed.data.gradeOverride ?? null,
        },
        ip,
      });
      if (release.length > 0) await mailReleased(trx, order, mailBrandOf(company, publicUrl), release, number);
    });
    deps.mailQueued();
    return { revision: number, grade: analysis.grade.level, releaseHeld: requirePayment };
  }

  /** Reopen a published report for an amendment or a re-inspection: the published revision stays readable meanwhile. */
  async function reopen(user: UserRecord, orderId: string, ip?: string) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!publishAllowed(actor, access, company))
      throw forbidden('Only the office, or an inspector the company allows, can reopen a report.');
    if (order.status !== 'published') throw conflict('Only a published report can be reopened.', 'wrong_status');
    await db.transaction(async (trx) => {
      const moved = await trx('orders').where({ id: orderId, status: 'published' }).update({ status: 'in_review', updated_at: nowIso() });
      if (moved !== 1) throw conflict('Someone else changed this order just now. Reload and try again.', 'stale');
      await addOrderEvent(trx, { orderId, actorUserId: user.id, type: 'reopened' });
      await recordAudit(trx, {
        companyId: order.company_id,
        actorUserId: user.id,
        action: 'report.reopened',
        subjectType: 'order',
        subjectId: orderId,
        ip,
      });
    });
  }

  /** Called when the fee is paid: a report held for payment goes out to the ordering side. */
  async function releaseHeld(trx: Knex, orderId: string): Promise<boolean> {
    const order = await findOrderRow(trx, orderId);
    if (!order || !order.release_held) return false;
    const released = [...new Set([...(JSON.parse(order.released_to || '[]') as Side[]), order.ordering_side])];
    await trx('orders')
      .where({ id: orderId })
      .update({ release_held: false, released_to: JSON.stringify(released), updated_at: nowIso() });
    const company = await trx('companies').where({ id: order.company_id }).first();
    const latest = await latestRevision(trx, orderId);
    await addOrderEvent(trx, { orderId, actorUserId: null, type: 'released', detail: { sides: released } });
    await mailReleased(trx, order, mailBrandOf(company, publicUrl), [order.ordering_side], latest?.number ?? 1);
    return true;
  }

  /** What the review screen needs besides the inspection itself: who may do what, the payment hold, the revisions. */
  async function review(user: UserRecord, orderId: string) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'order.view', { order: access }) || !isStaff(user)) throw notFound('order');
    const mayPublish = publishAllowed(actor, access, company);
    const stored = await findInspection(db, orderId);
    return {
      order: {
        id: order.id,
        kind: order.kind,
        status: order.status,
        address: await addressOf(db, order),
        paymentState: order.payment_state,
        payer: order.payer,
      },
      inspectionVersion: stored?.version ?? 0,
      requirePaymentBeforeRelease: Boolean(company.require_payment_before_release),
      inspectorsMayPublish: Boolean(company.inspectors_may_publish),
      releaseHeld: Boolean(order.release_held),
      releasedTo: JSON.parse(order.released_to || '[]') as Side[],
      revisions: await listRevisions(db, orderId),
      allowed: {
        publish: mayPublish && publishableStatuses.has(order.status) && Boolean(stored),
        reopen: mayPublish && order.status === 'published',
        override: mayPublish && can(actor, 'inspection.edit', { order: access }) && order.status !== 'cancelled' && Boolean(stored),
      },
    };
  }

  /**
   * Set or clear the grade override on the inspection, with the version the reviewer started
   * from (as every inspection save), and keep it in the audit trail.
   */
  async function setGradeOverride(
    user: UserRecord,
    orderId: string,
    input: { baseVersion: number; override: GradeOverride | null },
    ip?: string,
  ) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'order.view', { order: access })) throw notFound('order');
    if (!publishAllowed(actor, access, company))
      throw forbidden('Only the office, or an inspector the company allows, can change the grade.');
    if (!can(actor, 'inspection.edit', { order: access }) || order.status === 'cancelled') {
      throw new HttpError(403, 'inspection_published', 'This report is published. Reopen it for an amendment to change the grade.');
    }
    const stored = await findInspection(db, orderId);
    if (!stored) throw conflict('There is no recorded inspection to grade yet.', 'no_inspection');
    if (stored.version !== input.baseVersion) {
      throw conflict(
        `${stored.updatedBy?.name ?? 'Someone'} changed the inspection just now. Reload to see the new results.`,
        'version_conflict',
      );
    }
    const document = inspectionSchema.parse({ ...stored.document, gradeOverride: input.override });
    const computed = analyseInspection({ ...document, gradeOverride: null }, (await loadPriceBook(db, order.company_id)).priceBook).grade;
    const now = nowIso();
    await db.transaction(async (trx) => {
      const saved = await updateIfVersion(trx, { orderId, baseVersion: input.baseVersion, document, userId: user.id, now });
      if (!saved) throw conflict('Someone changed the inspection just now. Reload to see the new results.', 'version_conflict');
      await recordAudit(trx, {
        companyId: order.company_id,
        actorUserId: user.id,
        action: 'report.overridden',
        subjectType: 'order',
        subjectId: orderId,
        detail: {
          what: 'grade',
          computed: computed.computedLevel,
          from: stored.document.gradeOverride?.level ?? null,
          to: input.override?.level ?? null,
          reason: input.override?.reason ?? null,
        },
        ip,
      });
    });
    return { version: input.baseVersion + 1, updatedAt: now };
  }

  /*
   * A published revision never changes, so what readers get of it (the parsed snapshot, the
   * view with or without costs, the comparison with the revision before) is worked out once
   * per process and kept: correct behind any number of servers, since there is nothing to invalidate.
   */
  const frozen = new LRUCache<string, object>({ max: 500 });
  const once = async <T extends object>(key: string, make: () => Promise<T> | T): Promise<T> => {
    const kept = frozen.get(key) as T | undefined;
    if (kept) return kept;
    const made = await make();
    frozen.set(key, made);
    return made;
  };
  const snapshotOf = (revision: RevisionRow) => once(`snapshot:${revision.id}`, () => revisionSnapshot(db, revision.id));

  /** The revision as readers get it; shared, so never changed by callers. */
  function viewOf(revision: RevisionRow, options: { showCosts: boolean }) {
    return once(`view:${revision.id}:${options.showCosts}`, async () => {
      let snapshot = await snapshotOf(revision);
      if (!options.showCosts) {
        const sentences = snapshot.analysis.summary.sentences.filter((s) => !s.includes('$'));
        snapshot = {
          ...snapshot,
          analysis: {
            ...snapshot.analysis,
            costs: { ...snapshot.analysis.costs, options: [], proposed: null },
            summary: { sentences, text: sentences.join(' ') },
          },
        };
      }
      return {
        number: revision.number,
        kind: revision.kind,
        note: revision.note,
        publishedAt: revision.published_at,
        gradeInfo: gradeInfo[revision.grade],
        snapshot,
        costsHidden: !options.showCosts,
      };
    });
  }

  async function comparisonFor(orderId: string, revision: RevisionRow) {
    if (revision.number === 1) return null;
    const { comparison } = await once(`changes:${revision.id}`, async () => {
      const previous = await revisionByNumber(db, orderId, revision.number - 1);
      if (!previous) return { comparison: null };
      const [a, b] = [await snapshotOf(previous), await snapshotOf(revision)];
      return {
        comparison: compareRevisions(
          { inspection: a.inspection, grade: previous.grade },
          { inspection: b.inspection, grade: revision.grade },
        ),
      };
    });
    return comparison;
  }

  /** The sides of the sale this person stands on for this order (none for company staff). */
  function sidesOfUser(access: Awaited<ReturnType<typeof loadOrderAccess>>, userId: string): Side[] {
    return [...new Set(access.parties.filter((p) => p.userId === userId).map((p) => sideOf(p.partyRole)))];
  }

  /** The report a signed-in reader may see, or 404 for everyone else (a guess learns nothing). */
  async function readableRevision(user: UserRecord, orderId: string, revisionNumber?: number) {
    const order = await findOrderRow(db, orderId);
    if (!order) throw notFound('report');
    // One look at the revisions serves the permission check, the list and the one to show.
    const revisions = await listRevisionRows(db, orderId);
    const access = await loadOrderAccess(db, order, { published: revisions.length > 0 });
    const actor = actorOf(user);
    if (!can(actor, 'report.read', { order: access })) throw notFound('report');
    const revision = revisionNumber ? revisions.find((r) => r.number === revisionNumber) : revisions[revisions.length - 1];
    if (!revision) throw notFound('report');
    return { order, access, actor, revision, revisions };
  }

  /** The report as a signed-in reader sees it (latest revision, or a given one); every read is logged. */
  async function read(user: UserRecord, orderId: string, options: { revision?: number | undefined; ip?: string | undefined } = {}) {
    const { order, access, actor, revision, revisions } = await readableRevision(user, orderId, options.revision);
    await recordView(db, {
      orderId,
      revisionNumber: revision.number,
      viewerUserId: user.id,
      shareLinkId: null,
      what: 'report',
      ip: options.ip,
    });
    const released = JSON.parse(order.released_to || '[]') as Side[];
    const readerSides = sidesOfUser(access, user.id);
    return {
      orderId,
      status: order.status,
      releaseHeld: Boolean(order.release_held),
      releasedTo: released,
      /** The reader's side of the sale, for "what this means for you"; null for company staff. */
      readerSide: readerSides.includes(order.ordering_side) ? order.ordering_side : (readerSides[0] ?? null),
      revisions: revisions.map(revisionListItem),
      revision: await viewOf(revision, { showCosts: true }),
      changes: await comparisonFor(orderId, revision),
      allowed: {
        disclose: can(actor, 'report.disclose', { order: access }) && !released.includes(otherSide(order.ordering_side)),
        withdraw: can(actor, 'report.disclose', { order: access }) && released.includes(otherSide(order.ordering_side)),
        share: can(actor, 'shareLink.manage', { order: access }),
        disclosureLink: can(actor, 'shareLink.manage', { order: access }) && order.kind === 'pre_listing',
        viewLog: can(actor, 'report.viewLog', { order: access }),
        ask: can(actor, 'question.ask', { order: access }),
        answer: can(actor, 'question.answer', { order: access }),
      },
    };
  }

  async function setDisclosure(user: UserRecord, orderId: string, disclose: boolean, ip?: string) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'report.read', { order: access })) throw notFound('report');
    if (!can(actor, 'report.disclose', { order: access }))
      throw forbidden('Only the side that ordered the inspection can share it with the other side.');
    const other = otherSide(order.ordering_side);
    const released = new Set(JSON.parse(order.released_to || '[]') as Side[]);
    if (disclose === released.has(other)) return { releasedTo: [...released] };
    if (disclose) released.add(other);
    else released.delete(other);
    const next = sides.filter((s) => released.has(s));
    await db.transaction(async (trx) => {
      await trx('orders')
        .where({ id: orderId })
        .update({ released_to: JSON.stringify(next), updated_at: nowIso() });
      await addOrderEvent(trx, { orderId, actorUserId: user.id, type: disclose ? 'disclosed' : 'disclosure_withdrawn' });
      await recordAudit(trx, {
        companyId: order.company_id,
        actorUserId: user.id,
        action: disclose ? 'report.disclosed' : 'report.disclosure_withdrawn',
        subjectType: 'order',
        subjectId: orderId,
        ip,
      });
      if (disclose)
        await mailReleased(trx, order, mailBrandOf(company, publicUrl), [other], (await latestRevision(trx, orderId))?.number ?? 1);
    });
    deps.mailQueued();
    return { releasedTo: next };
  }

  async function createShareLink(
    user: UserRecord,
    orderId: string,
    input: { purpose: 'guest' | 'disclosure'; label: string; expiresInDays: number | null; showCosts: boolean },
    ip?: string,
  ) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!can(actor, 'shareLink.manage', { order: access }))
      throw forbidden('Only the office and the ordering agent can share this report.');
    if (!access.reportId) throw conflict('The report is not published yet.', 'not_published');
    // A report held for payment is not released to its own side yet, so its side cannot pass it on either.
    if (!can(actor, 'report.read', { order: access })) throw forbidden('The report is held until the inspection fee is paid.');
    if (input.purpose === 'disclosure' && order.kind !== 'pre_listing') {
      throw badRequest('Disclosure links are for pre-listing reports.', [
        { path: 'purpose', message: 'Disclosure links are for pre-listing reports.' },
      ]);
    }
    const days = input.purpose === 'disclosure' ? null : (input.expiresInDays ?? company.share_link_days);
    const token = newSecretToken();
    const id = newId();
    const expiresAt = days ? new Date(Date.now() + days * 86_400_000).toISOString() : null;
    await db.transaction(async (trx) => {
      await trx('share_links').insert({
        id,
        order_id: orderId,
        purpose: input.purpose,
        token_hash: hashToken(token),
        label: input.label,
        show_costs: input.showCosts,
        expires_at: expiresAt,
        created_by: user.id,
        created_at: nowIso(),
      });
      await recordAudit(trx, {
        companyId: order.company_id,
        actorUserId: user.id,
        action: 'share_link.created',
        subjectType: 'order',
        subjectId: orderId,
        detail: { shareLinkId: id, purpose: input.purpose, label: input.label, expiresAt, showCosts: input.showCosts },
        ip,
      });
    });
    // The token exists only in this answer (the table keeps its hash): the person copies it now.
    return { id, url: `${publicUrl}/shared/${token}`, expiresAt };
  }

  async function listShareLinks(user: UserRecord, orderId: string) {
    const { access, actor } = await orderFor(user, orderId);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!can(actor, 'shareLink.manage', { order: access })) throw forbidden();
    const rows = await db('share_links')
      .leftJoin('users', 'users.id', 'share_links.created_by')
      .where('share_links.order_id', orderId)
      .orderBy('share_links.created_at', 'desc')
      .select('share_links.*', 'users.name as created_by_name');
    const views = await db('report_views')
      .where({ order_id: orderId })
      .whereNotNull('share_link_id')
      .groupBy('share_link_id')
      .select('share_link_id')
      .count({ n: '*' });
    const now = nowIso();
    return rows.map((r) => ({
      id: r.id as string,
      purpose: r.purpose as 'guest' | 'disclosure',
      label: r.label as string,
      showCosts: Boolean(r.show_costs),
      expiresAt: r.expires_at as string | null,
      revokedAt: r.revoked_at as string | null,
      createdAt: r.created_at as string,
      createdBy: (r.created_by_name as string | null) ?? null,
      active: !r.revoked_at && (!r.expires_at || r.expires_at > now),
      views: Number((views as { share_link_id: string; n: number | string }[]).find((v) => v.share_link_id === r.id)?.n ?? 0),
    }));
  }

  async function revokeShareLink(user: UserRecord, orderId: string, linkId: string, ip?: string) {
    const { order, access, actor } = await orderFor(user, orderId);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!can(actor, 'shareLink.manage', { order: access })) throw forbidden();
    const changed = await db('share_links')
      .where({ id: linkId, order_id: orderId })
      .whereNull('revoked_at')
      .update({ revoked_at: nowIso() });
    if (!changed) throw notFound('link');
    await recordAudit(db, {
      companyId: order.company_id,
      actorUserId: user.id,
      action: 'share_link.revoked',
      subjectType: 'order',
      subjectId: orderId,
      detail: { shareLinkId: linkId },
      ip,
    });
  }

  /** A working link with its order and the latest revision, or the one 404 for any link that does not work. */
  async function liveLink(token: string): Promise<{ link: ShareLinkRow; order: OrderRow; revision: RevisionRow }> {
    // Tokens are 43 URL-safe characters; anything else is not worth a database look-up.
    if (!/^[\w-]{20,100}$/.test(token)) throw linkNotWorking();
    const link = await findShareLinkByTokenHash(db, hashToken(token));
    if (!link || link.revoked_at || (link.expires_at && link.expires_at <= nowIso())) throw linkNotWorking();
    const order = await findOrderRow(db, link.order_id);
    const access = order ? await loadOrderAccess(db, order) : undefined;
    if (!order || !access || !can({ kind: 'guest', reportId: order.id }, 'report.read', { order: access })) throw linkNotWorking();
    const revision = await latestRevision(db, order.id);
    if (!revision) throw linkNotWorking();
    return { link, order, revision };
  }

  /**
   * Who a guest reads as. A disclosure link is for prospective buyers of a listing, so the grade
   * speaks to them ("what this means for you") as the other side of the sale; anyone else with a
   * link reads about the side that ordered.
   */
  const guestSide = (link: { purpose: string }, order: { ordering_side: Side }): Side | null =>
    link.purpose === 'disclosure' ? otherSide(order.ordering_side) : null;

  /** A guest's read through a share link: the latest revision, without costs when the link says so. */
  async function readShared(token: string, options: { ip?: string | undefined } = {}) {
    const { link, order, revision } = await liveLink(token);
    await recordView(db, {
      orderId: order.id,
      revisionNumber: revision.number,
      viewerUserId: null,
      shareLinkId: link.id,
      what: 'report',
      ip: options.ip,
    });
    return {
      orderId: order.id,
      purpose: link.purpose,
      expiresAt: link.expires_at,
      readerSide: guestSide(link, order),
      revision: await viewOf(revision, { showCosts: Boolean(link.show_costs) }),
      changes: await comparisonFor(order.id, revision),
    };
  }

  /** A file a guest may fetch: only those the link's latest revision shows. */
  async function sharedMediaFile(token: string, mediaId: string, variant: 'file' | 'thumbnail') {
    const { revision } = await liveLink(token);
    if (!snapshotMediaIds(await snapshotOf(revision)).has(mediaId)) throw notFound('file');
    const row = await findMedia(db, mediaId);
    if (!row || row.order_id !== revision.order_id) throw notFound('file');
    const key = variant === 'thumbnail' ? row.thumbnail_key : row.storage_key;
    if (!key) throw notFound('file');
    const info = await storage.stat(key);
    if (!info) throw notFound('file');
    const ext = key.slice(key.lastIndexOf('.'));
    return {
      key,
      size: info.size,
      mime: variant === 'thumbnail' ? 'image/jpeg' : row.mime,
      fileName: `${row.kind}-${row.id}${variant === 'thumbnail' ? '-thumb' : ''}${ext}`,
      etag: `"${row.id}-${variant}-${info.size}"`,
    };
  }

  /** The bytes of an image the PDF embeds (the burned-in copy where there is one). */
  async function imageBytes(mediaId: string): Promise<Buffer | null> {
    const row = await findMedia(db, mediaId);
    if (!row || row.kind === 'video') return null;
    if (!(await storage.stat(row.storage_key))) return null;
    const chunks: Buffer[] = [];
    for await (const chunk of await storage.get(row.storage_key)) chunks.push(Buffer.from(chunk as Uint8Array));
    return Buffer.concat(chunks);
  }

  function pdfFileName(snapshot: ReportSnapshot, revisionNumber: number) {
    const street = snapshot.property.address.split(',')[0] ?? snapshot.property.address;
    return `sewer-line-report-${slug(street)}${revisionNumber > 1 ? `-revision-${revisionNumber}` : ''}.pdf`;
  }

  /** The PDF of a revision for a signed-in reader; the download is logged as a view. */
  async function pdf(user: UserRecord, orderId: string, options: { revision?: number | undefined; ip?: string | undefined } = {}) {
    const { order, access, revision } = await readableRevision(user, orderId, options.revision);
    const view = await viewOf(revision, { showCosts: true });
    const readerSides = sidesOfUser(access, user.id);
    const bytes = await renderReportPdf(
      {
        revision: view,
        changes: await comparisonFor(orderId, revision),
        readerSide: readerSides.includes(order.ordering_side) ? order.ordering_side : (readerSides[0] ?? null),
      },
      imageBytes,
    );
    await recordView(db, {
      orderId,
      revisionNumber: revision.number,
      viewerUserId: user.id,
      shareLinkId: null,
      what: 'pdf',
      ip: options.ip,
    });
    return { bytes, fileName: pdfFileName(view.snapshot, revision.number) };
  }

  /** The PDF for a guest: the latest revision, costs as the link allows. */
  async function sharedPdf(token: string, options: { ip?: string | undefined } = {}) {
    const { link, order, revision } = await liveLink(token);
    const view = await viewOf(revision, { showCosts: Boolean(link.show_costs) });
    const bytes = await renderReportPdf(
      { revision: view, changes: await comparisonFor(order.id, revision), readerSide: guestSide(link, order) },
      imageBytes,
    );
    await recordView(db, {
      orderId: order.id,
      revisionNumber: revision.number,
      viewerUserId: null,
      shareLinkId: link.id,
      what: 'pdf',
      ip: options.ip,
    });
    return { bytes, fileName: pdfFileName(view.snapshot, revision.number) };
  }

  async function views(user: UserRecord, orderId: string) {
    const { access, actor } = await orderFor(user, orderId);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!can(actor, 'report.viewLog', { order: access })) throw forbidden();
    const rows = await db('report_views')
      .leftJoin('users', 'users.id', 'report_views.viewer_user_id')
      .leftJoin('share_links', 'share_links.id', 'report_views.share_link_id')
      .where('report_views.order_id', orderId)
      .orderBy('report_views.id', 'desc')
      .limit(500)
      .select(
        'report_views.viewed_at',
        'report_views.what',
        'report_views.revision_number',
        'report_views.viewer_user_id',
        'users.name as viewer_name',
        'users.role as viewer_role',
        'share_links.label as link_label',
        'share_links.purpose as link_purpose',
      );
    const partyRoles = new Map<string, PartyRole>();
    for (const p of access.parties) if (!partyRoles.has(p.userId)) partyRoles.set(p.userId, p.partyRole);
    return rows.map((r) => ({
      at: r.viewed_at as string,
      what: r.what as 'report' | 'pdf',
      revision: r.revision_number as number,
      who:
        (r.viewer_name as string | null) ??
        (r.link_purpose === 'disclosure' ? 'Someone with the disclosure link' : `Guest link${r.link_label ? `: ${r.link_label}` : ''}`),
      /** An account role, or "guest" for a share link. */
      role: (r.viewer_role as string | null) ?? 'guest',
      partyRole: r.viewer_user_id ? (partyRoles.get(r.viewer_user_id as string) ?? null) : null,
    }));
  }

  /**
   * The questions a reader sees: company staff see every thread; a party sees the threads
   * started on their own side of the sale, so a disclosed report does not hand the other
   * side the questions one side asked its inspector.
   */
  async function questions(user: UserRecord, orderId: string) {
    const { access, actor } = await orderFor(user, orderId);
    if (!can(actor, 'report.read', { order: access })) throw notFound('report');
    const rows = await db('report_messages')
      .leftJoin('users', 'users.id', 'report_messages.author_id')
      .where('report_messages.order_id', orderId)
      .orderBy([{ column: 'report_messages.created_at' }, { column: 'report_messages.id' }])
      .select('report_messages.*', 'users.name as author_name', 'users.role as author_role');
    const mySides = sidesOfUser(access, user.id);
    const visible = (authorId: string | null) =>
      isStaff(user) || (authorId !== null && sidesOfUser(access, authorId).some((s) => mySides.includes(s)));
    const asked = rows.filter((r) => !r.question_id && visible(r.author_id as string | null));
    const author = (r: Record<string, unknown>) => ({
      name: (r.author_name as string | null) ?? 'A former user',
      role: (r.author_role as string | null) ?? null,
      partyRole: r.author_id ? (access.parties.find((p) => p.userId === r.author_id)?.partyRole ?? null) : null,
    });
    return asked.map((q) => ({
      id: q.id as string,
      body: q.body as string,
      at: q.created_at as string,
      author: author(q),
      answers: rows
        .filter((a) => a.question_id === q.id)
        .map((a) => ({ id: a.id as string, body: a.body as string, at: a.created_at as string, author: author(a) })),
    }));
  }

  async function ask(user: UserRecord, orderId: string, body: string) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'report.read', { order: access })) throw notFound('report');
    if (!can(actor, 'question.ask', { order: access })) throw forbidden('Questions come from the agents and clients on the order.');
    const id = newId();
    await db.transaction(async (trx) => {
      await trx('report_messages').insert({ id, order_id: orderId, question_id: null, author_id: user.id, body, created_at: nowIso() });
      const staff = await trx('users')
        .where({ company_id: order.company_id })
        .whereNull('disabled_at')
        .whereNotNull('password_hash')
        .where((q) => q.where('role', 'office').orWhere('id', order.assigned_inspector_id ?? ''));
      const address = await addressOf(trx, order);
      for (const person of staff) {
        await enqueueMail(trx, {
          companyId: order.company_id,
          ...mailBrandOf(company, publicUrl),
          to: person.email,
          template: 'report_question',
          vars: {
            name: person.name,
            askerName: user.name,
            address,
            question: body,
            url: `${publicUrl}/${person.role === 'office' ? 'office' : 'field'}/reports/${orderId}#questions`,
          },
        });
      }
    });
    deps.mailQueued();
    return { id };
  }

  async function answer(user: UserRecord, orderId: string, questionId: string, body: string) {
    const { order, access, actor } = await orderFor(user, orderId);
    const company = await companyOf(order);
    if (!can(actor, 'order.view', { order: access })) throw notFound('report');
    if (!can(actor, 'question.answer', { order: access })) throw forbidden('Answers come from the office or the inspector.');
    const question = await db('report_messages').where({ id: questionId, order_id: orderId }).whereNull('question_id').first();
    if (!question) throw notFound('question');
    const id = newId();
    await db.transaction(async (trx) => {
      await trx('report_messages').insert({
        id,
        order_id: orderId,
        question_id: questionId,
        author_id: user.id,
        body,
        created_at: nowIso(),
      });
      const asker = question.author_id ? await trx('users').where({ id: question.author_id }).first() : undefined;
      const parties = await listParties(trx, orderId);
      const released = JSON.parse(order.released_to || '[]') as Side[];
      const askerSides = asker ? sidesOfUser(access, asker.id) : [];
      const address = await addressOf(trx, order);
      // The asker, and the agents on the asker's side who can read the report: never the other side.
      const recipients = new Map<string, string>();
      if (asker) recipients.set(asker.email, asker.name);
      for (const p of parties) {
        const side = sideOf(p.partyRole);
        if (p.partyRole.endsWith('agent') && askerSides.includes(side) && released.includes(side)) recipients.set(p.email, p.name);
      }
      for (const [email, name] of recipients) {
        await enqueueMail(trx, {
          companyId: order.company_id,
          ...mailBrandOf(company, publicUrl),
          to: email,
          template: 'report_answer',
          vars: {
            name,
            answererName: user.name,
            address,
            question: question.body,
            answer: body,
            url: `${publicUrl}/portal/reports/${orderId}#questions`,
          },
        });
      }
    });
    deps.mailQueued();
    return { id };
  }

  return {
    publish,
    reopen,
    releaseHeld,
    review,
    setGradeOverride,
    read,
    setDisclosure,
    createShareLink,
    listShareLinks,
    revokeShareLink,
    readShared,
    sharedMediaFile,
    pdf,
    sharedPdf,
    views,
    questions,
    ask,
    answer,
  };
}

export type ReportsService = ReturnType<typeof createReportsService>;
