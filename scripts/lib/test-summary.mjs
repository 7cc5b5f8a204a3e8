// Prints Vitest's JSON report as one closing line, `tests: N passed, N failed, N skipped`,
// and exits non-zero when no test ran or any failed.
import { readFileSync } from 'node:fs';

const file = process.argv[2];
let report;
try {
  report = JSON.parse(readFileSync(file, 'utf8'));
} catch {
  console.log('tests: 0 passed, 1 failed (no Vitest report was written)');
  process.exit(1);
}
const passed = report.numPassedTests ?? 0;
const failed = report.numFailedTests ?? 0;
const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
const brokenSuites = (report.testResults ?? []).filter((suite) => suite.status === 'failed' && (suite.assertionResults ?? []).length === 0).length;
console.log(`tests: ${passed} passed, ${failed + brokenSuites} failed, ${skipped} skipped`);
process.exit(failed + brokenSuites > 0 || passed === 0 ? 1 : 0);
