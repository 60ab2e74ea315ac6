// Prints the plain closing line "N passed, N failed, N skipped" after vitest's own summary, so that
// any CI log reader can count the tests without knowing vitest's format.
import type { Reporter, TestModule } from "vitest/node";

export default class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    let passed = 0, failed = 0, skipped = 0;
    for (const m of testModules) {
      for (const t of m.children.allTests()) {
        const s = t.result().state;
        if (s === "passed") passed++;
        else if (s === "failed") failed++;
        else skipped++;
      }
    }
    process.stdout.write(`\n${passed} passed, ${failed} failed, ${skipped} skipped\n`);
  }
}
