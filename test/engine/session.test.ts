import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { openStudy, runStudy, type Report, type StudySession } from '../../src/index.ts';
import { migrate } from '../../src/study/migrate.ts';
import { near, reportOf, cell } from './helpers.ts';

const example = (name: string) => JSON.parse(readFileSync(new URL(`../../examples/${name}`, import.meta.url), 'utf8'));

function study(cells: unknown[]) {
  return { format: 'ratebook-study', version: 1, title: 'test', cells };
}


function values(report: Report, id: string): Record<string, { value: number; unit: string; si: number }> {
  return cell(report, id).values as Record<string, { value: number; unit: string; si: number }>;
}

describe('a study with inputs in mixed units', () => {
  const report = reportOf(example('mixed-units-prep.ratebook.json'));

  it('evaluates every cell', () => {
    assert.equal(report.ok, true, JSON.stringify(report.cells.filter((c) => !c.ok)));
  });

  it('adds grams and milligrams, litres and millilitres', () => {
    const v = values(report, 'batch');
    // hand-worked: 1.5 g + 250 mg = 1.75 g = 1.75e-3 kg; 2 L + 350 mL = 2.35 L = 2.35e-3 m^3
    near(v.salt.si, 1.75e-3);
    assert.equal(v.salt.unit, 'g');
    near(v.water.si, 2.35e-3);
    // hand-worked: 1.75 g / 2.35 L = 0.7446809 g/L = 0.7446809 kg/m^3
    near(v.strength.si, 1.75 / 2.35);
    assert.equal(v.strength.unit, 'g / L');
    near(v.strength.value, 1.75 / 2.35);
    // hand-worked: 1 h + 45 min = 1.75 h = 6300 s
    assert.equal(v.hold.si, 6300);
    assert.equal(v.hold.value, 1.75);
  });

  it('mixes Fahrenheit and Celsius readings', () => {
    const v = values(report, 'probe');
    // (165 + 459.67) * 5/9 = 347.0389 K (NIST SP 811, B.9)
    near(v.T_hot.si, (165 + 459.67) * 5 / 9);
    // hand-worked: 165 degF - 41 degF = 124 degF-sized degrees = 68.889 K
    near(v.drop.si, 124 * 5 / 9);
    // hand-worked: 41 degF = 5 degC, so 41 degF - 4 degC = 1 K
    near(v.above_room.si, 1, 1e-12);
  });

  it('derives times from rates and flows in other units', () => {
    const v = values(report, 'loop');
    // t1/2 = ln 2 / k (common practice): 0.693147 / 0.35 per h = 1.980421 h
    near(v.t_half.si, Math.LN2 / 0.35 * 3600);
    assert.equal(v.t_half.unit, 'h');
    // hand-worked: 2.35 L / (250 mL/min) = 9.4 min = 564 s
    near(v.tau.si, 564);
    assert.equal(v.tau.unit, 'min');
    near(v.tau.value, 9.4);
  });

  it('checks the rate law and gives its rate at the start', () => {
    const c = cell(report, 'cooling');
    // hand-worked: -0.35/h * (347.0389 K - 277.15 K) = -24.461 K/h
    const T0 = (165 + 459.67) * 5 / 9;
    near((c.rateAtStart as { si: number }).si, -(0.35 / 3600) * (T0 - 277.15));
    assert.equal((c.rateAtStart as { unit: string }).unit, 'degC / h');
  });

  it('lists names that hide the trades\' units as warnings, and not a state T (tesla)', () => {
    assert.ok(!report.warnings.some((w) => w.includes('"T"')), JSON.stringify(report.warnings));
    const doc = example('mixed-units-prep.ratebook.json');
    doc.cells.push({ id: 'fall', kind: 'parameters', items: [{ name: 'g', value: '9.81 m / s^2' }] });
    const r = reportOf(doc);
    assert.ok(r.warnings.some((w) => w.includes('"g"') && w.includes('hides the unit g')), JSON.stringify(r.warnings));
  });
});

describe('errors land on the right cell with their path', () => {
  it('a rate of the wrong dimension says what was expected and what was found', () => {
    const r = reportOf(study([
      { id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] },
      { id: 'bad', kind: 'rate', state: 'T', unit: 'degC', rate: '-k', initial: '20 degC' },
    ]));
    const c = cell(r, 'bad');
    assert.equal(c.ok, false);
    assert.equal(c.error?.path, 'cells[1].rate');
    assert.equal(c.error?.message, 'rate of T must be temperature per time (such as degC / h); it is 1 / h');
    assert.equal(cell(r, 'inputs').ok, true);
  });

  it('an unknown name suggests the nearest defined name and underlines it', () => {
    const r = reportOf(study([
      { id: 'inputs', kind: 'parameters', items: [{ name: 'dose', value: '500 mg' }, { name: 'c', value: '2 * dsoe / (5 L)' }] },
    ]));
    const e = cell(r, 'inputs').error!;
    assert.equal(e.path, 'cells[0].items[1].value');
    assert.equal(e.message, 'unknown name "dsoe" (did you mean "dose"?)');
    assert.deepEqual(e.span, [4, 8]);
  });

  it('a cycle is reported on every cell in it, with its path', () => {
    const r = reportOf(study([
      { id: 'a', kind: 'parameters', items: [{ name: 'k', value: 'CL / V' }] },
      { id: 'b', kind: 'parameters', items: [{ name: 'V', value: 'CL / k' }] },
      { id: 'c', kind: 'parameters', items: [{ name: 'CL', value: '2 L / h' }] },
      { id: 'd', kind: 'parameters', items: [{ name: 'z', value: 'k * 1 h' }] },
    ]));
    assert.equal(cell(r, 'a').error?.message, 'circular definition: k -> V -> k');
    assert.equal(cell(r, 'a').error?.path, 'cells[0].items[0].name');
    assert.equal(cell(r, 'b').error?.message, 'circular definition: V -> k -> V');
    assert.equal(cell(r, 'c').ok, true);
    // a cell behind the cycle is not in it: it waits on it
    assert.match(cell(r, 'd').error!.message, /^waits on cell "a"/);
    assert.deepEqual(cell(r, 'd').waitsOn, ['a']);
  });

  it('a run waiting on a failed rate law names that cell once', () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 'w', cells: [
      { id: 'law', kind: 'rate', state: 'f', unit: 'percent', rate: '-f / (2 h)', initial: '1' },
      { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '2 h' },
    ] });
    assert.ok(r.ok);
    if (!r.ok) return;
    const message = r.report.cells[1].error!.message;
    assert.match(message, /^waits on cell "law": "f" has an error/);
    assert.equal(message.split('waits on cell').length, 2, message);
  });

  it('a name defined twice is an error on the second definer only', () => {
    const r = reportOf(study([
      { id: 'first', kind: 'parameters', items: [{ name: 'k', value: '1 / h' }] },
      { id: 'second', kind: 'parameters', items: [{ name: 'k', value: '2 / h' }] },
      { id: 'user', kind: 'parameters', items: [{ name: 'x', value: 'k * 1 h' }] },
    ]));
    assert.equal(cell(r, 'first').ok, true);
    assert.equal(cell(r, 'second').error?.message, '"k" is already defined in cell "first" (cells[0].items[0].name)');
    assert.equal(cell(r, 'second').error?.path, 'cells[1].items[0].name');
    assert.equal(values(r, 'user').x.si, 1);
  });

  it('refused syntax is reported on its field and the rest of the study computes', () => {
    const r = reportOf(study([
      { id: 'p', kind: 'parameters', items: [{ name: 'u', value: 'createUnit("furlong")' }, { name: 'w', value: '3 m' }] },
    ]));
    const c = cell(r, 'p');
    assert.equal(c.error?.path, 'cells[0].items[0].value');
    assert.match(c.error!.message, /may not call "createUnit"/);
    assert.equal(values(r, 'p').w.si, 3);
  });

  it('a state or t used in a parameter is refused with the reason', () => {
    const r = reportOf(study([
      { id: 'law', kind: 'rate', state: 'conc', unit: 'mg / L', rate: '-conc / (2 h)', initial: '5 mg / L' },
      { id: 'p', kind: 'parameters', items: [{ name: 'x', value: 'conc * 2' }, { name: 'y', value: 't + 1 h' }] },
    ]));
    const errors = cell(r, 'p').errors!;
    assert.match(errors[0].message, /"conc" is the state of rate cell "law"/);
    assert.match(errors[1].message, /"t" is time/);
  });

  it('field problems name the field; the cell keeps its place', () => {
    const r = reportOf(study([
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: 5, initial: '5 mg / L' },
      { id: 'p', kind: 'parameters', items: [{ name: 'x', value: '2 h' }] },
    ]));
    assert.equal(cell(r, 'law').error?.path, 'cells[0].rate');
    assert.match(cell(r, 'law').error!.message, /written as text, with its unit/);
    assert.equal(cell(r, 'p').ok, true);
  });

  it('a value that is not finite says why', () => {
    const r = reportOf(study([{ id: 'p', kind: 'parameters', items: [{ name: 'x', value: '1 / (0 h)' }, { name: 'y', value: 'sqrt(-1)' }] }]));
    const errors = cell(r, 'p').errors!;
    assert.match(errors[0].message, /infinite/);
    assert.match(errors[1].message, /not a number/);
  });

  it('a fit defines its estimates downstream; a reference to a missing cell suggests the nearest id', () => {
    const r = reportOf(study([
      { id: 'samples', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[0, 10], [2, 6]] },
      { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '10 mg / L' },
      { id: 'p0', kind: 'parameters', items: [{ name: 'k', value: '0.2 / h' }] },
      { id: 'fitk', kind: 'fit', rates: ['law'], data: 'samples', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k_hat', guess: '0.1 / h' }] },
      { id: 'p', kind: 'parameters', items: [{ name: 'x', value: 'k_hat * 2' }] },
      { id: 'typo', kind: 'fit', rates: ['law'], data: 'sample', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'k', as: 'k2', guess: '0.1 / h' }] },
    ]));
    assert.equal(cell(r, 'fitk').ok, true, JSON.stringify(cell(r, 'fitk').error));
    assert.equal(cell(r, 'p').ok, true);
    assert.equal(cell(r, 'typo').error?.message, 'there is no cell "sample" (did you mean "samples"?)');
    assert.equal(cell(r, 'typo').error?.path, 'cells[5].data');
  });
});

describe('documents that are not studies are refused with a path', () => {
  const cases: Array<[string, unknown, string, RegExp]> = [
    ['another format', { format: 'other', version: 1, cells: [] }, 'format', /not a Ratebook study/],
    ['a newer version', { format: 'ratebook-study', version: 9, cells: [] }, 'version', /newer Ratebook/],
    ['a duplicate id', study([{ id: 'a', kind: 'note', text: '' }, { id: 'a', kind: 'note', text: '' }]), 'cells[1].id', /used twice/],
    ['an unknown kind', study([{ id: 'a', kind: 'note', text: '' }, { id: 'b', kind: 'chart' }]), 'cells[1].kind', /unknown cell kind "chart"/],
    ['broken JSON', '{"format": "ratebook-study",', '', /not valid JSON/],
    ['an author that is not text', { format: 'ratebook-study', version: 1, author: 7, cells: [] }, 'author', /"author" must be text/],
  ];
  for (const [what, doc, path, message] of cases) {
    it(what, () => {
      const r = runStudy(doc);
      assert.equal(r.ok, false);
      if (!r.ok) {
        assert.equal(r.error.path, path);
        assert.match(r.error.message, message);
      }
    });
  }

  it('keeps the optional author through edits, sets it and clears it', () => {
    const r = openStudy({ format: 'ratebook-study', version: 1, title: 'x', author: 'A. Reviewer', cells: [{ id: 'a', kind: 'note', text: '' }] });
    assert.ok(r.ok);
    if (!r.ok) return;
    r.session.apply({ type: 'retitle', title: 'y' });
    assert.equal(r.session.document().author, 'A. Reviewer');
    r.session.apply({ type: 'author', author: 'B. Engineer' });
    assert.equal(r.session.document().author, 'B. Engineer');
    r.session.apply({ type: 'author', author: '  ' });
    assert.equal('author' in r.session.document(), false, 'a blank author is removed');
  });

  it('sets the optional description and clears it', () => {
    const r = openStudy({ format: 'ratebook-study', version: 1, title: 'x', cells: [{ id: 'a', kind: 'note', text: '' }] });
    assert.ok(r.ok);
    if (!r.ok) return;
    r.session.apply({ type: 'describe', description: 'Cooling a stock pot (invented numbers)' });
    assert.equal(r.session.document().description, 'Cooling a stock pot (invented numbers)');
    r.session.apply({ type: 'retitle', title: 'y' });
    assert.equal(r.session.document().description, 'Cooling a stock pot (invented numbers)');
    r.session.apply({ type: 'describe', description: ' ' });
    assert.equal('description' in r.session.document(), false, 'a blank description is removed');
  });

  it('older versions go through the migration table step by step', () => {
    const table = {
      1: (d: Record<string, unknown>) => ({ ...d, cells: [...(d.cells as unknown[]), { id: 'added', kind: 'note', text: 'v2' }] }),
      2: (d: Record<string, unknown>) => ({ ...d, title: `${d.title} (v3)` }),
    };
    const { doc, notes } = migrate({ format: 'ratebook-study', version: 1, title: 'old', cells: [] }, 1, 3, table);
    assert.equal(doc.version, 3);
    assert.equal(doc.title, 'old (v3)');
    assert.equal((doc.cells as unknown[]).length, 1);
    assert.equal(notes.length, 2);
  });
});

describe('incremental edits re-run only what is downstream', () => {
  const cells = () => [
    { id: 'inputs', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }, { name: 'Ta', value: '4 degC' }] },
    { id: 'other', kind: 'parameters', items: [{ name: 'z', value: '5 kg' }] },
    { id: 'derived', kind: 'parameters', items: [{ name: 't_half', value: 'log(2) / k' }] },
    { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
    { id: 'uses-z', kind: 'parameters', items: [{ name: 'z2', value: '2 * z' }] },
    { id: 'n', kind: 'note', text: 'notes never re-run' },
  ];
  const open = (): StudySession => {
    const o = openStudy(study(cells()));
    assert.ok(o.ok);
    return (o as { session: StudySession }).session;
  };
  const edit = (s: StudySession, id: string, change: (c: any) => void) => {
    const c = structuredClone(s.document().cells.find((x) => x.id === id)) as any;
    change(c);
    const r = s.apply({ type: 'replace', cell: c });
    assert.ok(r.ok);
    return r as { rerun: readonly string[]; changed: readonly string[]; report: Report };
  };

  it('changing k re-runs exactly its cell, the half-life and the law', () => {
    const s = open();
    const r = edit(s, 'inputs', (c) => { c.items[0].value = '0.5 / h'; });
    assert.deepEqual(r.rerun, ['inputs', 'derived', 'cooling']);
    assert.deepEqual(r.changed, ['inputs', 'derived', 'cooling']);
    near(values(r.report, 'derived').t_half.si, Math.LN2 / 0.5 * 3600);
  });

  it('changing z leaves k\'s users alone', () => {
    const s = open();
    const r = edit(s, 'other', (c) => { c.items[0].value = '6 kg'; });
    assert.deepEqual(r.rerun, ['other', 'uses-z']);
  });

  it('stops where a value did not change', () => {
    const s = open();
    // the same value written differently: the cell re-runs, its users do not
    const r = edit(s, 'inputs', (c) => { c.items[0].value = '0.35/h'; });
    assert.deepEqual(r.rerun, ['inputs']);
    assert.deepEqual(r.changed, []);
  });

  it('removing a definition makes its users fail, and restoring it heals them', () => {
    const s = open();
    const removed = s.apply({ type: 'remove', id: 'other' });
    assert.ok(removed.ok);
    if (!removed.ok) return;
    assert.deepEqual(removed.rerun, ['uses-z']);
    assert.match(cell(removed.report, 'uses-z').error!.message, /unknown name "z"/);
    const back = s.apply({ type: 'insert', index: 1, cell: cells()[1] });
    assert.ok(back.ok && back.report.ok);
  });

  it('moving a duplicate definer above the first one swaps which one wins', () => {
    const s = open();
    s.apply({ type: 'insert', index: 6, cell: { id: 'dup', kind: 'parameters', items: [{ name: 'z', value: '7 kg' }] } });
    assert.equal(cell(s.report(), 'dup').ok, false);
    const r = s.apply({ type: 'move', id: 'dup', to: 0 });
    assert.ok(r.ok);
    assert.equal(cell(s.report(), 'dup').ok, true);
    assert.equal(cell(s.report(), 'other').ok, false);
    near(values(s.report(), 'uses-z').z2.si, 14);
  });

  it('a refused edit changes nothing', () => {
    const s = open();
    const before = JSON.stringify(s.report());
    const r = s.apply({ type: 'insert', index: 0, cell: { id: 'inputs', kind: 'note', text: '' } });
    assert.equal(r.ok, false);
    const bad = s.apply({ type: 'replace', cell: { id: 'inputs', kind: 'spreadsheet' } });
    assert.equal(bad.ok, false);
    assert.equal(JSON.stringify(s.report()), before);
  });

  it('agrees with evaluating the edited study from scratch', () => {
    const s = open();
    edit(s, 'inputs', (c) => { c.items[1].value = '10 degC'; });
    edit(s, 'cooling', (c) => { c.rate = '-k * (T - Ta) + 1 K / h'; });
    s.apply({ type: 'move', id: 'n', to: 0 });
    assert.deepEqual(s.report(), reportOf(s.document()));
  });
});
