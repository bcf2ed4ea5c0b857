export { createApp, webDistDir } from './app.ts';
export { parseConfig, ConfigError, type Config } from './config.ts';
export { createServices, type Services, type ServiceOptions } from './services.ts';
export { createDb, knexConfig, migrateLatest } from './db.ts';
export { hashPassword } from './modules/auth/passwords.ts';
export { backupDataDir, restoreDataDir, type BackupManifest } from './ops/backup.ts';
