// Runs the engine tests: node --import tsx --test <every test/engine/**/*.test.ts>.
// Extra arguments (for example --test-reporter options) are passed to node.
import { spawnSync } from 'node:child_process';
import { listTests } from './list-tests.mjs';

export const ENGINE_TEST_DIR = 'test/engine';

const files = listTests(ENGINE_TEST_DIR);
if (files.length === 0) {
  console.log(`No engine tests found (${ENGINE_TEST_DIR}/**/*.test.ts): 0 tests run.`);
  process.exit(0);
}

const args = ['--import', 'tsx', '--import', './test/fast-check-seed.mjs', '--test', ...process.argv.slice(2), ...files];
const result = spawnSync(process.execPath, args, { stdio: 'inherit' });
if (result.error) {
  console.error(`Could not start node: ${result.error.message}`);
  process.exit(1);
}
process.exit(result.status ?? 1);
