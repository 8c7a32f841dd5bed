// `npm test`: runs the engine tests (node), the browser tests (Chromium) and
// the end-to-end tests of the built app, and finishes with one plain line "N passed, N failed".
// Exits non-zero if any test failed or a suite crashed. If the results cannot
// be counted, the exit status still follows the suites' own exit codes.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { listTests } from './list-tests.mjs';

const workDir = mkdtempSync(join(tmpdir(), 'ratebook-test-'));
const tapFile = join(workDir, 'node.tap');
const browserFile = join(workDir, 'browser.json');

function npmRun(script, args = [], env = {}) {
  // Prefer the npm that launched us (npm_execpath); fall back to `npm` on PATH.
  const npmCli = process.env.npm_execpath;
  const [cmd, pre] = npmCli && /\.(c|m)?js$/.test(npmCli)
    ? [process.execPath, [npmCli]]
    : ['npm', []];
  const result = spawnSync(cmd, [...pre, 'run', '--silent', script, ...(args.length ? ['--', ...args] : [])], {
    stdio: 'inherit',
    env: { ...process.env, ...env },
  });
  if (result.error) {
    console.error(`Could not start npm run ${script}: ${result.error.message}`);
    return 1;
  }
  return result.status ?? 1; // killed by a signal counts as a failure
}

function readText(path) {
  try {
    return readFileSync(path, 'utf8');
  } catch {
    return null;
  }
}

/** The top-level "# pass N" / "# fail N" / "# cancelled N" lines of node's TAP output. */
function countTap(tap) {
  const last = (name) => {
    const all = [...tap.matchAll(new RegExp(`^# ${name} (\\d+)\\s*$`, 'gm'))];
    return all.length ? Number(all[all.length - 1][1]) : null;
  };
  const passed = last('pass');
  const failed = last('fail');
  if (passed === null || failed === null) return null;
  return { passed, failed: failed + (last('cancelled') ?? 0) };
}

const suites = [];

// 1. Engine tests under node.
{
  const suite = { name: 'Engine tests (node)', status: 0, counts: null, note: '' };
  if (listTests('test/engine').length === 0) {
    console.log('No engine tests found under test/engine: counting them as 0 passed.');
    suite.counts = { passed: 0, failed: 0 };
  } else {
    suite.status = npmRun('test:node', [
      '--test-reporter=spec',
      '--test-reporter-destination=stdout',
      '--test-reporter=tap',
      `--test-reporter-destination=${tapFile}`,
    ]);
    const tap = readText(tapFile);
    suite.counts = tap === null ? null : countTap(tap);
  }
  suites.push(suite);
}

// 2. Browser tests in Chromium.
{
  const suite = { name: 'Browser tests (Chromium)', status: 0, counts: null, note: '' };
  suite.status = npmRun('test:browser', [], { RATEBOOK_WTR_RESULTS: browserFile });
  const json = readText(browserFile);
  try {
    suite.counts = json === null ? null : JSON.parse(json);
  } catch {
    suite.counts = null;
  }
  suites.push(suite);
}

// 3. End-to-end tests: the production build driven in Chromium as a user would.
{
  const suite = { name: 'End-to-end tests (built app)', status: 0, counts: null, note: '' };
  const e2eFile = join(workDir, 'e2e.json');
  suite.status = npmRun('test:e2e', [], { RATEBOOK_E2E_RESULTS: e2eFile });
  const json = readText(e2eFile);
  try {
    suite.counts = json === null ? null : JSON.parse(json);
  } catch {
    suite.counts = null;
  }
  suites.push(suite);
}

rmSync(workDir, { recursive: true, force: true });

let passed = 0;
let failed = 0;
console.log('');
for (const suite of suites) {
  const counts = suite.counts;
  let line;
  if (counts === null) {
    line = `results could not be counted (exit code ${suite.status})`;
  } else {
    line = `${counts.passed} passed, ${counts.failed} failed`;
    passed += counts.passed;
    failed += counts.failed;
  }
  // A suite that exits non-zero without any counted failure crashed or did
  // not run (no Chromium, a file that failed to load, ...): one failure.
  if (suite.status !== 0 && (counts === null || counts.failed === 0)) {
    failed += 1;
    line += ` -- suite exited with code ${suite.status}, counted as 1 failure`;
  }
  console.log(`${suite.name}: ${line}`);
}
console.log(`${passed} passed, ${failed} failed`);

const firstBadStatus = suites.find((s) => s.status !== 0)?.status;
process.exit(firstBadStatus ?? (failed > 0 ? 1 : 0));
