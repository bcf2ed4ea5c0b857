import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import {
  priceItemKeys,
  type AuditQuery,
  type CompanyProfile,
  type CompanySettingsPatch,
  type FeeItem,
  type PriceBook,
} from '@underfoot/core';
import { badRequest, conflict, notFound } from '../../http/errors.ts';
import { newId } from '../../lib/ids.ts';
import type { MediaStorage } from '../../storage/media-storage.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { auditFilterOptions, listAuditEntries, type AuditFilter } from './audit-trail.repo.ts';
import { logoPath, mailBrandOf } from './brand.ts';
import {
  deleteLogoRow,
  findCompany,
  findLogo,
  insertLogo,
  setCompanyLogoId,
  updateCompanyProfile,
  updateCompanySettings,
  type CompanyRecord,
} from './company.repo.ts';
import { csvLine } from './csv.ts';
import { activeBaseFee, findFeeItem, insertFeeItem, listFeeItems, lockFeeList, setFeeOrder, updateFeeItem } from './fee-items.repo.ts';
import { processLogo } from './logo-image.ts';
import { loadPriceBook, savePriceBook } from './price-book.repo.ts';

export interface CompanyServiceDeps {
  db: Knex;
  storage: MediaStorage;
  publicUrl: string;
  log: { warn(obj: object, msg: string): void };
}

/** The most rows one CSV export carries; narrow the filters for more. */
export const CSV_EXPORT_LIMIT = 50_000;

export function createCompanyService(deps: CompanyServiceDeps) {
  const { db, storage, publicUrl } = deps;

  async function companyOf(actor: UserRecord): Promise<CompanyRecord> {
    const company = await findCompany(db, actor.companyId);
    if (!company) throw notFound('company');
    return company;
  }

  async function view(actor: UserRecord) {
    const company = await companyOf(actor);
    const logo = company.logoId ? await findLogo(db, company.logoId) : undefined;
    return {
      id: company.id,
      profile: company.profile,
      settings: company.settings,
      logo: logo ? { url: logoPath(logo.id), width: logo.width, height: logo.height } : null,
      // The page agents use to sign themselves up, shown to the office while the company allows it.
      agentSignUpUrl: company.settings.agentSignup === 'self_signup' ? `${publicUrl}/join/${company.id}` : null,
      updatedAt: company.updatedAt,
    };
  }

  /** What every signed-in person may know of their company: its name and logo, for headers, e-mails and reports. */
  async function brand(companyId: string) {
    const company = await findCompany(db, companyId);
    if (!company) throw notFound('company');
    return {
      name: company.profile.name,
      logoUrl: company.logoId ? logoPath(company.logoId) : null,
      reportFooter: company.profile.reportFooter,
    };
  }

  /** For e-mails: the logo as an absolute address, since mail is read away from the app. */
  async function mailBrand(companyId: string) {
    const company = await findCompany(db, companyId);
    if (!company) throw notFound('company');
    return mailBrandOf({ name: company.profile.name, logo_id: company.logoId }, publicUrl);
  }

  function changedKeys<T extends object>(before: T, after: T): string[] {
    return (Object.keys(after) as (keyof T)[]).filter((k) => after[k] !== undefined && before[k] !== after[k]).map(String);
  }

  async function updateProfile(actor: UserRecord, profile: CompanyProfile, ip: string | undefined) {
    const before = await companyOf(actor);
    await db.transaction(async (trx) => {
      await updateCompanyProfile(trx, actor.companyId, profile);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'company.profile_updated',
        subjectType: 'company',
        subjectId: actor.companyId,
        detail: { changed: changedKeys(before.profile, profile) },
        ip,
      });
    });
    return view(actor);
  }

  async function updateSettings(actor: UserRecord, patch: CompanySettingsPatch, ip: string | undefined) {
    const before = await companyOf(actor);
    await db.transaction(async (trx) => {
      await updateCompanySettings(trx, actor.companyId, patch);
      const changes = Object.fromEntries(
        changedKeys(before.settings, patch as typeof before.settings).map((key) => [
          key,
          { from: before.settings[key as keyof typeof before.settings], to: patch[key as keyof CompanySettingsPatch] },
        ]),
      );
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'company.settings_updated',
        subjectType: 'company',
        subjectId: actor.companyId,
        detail: changes,
        ip,
      });
    });
    return view(actor);
  }

  async function dropStoredLogo(storageKey: string) {
    try {
      await storage.delete(storageKey);
    } catch (err) {
      // The row is gone; a leftover file is harmless and only costs disk.
      deps.log.warn({ err, storageKey }, 'could not delete an old logo file');
    }
  }

  async function setLogo(actor: UserRecord, upload: Buffer, ip: string | undefined) {
    const logo = await processLogo(upload);
    const company = await companyOf(actor);
    const id = newId();
    const storageKey = `logos/${actor.companyId}/${id}.png`;
    await storage.putStream(storageKey, Readable.from(logo.png));
    const previous = company.logoId ? await findLogo(db, company.logoId) : undefined;
    try {
      await db.transaction(async (trx) => {
        await insertLogo(trx, {
          id,
          companyId: actor.companyId,
          storageKey,
          contentType: 'image/png',
          width: logo.width,
          height: logo.height,
          sizeBytes: logo.png.length,
          createdBy: actor.id,
        });
        await setCompanyLogoId(trx, actor.companyId, id);
        if (previous) await deleteLogoRow(trx, previous.id);
        await recordAudit(trx, {
          companyId: actor.companyId,
          actorUserId: actor.id,
          action: 'company.logo_changed',
          subjectType: 'company',
          subjectId: actor.companyId,
          detail: { width: logo.width, height: logo.height },
          ip,
        });
      });
    } catch (err) {
      // Nothing half-saved: without its row the new file must not stay behind.
      await dropStoredLogo(storageKey);
      throw err;
    }
    if (previous) await dropStoredLogo(previous.storageKey);
    return view(actor);
  }

  async function removeLogo(actor: UserRecord, ip: string | undefined) {
    const company = await companyOf(actor);
    const previous = company.logoId ? await findLogo(db, company.logoId) : undefined;
    if (!company.logoId) return view(actor);
    await db.transaction(async (trx) => {
      await setCompanyLogoId(trx, actor.companyId, null);
      if (previous) await deleteLogoRow(trx, previous.id);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'company.logo_removed',
        subjectType: 'company',
        subjectId: actor.companyId,
        ip,
      });
    });
    if (previous) await dropStoredLogo(previous.storageKey);
    return view(actor);
  }

  /** The logo file for the public route; any id that is not a current or stored logo is simply not found. */
  async function logoFile(id: string) {
    if (!/^[0-9a-f-]{36}$/.test(id)) throw notFound('logo');
    const logo = await findLogo(db, id);
    if (!logo) throw notFound('logo');
    try {
      return { stream: await storage.get(logo.storageKey), contentType: logo.contentType, size: logo.sizeBytes };
    } catch {
      throw notFound('logo');
    }
  }

  // ---------- fee list ----------

  /** Orders take the one active inspection fee; checked inside the saving transaction so two saves cannot both pass. */
  async function checkBaseFee(trx: Knex, companyId: string, item: Omit<FeeItem, 'id'>, exceptId?: string) {
    if (item.kind !== 'base' || !item.active) return;
    await lockFeeList(trx, companyId);
    const other = await activeBaseFee(trx, companyId, exceptId);
    if (other) {
      throw badRequest('Some fields need attention.', [
        {
          path: 'kind',
          message: `Orders carry one inspection fee, and “${other.name}” is it. Change its price, or retire it before making this one the inspection fee.`,
        },
      ]);
    }
  }

  async function createFee(actor: UserRecord, item: Omit<FeeItem, 'id'>, ip: string | undefined) {
    const id = await db.transaction(async (trx) => {
      await checkBaseFee(trx, actor.companyId, item);
      const created = await insertFeeItem(trx, actor.companyId, item);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'fee_item.created',
        subjectType: 'fee_item',
        subjectId: created,
        detail: { name: item.name, kind: item.kind, priceCents: item.priceCents },
        ip,
      });
      return created;
    });
    return (await findFeeItem(db, actor.companyId, id))!;
  }

  async function updateFee(actor: UserRecord, id: string, item: Omit<FeeItem, 'id'>, ip: string | undefined) {
    const before = await findFeeItem(db, actor.companyId, id);
    if (!before) throw notFound('fee');
    await db.transaction(async (trx) => {
      await checkBaseFee(trx, actor.companyId, item, id);
      await updateFeeItem(trx, actor.companyId, id, item);
      const changes: Record<string, { from: unknown; to: unknown }> = {};
      for (const key of ['kind', 'name', 'description', 'priceCents', 'active'] as const) {
        if (before[key] !== item[key]) changes[key] = { from: before[key], to: item[key] };
      }
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'fee_item.updated',
        subjectType: 'fee_item',
        subjectId: id,
        detail: { name: item.name, ...changes },
        ip,
      });
    });
    return (await findFeeItem(db, actor.companyId, id))!;
  }

  async function reorderFees(actor: UserRecord, ids: string[], ip: string | undefined) {
    const current = await listFeeItems(db, actor.companyId);
    const known = new Set(current.map((f) => f.id));
    if (ids.length !== known.size || new Set(ids).size !== ids.length || ids.some((id) => !known.has(id))) {
      throw conflict('The fee list changed while you were sorting it. Reload the page and try again.', 'fee_list_changed');
    }
    await db.transaction(async (trx) => {
      await setFeeOrder(trx, actor.companyId, ids);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'fee_list.reordered',
        subjectType: 'company',
        subjectId: actor.companyId,
        ip,
      });
    });
    return listFeeItems(db, actor.companyId);
  }

  // ---------- price book ----------

  async function savePrices(actor: UserRecord, book: PriceBook, ip: string | undefined) {
    const before = await loadPriceBook(db, actor.companyId);
    // Named as the office reads them, so the trail and its CSV need no code book.
    const changed: string[] = [];
    if (before.priceBook.regionalFactor !== book.regionalFactor) changed.push('Regional factor');
    if (JSON.stringify(before.priceBook.depth) !== JSON.stringify(book.depth)) changed.push('Dig depth rule');
    for (const key of priceItemKeys) {
      if (JSON.stringify(before.priceBook.items[key]) !== JSON.stringify(book.items[key])) changed.push(book.items[key].label);
    }
    await db.transaction(async (trx) => {
      await savePriceBook(trx, actor.companyId, book, actor.id);
      await recordAudit(trx, {
        companyId: actor.companyId,
        actorUserId: actor.id,
        action: 'price_book.updated',
        subjectType: 'company',
        subjectId: actor.companyId,
        detail: { changed },
        ip,
      });
    });
    return loadPriceBook(db, actor.companyId);
  }

  // ---------- audit trail ----------

  async function auditPage(actor: UserRecord, query: AuditQuery) {
    const { page, pageSize, ...filter } = query;
    const result = await listAuditEntries(db, actor.companyId, filter, { limit: pageSize, offset: page * pageSize });
    return { ...result, page, pageSize };
  }

  async function auditFilters(actor: UserRecord) {
    return auditFilterOptions(db, actor.companyId);
  }

  /** The whole filtered trail as CSV, newest first; the export itself is recorded. */
  async function auditCsv(actor: UserRecord, filter: AuditFilter, ip: string | undefined) {
    const { entries, total } = await listAuditEntries(db, actor.companyId, filter, { limit: CSV_EXPORT_LIMIT, offset: 0 });
    const lines = [
      csvLine(['Time (UTC)', 'Person', 'E-mail', 'Action', 'Action code', 'Subject', 'Subject type', 'Details', 'IP address']),
      ...entries.map((e) =>
        csvLine([
          e.at,
          e.actor?.name ?? 'Underfoot',
          e.actor?.email ?? '',
          e.actionLabel,
          e.action,
          e.subject?.label ?? '',
          e.subject?.type ?? '',
          e.detailText,
          e.ip ?? '',
        ]),
      ),
    ];
    await recordAudit(db, {
      companyId: actor.companyId,
      actorUserId: actor.id,
      action: 'audit.exported',
      subjectType: 'company',
      subjectId: actor.companyId,
      detail: { rows: entries.length, ...(total > entries.length ? { truncatedFrom: total } : {}) },
      ip,
    });
    // A byte-order mark so spreadsheet programs read the UTF-8 names correctly.
    return { csv: `\uFEFF${lines.join('')}`, rows: entries.length, truncated: total > entries.length };
  }

  return {
    view,
    brand,
    mailBrand,
    updateProfile,
    updateSettings,
    setLogo,
    removeLogo,
    logoFile,
    listFees: (actor: UserRecord) => listFeeItems(db, actor.companyId),
    createFee,
    updateFee,
    reorderFees,
    priceBook: (actor: UserRecord) => loadPriceBook(db, actor.companyId),
    savePrices,
    auditPage,
    auditFilters,
    auditCsv,
  };
}

export type CompanyService = ReturnType<typeof createCompanyService>;
