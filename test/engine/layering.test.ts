// The layers and the direction of their imports, design rules of the project checked on the
// source text: the engine in src/ is pure (no DOM, no Node APIs except the command line), so it
// runs in a browser, a worker and Node alike; the app in components/ reaches the engine only
// through its public surface, src/index.ts; the engine never imports the app; and units sit
// below the expression language (src/units/ never imports src/expression/).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../../', import.meta.url));
const src = join(root, 'src');
const components = join(root, 'components');
const NODE_ONLY = new Set(['cli/cli.ts']);

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? files(p) : p.endsWith('.ts') ? [p] : [];
  });
}

const withoutComments = (text: string): string => text.replace(/\/\*[\s\S]*?\*\/|\/\/.*$/gm, '');

/** The module specifiers in a text: `from '...'` (imports, type imports, re-exports), `import '...'` and `import('...')`. */
const specifiersIn = (text: string): string[] =>
  [...text.matchAll(/(?:\bfrom\s*|\bimport\s*\(?\s*)['"]([^'"]+)['"]/g)].map((m) => m[1]);

/** The project files a module imports, as paths from the root with '/'. */
function importsOf(file: string): string[] {
  const specs = specifiersIn(withoutComments(readFileSync(file, 'utf8')));
  return specs.filter((s) => s.startsWith('.')).map((s) => relative(root, resolve(dirname(file), s)).split(sep).join('/'));
}

/** Every import from a file under `from` that breaks `allowed`, as "file -> target". */
function offending(from: string, allowed: (target: string) => boolean): string[] {
  return files(from).flatMap((f) => importsOf(f).filter((t) => !allowed(t)).map((t) => `${relative(root, f)} -> ${t}`));
}

it('src/ uses no DOM and no Node built-ins outside the command line', () => {
  const offenders: string[] = [];
  for (const f of files(src)) {
    const text = withoutComments(readFileSync(f, 'utf8'));
    // a name the file declares itself (a local `window` of samples) is not the DOM's
    const globals = ['document', 'window', 'customElements', 'localStorage', 'navigator']
      .filter((g) => !new RegExp(`\\b(const|let|var)\\s+${g}\\b|[,(]\\s*${g}\\s*[,:)=]`).test(text));
    const dom = new RegExp(`(?<![.\\w])(${globals.join('|')})\\s*[.[]|\\b(HTMLElement|Node|Element)\\b(?=\\s*[.)\\]>])`);
    if (dom.test(text)) offenders.push(`${f}: DOM`);
    if (!NODE_ONLY.has(relative(src, f).split(sep).join('/')) && /from ['"]node:/.test(text)) offenders.push(`${f}: Node built-in`);
  }
  assert.deepEqual(offenders, []);
});

it('components/ import the engine only through src/index.ts', () => {
  assert.deepEqual(offending(components, (t) => !t.startsWith('src/') || t === 'src/index.ts'), []);
});

it('src/ never imports components/', () => {
  assert.deepEqual(offending(src, (t) => !t.startsWith('components/')), []);
});

it('src/units/ never imports src/expression/', () => {
  assert.deepEqual(offending(join(src, 'units'), (t) => !t.startsWith('src/expression/')), []);
});

it('the import reader sees static, type-only, re-exported and dynamic imports', () => {
  // the rules above are only as good as the reader: check it on a text of each form
  const seen = specifiersIn(`import a from './a.ts'; import type { B } from "../b.ts"; export { c } from './c.ts'; await import('./d.ts'); import './e.css';`);
  assert.deepEqual(seen, ['./a.ts', '../b.ts', './c.ts', './d.ts', './e.css']);
});
