// The printed sheet, the charts and the cell elements render what the engine reports: they
// reach the engine only through its public surface, src/index.ts (a design rule of the
// project, checked on the source text).
import { it } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';

const DIRS = ['sheet', 'plots', 'cells'];

it('components/sheet, plots and cells import from src/ only through src/index.ts', () => {
  const offenders: string[] = [];
  for (const dir of DIRS) {
    const base = new URL(`../../components/${dir}/`, import.meta.url);
    for (const f of readdirSync(base).filter((x) => x.endsWith('.ts'))) {
      const text = readFileSync(new URL(f, base), 'utf8');
      for (const m of text.matchAll(/from\s+['"]([^'"]*\/src\/[^'"]*)['"]/g)) {
        if (!m[1].endsWith('/src/index.ts')) offenders.push(`components/${dir}/${f}: ${m[1]}`);
      }
    }
  }
  assert.deepEqual(offenders, []);
});
