/**
 * The content security policy's text (csp/policy.ts) and what the app's sources must avoid to
 * live under it. The rules are those of Content Security Policy Level 3 (W3C): a meta tag
 * ignores frame-ancestors, report-uri and sandbox; style attributes in markup are inline style
 * (style-src-attr), refused without 'unsafe-inline'; inline scripts are refused without
 * 'unsafe-inline', a hash or a nonce. The browser's own verdicts are in test/e2e/csp.e2e.mjs.
 */
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { PAGE_HEADER, PAGE_META, PAGE_POLICY, WORKER_HEADER, WORKER_PATH, WORKER_POLICY, policyText } from '../../csp/policy.ts';

const root = fileURLToPath(new URL('../..', import.meta.url));

describe('the content security policy', () => {
  it('lets the page load only its own files: no eval, no inline code, no remote source', () => {
    assert.match(PAGE_META, /^default-src 'none'; /);
    for (const [name, sources] of Object.entries(PAGE_POLICY)) {
      for (const s of sources) {
        assert.ok(["'self'", "'none'", "'report-sample'"].includes(s), `${name} allows ${s}`);
      }
    }
    assert.doesNotMatch(PAGE_META, /unsafe|https?:|data:|blob:|\*/);
  });

  it('holds nothing in the meta tag that a meta tag ignores, and the rest in the header', () => {
    assert.doesNotMatch(PAGE_META, /frame-ancestors|report-uri|report-to|sandbox/);
    assert.equal(PAGE_HEADER, `${PAGE_META}; frame-ancestors 'none'`);
  });

  it("gives the engine worker its own script and generated code, nothing more", () => {
    assert.deepEqual(WORKER_POLICY, { 'default-src': ["'none'"], 'script-src': ["'self'", "'unsafe-eval'"] });
    assert.equal(WORKER_HEADER, policyText(WORKER_POLICY));
    assert.match('/assets/engine.worker-D0PAVDFc.js', WORKER_PATH);
    assert.doesNotMatch('/assets/index-C3NuP_GX.js', WORKER_PATH);
  });

  it('index.html has no inline script or style', () => {
    const html = readFileSync(join(root, 'index.html'), 'utf8');
    assert.doesNotMatch(html, /<script(?![^>]*\ssrc=)[^>]*>/);
    assert.doesNotMatch(html, /<style|\sstyle=/);
  });

  it('no component writes a style attribute into its markup', () => {
    const files = readdirSync(join(root, 'components'), { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('.ts'));
    assert.ok(files.length > 20);
    const found = files.flatMap((f) => {
      const text = readFileSync(join(root, 'components', f), 'utf8');
      // (Lit's styleMap too: its first render writes the attribute)
      return [...text.matchAll(/\sstyle=["'$]|setAttribute\(\s*['"]style['"]/g)].map((m) => `${f}: ${text.slice(m.index, m.index + 40)}`);
    });
    assert.deepEqual(found, [], 'use a class: the policy refuses style attributes (the CSSOM, el.style.x = ..., is allowed)');
  });
});
