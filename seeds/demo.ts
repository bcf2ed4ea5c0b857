import type { Knex } from 'knex';
import type { Role } from '@underfoot/core';
import { hashPassword } from '@underfoot/server';
import { seedDemoInspections } from './inspections.ts';
import { seedDemoOrders } from './orders.ts';
import { seedDemoReports } from './reports.ts';

/**
 * The invented demo scenario: a sewer-camera company in the made-up town of
 * Alder Falls, its people, and the agents and clients it works with. Every
 * name and address here is invented; e-mail uses the reserved example.com domain.
 */
export const DEMO_PASSWORD = 'underfoot-demo';

export const demoCompany = {
  id: '8d6f1c2e-4b1a-4f0e-9a51-3c7d2e9b0a01',
  name: 'Bramblewood Drain & Camera',
  licenceNumber: 'AF-PLB-20417',
  phone: '(555) 014-2290',
  email: 'office@bramblewood.example.com',
  serviceArea: 'Alder Falls, the river towns and the hill roads up to Cedar Gap.',
  reportFooter: 'Bramblewood Drain & Camera, licensed drain contractor in Alder Falls. Questions about this report: (555) 014-2290.',
};

export interface DemoAccount {
  id: string;
  role: Role;
  name: string;
  email: string;
  /** What this person does in the demo, printed at start-up. */
  part: string;
}

export const demoAccounts: DemoAccount[] = [
  {
    id: 'c1a0f9d2-0001-4c3e-8a10-5f2b7d9e0001',
    role: 'office',
    name: 'Dana Whitlock',
    email: 'dana@bramblewood.example.com',
    part: 'office: schedules, reviews, publishes',
  },
  {
    id: 'c1a0f9d2-0002-4c3e-8a10-5f2b7d9e0002',
    role: 'inspector',
    name: 'Marco Ruiz',
    email: 'marco@bramblewood.example.com',
    part: 'inspector in the field',
  },
  {
    id: 'c1a0f9d2-0003-4c3e-8a10-5f2b7d9e0003',
    role: 'inspector',
    name: 'Priya Nandakumar',
    email: 'priya@bramblewood.example.com',
    part: 'inspector in the field',
  },
  {
    id: 'c1a0f9d2-0004-4c3e-8a10-5f2b7d9e0004',
    role: 'agent',
    name: 'Theo Lindqvist',
    email: 'theo@hearthline-realty.example.com',
    part: "buyer's agent",
  },
  {
    id: 'c1a0f9d2-0005-4c3e-8a10-5f2b7d9e0005',
    role: 'agent',
    name: 'June Okafor',
    email: 'june@hearthline-realty.example.com',
    part: 'listing agent',
  },
  {
    id: 'c1a0f9d2-0006-4c3e-8a10-5f2b7d9e0006',
    role: 'agent',
    name: 'Sam Carrow',
    email: 'sam@millrace-homes.example.com',
    part: "buyer's and listing agent",
  },
  {
    id: 'c1a0f9d2-0007-4c3e-8a10-5f2b7d9e0007',
    role: 'client',
    name: 'Riley Hartmann',
    email: 'riley.hartmann@example.com',
    part: 'buyer',
  },
  { id: 'c1a0f9d2-0008-4c3e-8a10-5f2b7d9e0008', role: 'client', name: 'Noor Haddad', email: 'noor.haddad@example.com', part: 'buyer' },
  { id: 'c1a0f9d2-0009-4c3e-8a10-5f2b7d9e0009', role: 'client', name: 'Walt Emerson', email: 'walt.emerson@example.com', part: 'seller' },
  {
    id: 'c1a0f9d2-0010-4c3e-8a10-5f2b7d9e0010',
    role: 'client',
    name: 'Bea Castellanos',
    email: 'bea.castellanos@example.com',
    part: 'seller',
  },
];

/** Seed the demo once; running it again on a seeded database changes nothing. */
export async function seedDemo(
  db: Knex,
  options: { passwordHashCost: number; mediaDir: string },
): Promise<{ seeded: boolean; disclosureLinkPath: string | null }> {
  const existing = await db('companies').where({ id: demoCompany.id }).first();
  if (existing) return { seeded: false, disclosureLinkPath: null };
  const passwordHash = await hashPassword(DEMO_PASSWORD, options.passwordHashCost);
  const now = new Date().toISOString();
  await db.transaction(async (trx) => {
    await trx('companies').insert({
      id: demoCompany.id,
      name: demoCompany.name,
      licence_number: demoCompany.licenceNumber,
      phone: demoCompany.phone,
      email: demoCompany.email,
      service_area: demoCompany.serviceArea,
      report_footer: demoCompany.reportFooter,
      created_at: now,
      updated_at: now,
    });
    await trx('users').insert(
      demoAccounts.map((a) => ({
        id: a.id,
        company_id: demoCompany.id,
        email: a.email,
        name: a.name,
        role: a.role,
        password_hash: passwordHash,
        email_verified_at: now,
        created_at: now,
        updated_at: now,
      })),
    );
  });
  await seedDemoOrders(db);
  await seedDemoInspections(db, { mediaDir: options.mediaDir });
  const { disclosureLinkPath } = await seedDemoReports(db, { mediaDir: options.mediaDir });
  return { seeded: true, disclosureLinkPath };
}
