import { parseConfig, restoreDataDir } from '@underfoot/server';

/** `npm run restore -- <backup folder>`: stop the server first; the current data folder is kept aside. */
const from = process.argv[2];
if (!from) {
  console.error('Usage: npm run restore -- <backup folder>   (stop the server first)');
  process.exit(2);
}
const config = parseConfig();
try {
  const { keptPrevious, manifest } = await restoreDataDir(from, config.dataDir);
  console.log(`Restored the backup of ${manifest.createdAt} into ${config.dataDir}.`);
  if (keptPrevious) console.log(`The data that was there is kept at ${keptPrevious}; delete it once you are sure.`);
} catch (err) {
  console.error(`Restore failed: ${(err as Error).message}`);
  process.exit(1);
}
