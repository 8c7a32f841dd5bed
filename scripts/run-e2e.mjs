// `npm run test:e2e` (after `vite build`): runs every test/e2e/*.e2e.mjs in its own Node
// process, one after another, and ends with one line "N passed, N failed". Each script
// passes by exiting 0. Exits non-zero if any failed, or if there are none to run.
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { listTests } from './list-tests.mjs';

const files = listTests('test/e2e', '.e2e.mjs');
if (files.length === 0) {
  console.error('No end-to-end scripts found (test/e2e/*.e2e.mjs).');
  console.log('0 passed, 1 failed');
  process.exit(1);
}
let passed = 0;
let failed = 0;
for (const file of files) {
  console.log(`\n▶ ${file}`);
  const result = spawnSync(process.execPath, [file], { stdio: 'inherit' });
  if (result.status === 0) passed++;
  else {
    failed++;
    const why = result.error ? `could not start: ${result.error.message}` : result.signal ? `killed by ${result.signal}` : `exit code ${result.status}`;
    console.error(`✗ ${file}: ${why}`);
  }
}
console.log(`\n${passed} passed, ${failed} failed`);
if (process.env.RATEBOOK_E2E_RESULTS) writeFileSync(process.env.RATEBOOK_E2E_RESULTS, JSON.stringify({ passed, failed }));
process.exit(failed ? 1 : 0);
