import type { Knex } from 'knex';
import { pino, type Logger } from 'pino';
import type { ConnectSessionKnexStore } from 'connect-session-knex';
import type Stripe from 'stripe';
import type { Config } from './config.ts';
import { createDb, keepPlannerStatistics, migrateLatest } from './db.ts';
import { createSessionStore } from './http/session.ts';
import { createMailTransport, OutboxWorker } from './modules/mail/outbox.worker.ts';
import { createPaymentClient } from './modules/payments/payment-provider.ts';
import type { MediaStorage } from './storage/media-storage.ts';
import { createLocalDiskStorage, processIncomingDir, releaseIncoming, sweepIncoming } from './storage/local-disk-storage.ts';
import { createS3Storage } from './storage/s3-storage.ts';
import { sweepOrphanMedia } from './modules/media/media-sweep.ts';

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
  const stopPlannerStatistics = await keepPlannerStatistics(db, (err) =>
    logger.warn({ err }, 'could not refresh the query planner statistics'),
  );

  const usingFake = !config.mail.smtpUrl;
  const fake = options.fakeMail ?? { host: '127.0.0.1', smtpPort: config.mail.fakeSmtpPort, httpPort: config.mail.fakeSmtpHttpPort };
  const transport = createMailTransport({ smtpUrl: config.mail.smtpUrl, fakeSmtpHost: fake.host, fakeSmtpPort: fake.smtpPort });
  const mail = new OutboxWorker(db, transport, config.mail.from, logger, config.mail.pollMs, config.mail.retryBaseMs);
  if (options.startMailWorker !== false) mail.start();

  const sessionStore = createSessionStore(db, config);
  await sessionStore.ready;

  const storage = config.media.s3
    ? createS3Storage({ ...config.media.s3, incomingDir: processIncomingDir(config.media.dir) })
    : createLocalDiskStorage(config.media.dir);
  // Uploads cut off by a crash or restart leave temporary files: gone before the first request.
  try {
    const swept = await sweepIncoming(storage);
    if (swept > 0) logger.info({ swept }, 'removed unfinished uploads left by a stopped server');
  } catch (err) {
    logger.warn({ err }, 'could not sweep unfinished uploads');
  }
  // Stored files no row names (a crash between the file and its row) go in the background; the tree may be large.
  const mediaSweep = sweepOrphanMedia(db, storage).then(
    (removed) => logger.info({ removed: removed.length }, 'media sweep done: removed stored files no row names'),
    (err: unknown) => logger.warn({ err }, 'could not sweep stored files no row names'),
  );

  return {
    db,
    logger,
    mail,
    sessionStore,
    paymentProvider: createPaymentClient(config, options.fakePayments),
    fakeMailApiUrl: usingFake && config.env !== 'production' ? `http://${fake.host}:${fake.httpPort}` : undefined,
    storage,
    async close() {
      await mediaSweep;
      await releaseIncoming(storage);
      await mail.stop();
      stopPlannerStatistics();
      await db.destroy();
    },
  };
}
