// The fuzz test: mutated studies (the templates in examples/, changed at random places: values
// replaced by hostile ones, numbers scaled by powers of ten, fields deleted, cells doubled or
// swapped, text cut short, a byte-order mark, nesting 40 deep) go through the engine and the
// command line. Checked for every case: nothing throws, no JavaScript stack is printed, no cell
// reports an internal error, every message names a path (a cell's on its own cells[i]), and
// the study's work stays within the stated budget: FUZZ_CELL_WORK units per cell (an uncertainty
// cell: that times its workScale, one budget per 1,000 samples), plus at most
// one charge's overshoot (numerics/work-meter.ts counts evaluations, steps, samples, sweep points and
// doses). Budgets, not clocks: speed goals live in `npm run bench`.
//
// CI: the fixed seed of test/fast-check-seed.mjs, RATEBOOK_FUZZ_RUNS cases (default 10,000,
// about 2 minutes on 2 cores). Nightly size:
//   RATEBOOK_SEED=random RATEBOOK_FUZZ_RUNS=100000 node --import tsx --import ./test/fast-check-seed.mjs --test test/engine/fuzz.test.ts
// A failure prints its seed and the shrunk case; RATEBOOK_SEED=<seed> replays it.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, readdirSync } from 'node:fs';
import { workScaleOf } from '../../src/cells/uncertainty.ts';
import fc from 'fast-check';
import { main, type Io } from '../../src/cli/cli.ts';
import { openStudy } from '../../src/engine/session.ts';
import { metered } from '../../src/numerics/work-meter.ts';
import type { CellReport } from '../../src/engine/report.ts';
import type { Cell } from '../../src/study/types.ts';

const RUNS = Number(process.env.RATEBOOK_FUZZ_RUNS ?? 10000);
/** Each cell's work budget in the fuzz run: small, so that 10,000 studies take about 2 minutes. */
const FUZZ_CELL_WORK = 4000;
/** The most one charge can overshoot a budget: a sweep point (1000 units) or a schedule's dose (200), a plot's samples (< 1000). */
const OVERSHOOT = 2000;

const dir = new URL('../../examples/', import.meta.url);
const TEMPLATES = readdirSync(dir).filter((f) => f.endsWith('.json')).sort().map((f) => JSON.parse(readFileSync(new URL(f, dir), 'utf8')));

/** Nested lists 40 deep: beyond the bound of study/limits.ts. */
const DEEP: unknown = Array.from({ length: 40 }).reduce<unknown>((inner) => [inner], []);

const HOSTILE: readonly unknown[] = [
  null, true, 0, -1, 1e308, 5e-324, '', ' ', 'x', '0 h', '-1 h', '1e-300 h', '1e300 h', '1e308 mg / L', 'NaN', 'Infinity h',
  '1 / 0', '0 / 0 h', 'k * 1e300', '((((((((((1))))))))))', `${'('.repeat(300)}1${')'.repeat(300)}`, 'x'.repeat(5000),
  '1 h +', 'sqrt(-1) mg / L', 'log(0)', '10 degC', '1e6 degF', '2 m^3 / s', '<script>alert(1)</script>', '__proto__',
  'constructor', 'valueOf', [], {}, [1, 2], { a: 1 }, ['1 h'], DEEP, 1e-300, 100000, 10000, 2, 'euler', 'rk4', 'stiff',
  { relative: 1e-300 }, { relative: 0.5 }, { relative: 1e-9 }, 'auto',
];

type Mutation =
  | { kind: 'replace'; at: number; value: number }
  | { kind: 'scale'; at: number; power: number }
  | { kind: 'delete'; at: number }
  | { kind: 'double'; at: number }
  | { kind: 'swap'; a: number; b: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), value: fc.nat({ max: HOSTILE.length - 1 }) }),
  fc.record({ kind: fc.constant('scale' as const), at: fc.nat(), power: fc.integer({ min: -14, max: 14 }) }),
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('double' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('swap' as const), a: fc.nat(), b: fc.nat() }),
);

interface Place { readonly parent: Record<string, unknown> | unknown[]; readonly key: string | number }

/** Every place in a document that holds a value (iteratively: the mutations can nest). */
function places(doc: unknown): Place[] {
  const out: Place[] = [];
  const stack: unknown[] = [doc];
  while (stack.length) {
    const v = stack.pop();
    if (typeof v !== 'object' || v === null) continue;
    if (Array.isArray(v)) v.forEach((x, i) => { out.push({ parent: v, key: i }); stack.push(x); });
    else for (const [k, x] of Object.entries(v)) { out.push({ parent: v as Record<string, unknown>, key: k }); stack.push(x); }
  }
  return out;
}

const get = (p: Place) => (p.parent as Record<string | number, unknown>)[p.key];
const set = (p: Place, v: unknown) => { (p.parent as Record<string | number, unknown>)[p.key] = v; };

/** Numbers in an expression's text times 10^power ("24 h" → "2.4e+7 h"). */
function scaled(text: string, power: number): string {
  return text.replace(/\d+(\.\d+)?(e[+-]?\d+)?/gi, (m) => String(Number(m) * 10 ** power));
}

function mutate(template: unknown, mutations: readonly Mutation[]): unknown {
  const doc = structuredClone(template);
  for (const m of mutations) {
    const all = places(doc);
    if (all.length === 0) break;
    if (m.kind === 'swap') {
      const cells = (doc as { cells?: unknown }).cells;
      if (Array.isArray(cells) && cells.length > 1) {
        const a = m.a % cells.length, b = m.b % cells.length;
        [cells[a], cells[b]] = [cells[b], cells[a]];
      }
      continue;
    }
    const p = all[m.at % all.length];
    if (m.kind === 'replace') set(p, structuredClone(HOSTILE[m.value]));
    else if (m.kind === 'scale') { const v = get(p); if (typeof v === 'string') set(p, scaled(v, m.power)); }
    else if (m.kind === 'delete') {
      if (Array.isArray(p.parent)) p.parent.splice(p.key as number, 1);
      else delete p.parent[p.key as string];
    } else if (m.kind === 'double' && Array.isArray(p.parent)) p.parent.splice(p.key as number, 0, structuredClone(get(p)));
  }
  return doc;
}

/** How the text reaches the command line: as written, with a byte-order mark, or cut short. */
const textForm = fc.constantFrom('plain', 'plain', 'plain', 'bom', 'cut');

const STACK = /\n\s+at .*(:\d+:\d+|<anonymous>)/;

function checkCells(cells: readonly CellReport[], where: string): void {
  cells.forEach((c, i) => {
    for (const e of [...(c.error ? [c.error] : []), ...(c.errors ?? [])]) {
      assert.notEqual(e.kind, 'internal', `${where}: cells[${i}] has an internal error: ${e.message}`);
      assert.ok(e.path.startsWith(`cells[${i}]`), `${where}: an error of cells[${i}] has the path "${e.path}": ${e.message}`);
      assert.ok(e.message.length > 0 && e.message.length <= 1001, `${where}: cells[${i}]: a message of ${e.message.length} characters`);
      assert.doesNotMatch(e.message, STACK);
    }
  });
}

/** The study's budget: each cell's own (an uncertainty cell may use several, `workScaleOf`), plus the overshoot. */
function budgetOf(doc: unknown, cellCount: number): number {
  const cells = (doc as { cells?: unknown[] }).cells ?? [];
  let total = 0;
  const all = Array.isArray(cells) ? (cells.filter((c) => c && typeof c === 'object') as Cell[]) : [];
  for (let i = 0; i < cellCount; i++) total += FUZZ_CELL_WORK * workScaleOf(cells[i], all) + OVERSHOOT;
  return total;
}

const TOP_LEVEL = /^(format|version|title|description|author|cells)\b/;

describe('fuzz: mutated studies through the engine and the command line', () => {
  it(`${RUNS} mutated templates: no exception, no stack trace, every message on a path, work within budget`, () => {
    fc.assert(fc.property(
      fc.nat({ max: TEMPLATES.length - 1 }), fc.array(mutation, { minLength: 1, maxLength: 3 }), textForm,
      (which, mutations, form) => {
        const doc = mutate(TEMPLATES[which], mutations);
        const where = `template ${which}, ${JSON.stringify(mutations)}`;
        // the engine, given the parsed document (as the app's worker is)
        const engine = metered(Infinity, Infinity, () => openStudy(doc, { cellWork: FUZZ_CELL_WORK }));
        assert.ok(!engine.exceeded && engine.value, where);
        const opened = engine.value!;
        let cellCount = 0;
        if (opened.ok) {
          const report = opened.session.report();
          cellCount = report.cells.length;
          checkCells(report.cells, `engine, ${where}`);
          assert.ok(engine.used <= budgetOf(doc, cellCount), `${where}: ${engine.used} units of work for ${cellCount} cells`);
        } else {
          assert.equal(typeof opened.error.path, 'string');
          if (opened.error.path) assert.match(opened.error.path, TOP_LEVEL, where);
        }
        // the command line, given the text
        const json = JSON.stringify(doc);
        const text = form === 'bom' ? `\uFEFF${json}` : form === 'cut' ? json.slice(0, Math.floor(json.length / 2)) : json;
        let out = '';
        let err = '';
        const io: Io = { out: (t) => { out += t; }, err: (t) => { err += t; }, read: () => text };
        const cli = metered(Infinity, Infinity, () => main(['run', 'study.json', '--json'], io, { cellWork: FUZZ_CELL_WORK }));
        const code = cli.value;
        assert.ok(code === 0 || code === 1 || code === 2, `${where}: exit status ${code}`);
        assert.doesNotMatch(out + err, STACK, where);
        if (code === 2) {
          assert.match(err, /^ratebook: [^\n]+\n$/, `${where}: ${err}`);
          // the same document read by the engine and by the command line: the same verdict
          if (form !== 'cut') assert.equal(opened.ok, false, `${where}: the engine opened what the command line refused: ${err}`);
        } else {
          if (form !== 'cut') assert.equal(opened.ok, true, `${where}: the command line opened what the engine refused`);
          const report = JSON.parse(out) as { cells: CellReport[] };
          checkCells(report.cells, `command line, ${where}`);
          assert.ok(cli.used <= budgetOf(doc, report.cells.length), `${where}: ${cli.used} units of work`);
        }
      },
    ), { numRuns: RUNS, includeErrorInReport: true });
  });
});
