// Prints one closing line "tests: N passed, N failed, N skipped" so any CI log reader can count.
import type { Reporter, TestModule } from 'vitest/node';

export default class CountReporter implements Reporter {
  onTestRunEnd(modules: ReadonlyArray<TestModule>): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const module of modules) {
      for (const test of module.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
      if (module.state() === 'failed' && module.children.size === 0) failed++;
    }
    process.stdout.write(`\ntests: ${passed} passed, ${failed} failed, ${skipped} skipped\n`);
  }
}
