/**
 * `npm run bench`: every benchmark, each printing its figures as ratios to a
 * baseline measured in the same run (absolute times on shared machines mean little).
 */
import { benchCore } from './core.bench.ts';
import { benchMedia } from './media.bench.ts';
import { benchReport } from './report.bench.ts';

const benches: [string, () => Promise<void>][] = [
  ['core analysis', benchCore],
  ['media: stills, markup, video upload', benchMedia],
  ['published report: page, API, PDF', benchReport],
];

for (const [name, run] of benches) {
  console.log(`\n== ${name}`);
  await run();
}
