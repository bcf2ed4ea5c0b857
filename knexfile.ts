// The Knex CLI's entry point; the server builds the same configuration from its parsed settings.
import { knexConfig, parseConfig } from '@underfoot/server';

const config = parseConfig();
export default knexConfig({ dataDir: config.dataDir, databaseUrl: config.databaseUrl });
