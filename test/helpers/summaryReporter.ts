/**
 * Prints one plain closing line, `Tests: N passed, N failed[, N skipped]`, after vitest's own output,
 * so CI logs carry a summary any tool can read. vitest itself sets the exit code.
 */
import type { Reporter, TestModule } from 'vitest/node';

export default class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const mod of testModules) {
      for (const test of mod.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
      if (mod.state() === 'failed' && mod.children.size === 0) failed++;
    }
    const tail = skipped > 0 ? `, ${skipped} skipped` : '';
    process.stdout.write(`\nTests: ${passed} passed, ${failed} failed${tail}\n`);
  }
}
