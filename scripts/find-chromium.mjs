// Locates the Chromium binary used by the browser tests.
// Run directly, it exits 1 with a one-line hint when no binary is found.
import { existsSync, statSync } from 'node:fs';
import { pathToFileURL } from 'node:url';

export const DEFAULT_CHROMIUM = '/usr/bin/chromium';
export const NOT_FOUND_MESSAGE =
  "Chromium not found: install it with 'apt-get install -y chromium' (Debian) or set CHROME_PATH to a Chromium binary.";

function isFile(path) {
  try {
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

/**
 * CHROME_PATH wins when it names an existing file; otherwise the Debian
 * location is used. Returns null when neither exists.
 */
export function findChromium(env = process.env) {
  const fromEnv = env.CHROME_PATH;
  if (fromEnv && isFile(fromEnv)) return fromEnv;
  if (fromEnv && !existsSync(fromEnv)) {
    process.stderr.write(`CHROME_PATH=${fromEnv} does not exist; trying ${DEFAULT_CHROMIUM}\n`);
  }
  if (isFile(DEFAULT_CHROMIUM)) return DEFAULT_CHROMIUM;
  return null;
}

const runDirectly = process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href;
if (runDirectly) {
  if (findChromium() === null) {
    console.error(NOT_FOUND_MESSAGE);
    process.exit(1);
  }
}
