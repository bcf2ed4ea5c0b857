import type { Knex } from 'knex';
import { pino, type Logger } from 'pino';
import type { ConnectSessionKnexStore } from 'connect-session-knex';
import type Stripe from 'stripe';
import type { Config } from './config.ts';
import { createDb, migrateLatest } from './db.ts';
import { createSessionStore } from './http/session.ts';
import { createMailTransport, OutboxWorker } from './modules/mail/outbox.worker.ts';
import { createPaymentClient } from './modules/payments/payment-provider.ts';
import type { MediaStorage } from './storage/media-storage.ts';
import { createLocalDiskStorage, sweepIncoming } from './storage/local-disk-storage.ts';

/** The long-lived parts the app runs on; built once per process (or per test). */
export interface Services {
  db: Knex;
  logger: Logger;
  mail: OutboxWorker;
  sessionStore: ConnectSessionKnexStore;
  /** The payment provider's SDK client (pointed at the local fake when no key is set). */
  paymentProvider: Stripe;
  /** The fake mail server's HTTP API, when the demo mailbox is on. */
  fakeMailApiUrl: string | undefined;
  /** Uploaded video and stills (local disk under DATA_DIR/media). */
  storage: MediaStorage;
  close(): Promise<void>;
}

export interface ServiceOptions {
  /** Overrides for tests: a database file of their own, the fake's actual ports. */
  databaseFile?: string;
  fakeMail?: { host: string; smtpPort: number; httpPort: number };
  fakePayments?: { host: string; port: number };
  startMailWorker?: boolean;
}

export async function createServices(config: Config, options: ServiceOptions = {}): Promise<Services> {
  const logger = pino({
    level: config.logLevel,
    redact: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'],
  });
  const db = createDb({
    dataDir: config.dataDir,
    databaseUrl: config.databaseUrl,
    ...(options.databaseFile ? { filename: options.databaseFile } : {}),
  });
  await migrateLatest(db);

  const usingFake = !config.mail.smtpUrl;
  const fake = options.fakeMail ?? { host: '127.0.0.1', smtpPort: config.mail.fakeSmtpPort, httpPort: config.mail.fakeSmtpHttpPort };
  const transport = createMailTransport({ smtpUrl: config.mail.smtpUrl, fakeSmtpHost: fake.host, fakeSmtpPort: fake.smtpPort });
  const mail = new OutboxWorker(db, transport, config.mail.from, logger, config.mail.pollMs);
  if (options.startMailWorker !== false) mail.start();

  const sessionStore = createSessionStore(db, config);
  await sessionStore.ready;

  const storage = createLocalDiskStorage(config.media.dir);
  // Uploads cut off by a crash or restart leave temporary files; clear the old ones.
  void sweepIncoming(storage).catch((err: unknown) => logger.warn({ err }, 'could not sweep unfinished uploads'));

  return {
    db,
    logger,
    mail,
    sessionStore,
    paymentProvider: createPaymentClient(config, options.fakePayments),
    fakeMailApiUrl: usingFake && config.env !== 'production' ? `http://${fake.host}:${fake.httpPort}` : undefined,
    storage,
    async close() {
      await mail.stop();
      await db.destroy();
    },
  };
}
