// The build step behind offline use (offline/vite-plugin.ts): which files the service worker
// caches, and that its version follows their content.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Script } from 'node:vm';
import { builtFiles, serviceWorkerSource } from '../../offline/vite-plugin.ts';

function outputDir(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), 'ratebook-sw-'));
  for (const [name, text] of Object.entries(files)) {
    mkdirSync(join(dir, name, '..'), { recursive: true });
    writeFileSync(join(dir, name), text);
  }
  return dir;
}

it('lists every built file, nested ones too, but not the worker itself or source maps', () => {
  const dir = outputDir({
    'index.html': '<!doctype html>', 'sw.js': 'old worker', 'assets/index-a1.js': 'app', 'assets/index-a1.js.map': '{}',
    'assets/engine.worker-b2.js': 'worker', 'icons/app.svg': '<svg/>',
  });
  try {
    assert.deepEqual(builtFiles(dir), ['assets/engine.worker-b2.js', 'assets/index-a1.js', 'icons/app.svg', 'index.html']);
  } finally {
    rmSync(dir, { recursive: true });
  }
});

it('writes the list and a version into the template, and the result is a valid script', () => {
  const dir = outputDir({ 'index.html': 'page', 'assets/app-1.js': 'one' });
  try {
    const { source, version, files } = serviceWorkerSource(dir);
    assert.match(version, /^[0-9a-f]{16}$/);
    assert.deepEqual(files, ['assets/app-1.js', 'index.html']);
    assert.ok(source.includes(`const BUILD = {"version":"${version}","files":["assets/app-1.js","index.html"]};`));
    assert.ok(!source.includes("version: 'template'"));
    assert.doesNotThrow(() => new Script(source, { filename: 'sw.js' }));
  } finally {
    rmSync(dir, { recursive: true });
  }
});

it('changes the version when a file changes, and only then', () => {
  const dir = outputDir({ 'index.html': 'page', 'assets/app-1.js': 'one' });
  try {
    const first = serviceWorkerSource(dir).version;
    assert.equal(serviceWorkerSource(dir).version, first);
    writeFileSync(join(dir, 'assets/app-1.js'), 'two');
    const second = serviceWorkerSource(dir).version;
    assert.notEqual(second, first);
    writeFileSync(join(dir, 'assets/app-2.js'), '');
    assert.notEqual(serviceWorkerSource(dir).version, second);
  } finally {
    rmSync(dir, { recursive: true });
  }
});

it('refuses a template without the line it fills in', () => {
  const dir = outputDir({ 'index.html': 'page' });
  try {
    assert.throws(() => serviceWorkerSource(dir, 'self.addEventListener("fetch", () => {});'), /ratebook:build/);
  } finally {
    rmSync(dir, { recursive: true });
  }
});
