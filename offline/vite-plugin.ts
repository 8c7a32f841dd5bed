/**
 * The build step that makes the production app work offline: after Vite has written the
 * output, it lists every file in it, derives a version from their names and contents, and
 * writes `sw.js` (from the template `offline/service-worker.js`) beside `index.html`.
 * `components/register-sw.ts` registers that worker in production builds only.
 */
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Plugin } from 'vite';

/** The worker's file name in the output (its scope is the app's base). */
export const SERVICE_WORKER_FILE = 'sw.js';

const TEMPLATE = fileURLToPath(new URL('./service-worker.js', import.meta.url));
/** The template's placeholder line, replaced with the build's data. */
const BUILD_LINE = /^const BUILD = .*\/\/ ratebook:build.*$/m;

/**
 * Every file under `dir` (paths relative to it, '/'-separated, sorted), leaving out the worker
 * itself and source maps (the app never requests those).
 */
export function builtFiles(dir: string): string[] {
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => relative(dir, join(entry.parentPath, entry.name)).split(sep).join('/'))
    .filter((file) => file !== SERVICE_WORKER_FILE && !file.endsWith('.map'))
    .sort();
}

/** The worker's source for the files of `dir`: a version of 16 hex digits (SHA-256 of the template, names and contents). */
export function serviceWorkerSource(dir: string, template = readFileSync(TEMPLATE, 'utf8')): { source: string; version: string; files: string[] } {
  if (!BUILD_LINE.test(template)) throw new Error(`${TEMPLATE}: the "const BUILD = ... // ratebook:build" line is missing`);
  const files = builtFiles(dir);
  const hash = createHash('sha256').update(template);
  for (const file of files) hash.update(`\0${file}\0`).update(readFileSync(join(dir, file)));
  const version = hash.digest('hex').slice(0, 16);
  const line = `const BUILD = ${JSON.stringify({ version, files })}; // ratebook:build ${files.length} files`;
  return { source: template.replace(BUILD_LINE, () => line), version, files };
}

/** The Vite plugin (build only): writes `sw.js` into the output directory once the bundle is written. */
export function offlineServiceWorker(): Plugin {
  return {
    name: 'ratebook:offline-service-worker',
    apply: 'build',
    writeBundle: {
      order: 'post',
      handler(options) {
        const dir = options.dir;
        if (!dir) throw new Error('ratebook:offline-service-worker needs build.outDir (a directory output)');
        const { source, version, files } = serviceWorkerSource(dir);
        writeFileSync(join(dir, SERVICE_WORKER_FILE), source);
        this.info(`${SERVICE_WORKER_FILE}: version ${version}, ${files.length} files cached for offline use`);
      },
    },
  };
}
