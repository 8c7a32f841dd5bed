// Lists test files below a directory. Node 20's `node --test` does not expand
// glob patterns itself (that arrived in Node 21), so the runners use this.
import { existsSync, readdirSync } from 'node:fs';
import { join, sep } from 'node:path';

/** Files under `dir` (recursively) whose names end in `suffix`, sorted, with '/' separators. */
export function listTests(dir, suffix = '.test.ts') {
  if (!existsSync(dir)) return [];
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile() && entry.name.endsWith(suffix))
    .map((entry) => join(entry.parentPath ?? entry.path, entry.name).split(sep).join('/'))
    .filter((path) => !path.split('/').includes('node_modules'))
    .sort();
}
