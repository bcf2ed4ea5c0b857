/**
 * `npm run bench`: every benchmark, each printing its figures as ratios to a
 * baseline measured in the same run (absolute times on shared machines mean little).
 */
import { benchCore } from './core.bench.ts';
import { benchMedia } from './media.bench.ts';
import { benchLoad } from './load.bench.ts';
import { benchReport } from './report.bench.ts';
import { benchScale } from './scale.bench.ts';

const benches: [string, () => Promise<void>][] = [
  ['core analysis', benchCore],
  ['media: stills, markup, video upload', benchMedia],
  ['published report: page, API, PDF', benchReport],
  ['load: 200 portal readers for 60 s', benchLoad],
  ['scale: 100 000 orders, 1 000 000 observations', benchScale],
];

for (const [name, run] of benches) {
  console.log(`\n== ${name}`);
  await run();
}
