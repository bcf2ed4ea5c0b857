import type { Reporter, TestModule } from 'vitest/node';

/**
 * Prints, after vitest's own summary, how many tests each suite ran (so a run
 * where the browser tests silently did nothing shows it) and one plain line
 * "N passed, N failed" that CI tools read.
 */
export default class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    const perProject = new Map<string, { passed: number; failed: number; skipped: number }>();
    for (const module of testModules) {
      const name = module.project.name || 'default';
      const counts = perProject.get(name) ?? { passed: 0, failed: 0, skipped: 0 };
      for (const test of module.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') counts.passed++;
        else if (state === 'failed') counts.failed++;
        else counts.skipped++;
      }
      perProject.set(name, counts);
    }
    const total = { passed: 0, failed: 0, skipped: 0 };
    console.log('\nTests by suite:');
    for (const [name, c] of [...perProject].sort()) {
      console.log(
        `  ${name.padEnd(6)} ${c.passed} passed, ${c.failed} failed${c.skipped ? `, ${c.skipped} skipped` : ''}${name === 'e2e' ? ' (real Chromium)' : ''}`,
      );
      total.passed += c.passed;
      total.failed += c.failed;
      total.skipped += c.skipped;
    }
    console.log(`${total.passed} passed, ${total.failed} failed${total.skipped ? `, ${total.skipped} skipped` : ''}`);
  }
}
