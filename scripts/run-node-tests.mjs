// Runs the Node tests: node --import tsx --test <every test/engine/**/*.test.ts and
// test/app/**/*.test.ts> (the engine, and the app's code that runs without a browser).
// Extra arguments (for example --test-reporter options) are passed to node.
import { spawnSync } from 'node:child_process';
import { listTests } from './list-tests.mjs';

export const NODE_TEST_DIRS = ['test/engine', 'test/app'];

const files = NODE_TEST_DIRS.flatMap((dir) => listTests(dir));
if (files.length === 0) {
  console.log(`No Node tests found (${NODE_TEST_DIRS.join(', ')}): 0 tests run.`);
  process.exit(0);
}

const args = ['--import', 'tsx', '--import', './test/fast-check-seed.mjs', '--test', ...process.argv.slice(2), ...files];
const result = spawnSync(process.execPath, args, { stdio: 'inherit' });
if (result.error) {
  console.error(`Could not start node: ${result.error.message}`);
  process.exit(1);
}
process.exit(result.status ?? 1);
