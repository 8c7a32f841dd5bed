// The engine in src/ is pure: no DOM, no Node APIs (except the command line), so it runs in
// a browser, a worker and Node alike. A design rule of the project, checked on the source text.
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const src = fileURLToPath(new URL('../../src/', import.meta.url));
const NODE_ONLY = new Set(['cli/cli.ts']);

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? files(p) : p.endsWith('.ts') ? [p] : [];
  });
}

it('src/ uses no DOM and no Node built-ins outside the command line', () => {
  const offenders: string[] = [];
  for (const f of files(src)) {
    const text = readFileSync(f, 'utf8').replace(/\/\*[\s\S]*?\*\/|\/\/.*$/gm, '');
    // a name the file declares itself (a local `window` of samples) is not the DOM's
    const globals = ['document', 'window', 'customElements', 'localStorage', 'navigator']
      .filter((g) => !new RegExp(`\\b(const|let|var)\\s+${g}\\b|[,(]\\s*${g}\\s*[,:)=]`).test(text));
    const dom = new RegExp(`(?<![.\\w])(${globals.join('|')})\\s*[.[]|\\b(HTMLElement|Node|Element)\\b(?=\\s*[.)\\]>])`);
    if (dom.test(text)) offenders.push(`${f}: DOM`);
    if (!NODE_ONLY.has(f.slice(src.length)) && /from ['"]node:/.test(text)) offenders.push(`${f}: Node built-in`);
  }
  assert.deepEqual(offenders, []);
});
