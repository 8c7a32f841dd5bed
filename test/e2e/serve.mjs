// Shared by the end-to-end scripts: a free localhost port, and `vite preview` of dist/ on it,
// with the app's content security policy on; every script fails on a violation of it.
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = fileURLToPath(new URL('../..', import.meta.url));

/** Chromium's flags for this machine: no sandbox as root, no GPU, no background traffic. */
export const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export function freePort() {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}

/** Clicks "Printable sheet" and waits until the sheet shows its sections; rejects after `timeout` ms. */
export async function openSheet(page, timeout) {
  await page.getByRole('button', { name: 'Printable sheet' }).click();
  await page.waitForURL(/\/sheet$/, { timeout });
  await page.waitForFunction(() => {
    const sheet = document.querySelector('ratebook-app')?.shadowRoot?.querySelector('study-view')?.shadowRoot?.querySelector('study-sheet');
    return (sheet?.shadowRoot?.querySelectorAll('section.cell').length ?? 0) > 0;
  }, null, { timeout });
}

/** The files the previews of this script write the browser's policy violation reports to (csp/vite-plugin.ts). */
const reportFiles = [];

/**
 * The content security policy violations the browser reported to the previews started by
 * this script so far (page and workers alike), one line each.
 */
export function policyViolations() {
  const out = [];
  for (const file of reportFiles) {
    if (!existsSync(file)) continue;
    for (const line of readFileSync(file, 'utf8').split('\n').filter(Boolean)) {
      let r;
      try { r = JSON.parse(line)['csp-report'] ?? {}; } catch { out.push(line); continue; }
      out.push(`${r['violated-directive'] ?? r['effective-directive']} blocked ${r['blocked-uri'] || '(inline)'}${r['script-sample'] ? ` (${r['script-sample']})` : ''} in ${r['document-uri']}${r['source-file'] ? ` at ${r['source-file']}:${r['line-number']}` : ''}`);
    }
  }
  return out;
}

/** Forgets the violations reported so far (after a script provoked one on purpose, to see the reports arrive). */
export function clearViolations() {
  for (const file of reportFiles) if (existsSync(file)) writeFileSync(file, '');
}

/**
 * Starts `vite preview` on dist/ and resolves with `{ child, url }` once it answers; rejects
 * with vite's output when it exits or does not answer within `timeoutMs`. The preview sends
 * the app's policy with a report address; `policyViolations()` reads what was reported.
 */
export async function startPreview(port, timeoutMs = 30_000) {
  const vite = join(root, 'node_modules', 'vite', 'bin', 'vite.js');
  const reports = join(mkdtempSync(join(tmpdir(), 'ratebook-csp-')), 'reports.jsonl');
  reportFiles.push(reports);
  const child = spawn(process.execPath, [vite, 'preview', '--host', '127.0.0.1', '--port', String(port), '--strictPort'], {
    cwd: root, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, RATEBOOK_CSP_REPORTS: reports },
  });
  let output = '';
  child.stdout.on('data', (d) => { output += d; });
  child.stderr.on('data', (d) => { output += d; });
  const url = `http://127.0.0.1:${port}/`;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`vite preview exited with code ${child.exitCode}:\n${output}`);
    try {
      if ((await fetch(url)).ok) return { child, url };
    } catch { /* not listening yet */ }
    await new Promise((r) => setTimeout(r, 200));
  }
  child.kill();
  throw new Error(`vite preview did not answer at ${url} within ${timeoutMs / 1000} s:\n${output}`);
}

/** A failure the script expects (a check that did not hold): reported by its message alone. */
export class Failure extends Error {}

export function fail(message) {
  throw new Failure(message);
}

/**
 * Runs an end-to-end script's `main`, prints passed or FAILED with the reason, and sets the
 * exit code. A script whose pages violated the content security policy fails.
 */
export async function runScript(name, main) {
  try {
    await main();
    const violations = policyViolations();
    if (violations.length) fail(`the content security policy was violated ${violations.length} time(s): ${[...new Set(violations)].join(' | ')}`);
    console.log(`e2e ${name}: passed`);
  } catch (err) {
    console.error(`e2e ${name}: FAILED: ${err instanceof Failure ? err.message : err?.stack ?? err}`);
    process.exitCode = 1;
    // a browser left open by the failed step must not keep the suite waiting: exit soon
    setTimeout(() => process.exit(1), 10_000).unref();
  } finally {
    for (const file of reportFiles) rmSync(join(file, '..'), { recursive: true, force: true });
  }
}
