import { createDb, parseConfig } from '@underfoot/server';
import { seedDemo } from '../seeds/demo.ts';

/** `npm run db:migrate` / `npm run db:seed` / `tsx scripts/db.ts rollback`. */
const command = process.argv[2];
const config = parseConfig();
const db = createDb({ dataDir: config.dataDir, databaseUrl: config.databaseUrl });
try {
  if (command === 'migrate') {
    const [, applied] = await db.migrate.latest();
    console.log(applied.length ? `Applied: ${applied.join(', ')}` : 'Already up to date.');
  } else if (command === 'rollback') {
    const [, undone] = await db.migrate.rollback(undefined, true);
    console.log(undone.length ? `Rolled back: ${undone.join(', ')}` : 'Nothing to roll back.');
  } else if (command === 'seed') {
    await db.migrate.latest();
    const { seeded } = await seedDemo(db, { passwordHashCost: config.passwordHashCost, mediaDir: config.media.dir });
    console.log(seeded ? 'Demo data added.' : 'Demo data was already there.');
  } else {
    console.error('Usage: tsx scripts/db.ts migrate|rollback|seed');
    process.exitCode = 2;
  }
} finally {
  await db.destroy();
}
