// A @web/test-runner reporter that counts test results over all sessions,
// prints one summary line when the run stops, and (when the environment
// variable RATEBOOK_WTR_RESULTS names a file) writes the counts there as JSON.
import { writeFileSync } from 'node:fs';
import { relative } from 'node:path';

function countSuite(suite, counts) {
  if (!suite) return;
  for (const test of suite.tests ?? []) {
    if (test.skipped) counts.skipped += 1;
    else if (test.passed) counts.passed += 1;
    else counts.failed += 1;
  }
  for (const child of suite.suites ?? []) countSuite(child, counts);
}

/** Counts per session; a session that failed without a failing test (say, a
 * test file that did not load) counts as one failure. */
export function countSessions(sessions) {
  const counts = { passed: 0, failed: 0, skipped: 0, brokenFiles: [] };
  for (const session of sessions) {
    const own = { passed: 0, failed: 0, skipped: 0 };
    countSuite(session.testResults, own);
    if (session.passed === false && own.failed === 0) {
      own.failed = 1;
      counts.brokenFiles.push(relative(process.cwd(), session.testFile));
    }
    counts.passed += own.passed;
    counts.failed += own.failed;
    counts.skipped += own.skipped;
  }
  return counts;
}

export function countReporter({ resultsFile = process.env.RATEBOOK_WTR_RESULTS } = {}) {
  return {
    stop({ sessions }) {
      const counts = countSessions(sessions);
      const skipped = counts.skipped ? `, ${counts.skipped} skipped` : '';
      const broken = counts.brokenFiles.length
        ? ` (${counts.brokenFiles.length} file(s) did not run: ${counts.brokenFiles.join(', ')})`
        : '';
      const verdict = counts.failed === 0 && counts.passed > 0 ? 'PASS' : 'FAIL';
      console.log(
        `\nBrowser tests ${verdict}: ${counts.passed} passed, ${counts.failed} failed${skipped}${broken}`,
      );
      if (resultsFile) {
        writeFileSync(resultsFile, JSON.stringify(counts) + '\n');
      }
    },
  };
}
