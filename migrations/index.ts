import type { Knex } from 'knex';
import * as m202612010001 from './202612010001_accounts.ts';
import * as m202612010002 from './202612010002_orders.ts';
import * as m202612010003 from './202612010003_company_admin.ts';
import * as m202612010004 from './202612010004_inspections.ts';
import * as m202612010005 from './202612010005_reports.ts';
import * as m202612020010 from './202612020010_indexes.ts';
import * as m202612020020 from './202612020020_party_order_keys.ts';

interface MigrationModule {
  up(knex: Knex): Promise<void>;
  down(knex: Knex): Promise<void>;
}

/**
 * Every migration, in order. Knex cannot load .ts files from a folder under
 * vitest or plain node, so the list is explicit and shared by the server, the
 * CLI scripts and the tests.
 */
const migrations: [string, MigrationModule][] = [
  ['202612010001_accounts', m202612010001],
  ['202612010002_orders', m202612010002],
  ['202612010003_company_admin', m202612010003],
  ['202612010004_inspections', m202612010004],
  ['202612010005_reports', m202612010005],
  ['202612020010_indexes', m202612020010],
  ['202612020020_party_order_keys', m202612020020],
];

export const migrationSource: Knex.MigrationSource<[string, MigrationModule]> = {
  getMigrations: async () => migrations,
  getMigrationName: ([name]) => name,
  getMigration: async ([, migration]) => migration,
};
