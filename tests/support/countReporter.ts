// Vitest reporter that counts passed and failed tests. A test file that fails to import
// counts as one failure (vitest's JSON reporter would drop it). With WAYMARK_COUNT_FILE set
// it writes the counts there as JSON for scripts/test.ts to add up; otherwise it prints them.
import { writeFileSync } from 'node:fs'
import type { Reporter, TestModule } from 'vitest/node'

export interface TestCounts {
  passed: number
  failed: number
  skipped: number
}

export default class CountReporter implements Reporter {
  onTestRunEnd(modules: ReadonlyArray<TestModule>, errors: ReadonlyArray<unknown>): void {
    const counts: TestCounts = { passed: 0, failed: errors.length, skipped: 0 }
    for (const m of modules) {
      const tests = [...m.children.allTests()]
      for (const t of tests) {
        const state = t.result().state
        if (state === 'passed') counts.passed++
        else if (state === 'failed') counts.failed++
        else if (state === 'skipped') counts.skipped++
      }
      if (m.state() === 'failed' && tests.length === 0) counts.failed++
    }
    const file = process.env.WAYMARK_COUNT_FILE
    if (file) writeFileSync(file, JSON.stringify(counts))
    else console.log(`tests: ${counts.passed} passed, ${counts.failed} failed`)
  }
}
