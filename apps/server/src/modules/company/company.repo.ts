import type { Knex } from 'knex';
import type { AgentSignupMode, CompanyProfile, CompanySettings, CompanySettingsPatch } from '@underfoot/core';
import { nowIso } from '../../lib/clock.ts';

interface CompanyRow {
  id: string;
  name: string;
  licence_number: string | null;
  phone: string | null;
  email: string | null;
  time_zone: string;
  require_payment_before_release: number | boolean;
  inspectors_may_publish: number | boolean;
  share_link_days: number;
  guest_costs_default: number | boolean;
  agent_signup: AgentSignupMode;
  service_area: string | null;
  report_footer: string | null;
  logo_id: string | null;
  updated_at: string;
}

export interface CompanyRecord {
  id: string;
  profile: CompanyProfile;
  settings: CompanySettings;
  logoId: string | null;
  updatedAt: string;
}

const toCompany = (row: CompanyRow): CompanyRecord => ({
  id: row.id,
  profile: {
    name: row.name,
    licenceNumber: row.licence_number ?? '',
    phone: row.phone ?? '',
    email: row.email ?? '',
    serviceArea: row.service_area ?? '',
    reportFooter: row.report_footer ?? '',
    timeZone: row.time_zone,
  },
  settings: {
    // SQLite hands booleans back as 0/1.
    requirePaymentBeforeRelease: Boolean(row.require_payment_before_release),
    inspectorsMayPublish: Boolean(row.inspectors_may_publish),
    shareLinkDays: row.share_link_days,
    guestCostsDefault: Boolean(row.guest_costs_default),
    agentSignup: row.agent_signup,
  },
  logoId: row.logo_id,
  updatedAt: row.updated_at,
});

export async function findCompany(db: Knex, id: string): Promise<CompanyRecord | undefined> {
  const row = await db<CompanyRow>('companies').where({ id }).first();
  return row ? toCompany(row) : undefined;
}

const emptyToNull = (value: string) => (value === '' ? null : value);

export async function updateCompanyProfile(db: Knex, id: string, profile: CompanyProfile): Promise<void> {
  await db('companies')
    .where({ id })
    .update({
      name: profile.name,
      licence_number: emptyToNull(profile.licenceNumber),
      phone: emptyToNull(profile.phone),
      email: emptyToNull(profile.email),
      service_area: emptyToNull(profile.serviceArea),
      report_footer: emptyToNull(profile.reportFooter),
      time_zone: profile.timeZone,
      updated_at: nowIso(),
    });
}

const settingColumns = {
  requirePaymentBeforeRelease: 'require_payment_before_release',
  inspectorsMayPublish: 'inspectors_may_publish',
  shareLinkDays: 'share_link_days',
  guestCostsDefault: 'guest_costs_default',
  agentSignup: 'agent_signup',
} as const satisfies Record<keyof CompanySettings, string>;

export async function updateCompanySettings(db: Knex, id: string, patch: CompanySettingsPatch): Promise<void> {
  const changes: Record<string, unknown> = { updated_at: nowIso() };
  for (const [key, column] of Object.entries(settingColumns)) {
    const value = patch[key as keyof CompanySettings];
    if (value !== undefined) changes[column] = value;
  }
  await db('companies').where({ id }).update(changes);
}

export async function setCompanyLogoId(db: Knex, id: string, logoId: string | null): Promise<void> {
  await db('companies').where({ id }).update({ logo_id: logoId, updated_at: nowIso() });
}

export interface LogoRecord {
  id: string;
  companyId: string;
  storageKey: string;
  contentType: string;
  width: number;
  height: number;
  sizeBytes: number;
}

export async function insertLogo(db: Knex, logo: LogoRecord & { createdBy: string }): Promise<void> {
  await db('company_logos').insert({
    id: logo.id,
    company_id: logo.companyId,
    storage_key: logo.storageKey,
    content_type: logo.contentType,
    width: logo.width,
    height: logo.height,
    size_bytes: logo.sizeBytes,
    created_by: logo.createdBy,
    created_at: nowIso(),
  });
}

export async function findLogo(db: Knex, id: string): Promise<LogoRecord | undefined> {
  const row = await db('company_logos').where({ id }).first();
  return row
    ? {
        id: row.id,
        companyId: row.company_id,
        storageKey: row.storage_key,
        contentType: row.content_type,
        width: row.width,
        height: row.height,
        sizeBytes: row.size_bytes,
      }
    : undefined;
}

export async function deleteLogoRow(db: Knex, id: string): Promise<void> {
  await db('company_logos').where({ id }).delete();
}
