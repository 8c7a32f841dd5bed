// The what-if evaluator: answers with values replaced equal the session's own answers after
// the same values are written into the study; closed forms; refusals; and the session is
// never touched.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, reportQuantity, type FindResult, type StudySession, type WhatIf, type WhatIfAnswer } from '../../src/index.ts';
import type { GraphNode } from '../../src/engine/node.ts';
import { near } from './helpers.ts';
// the benchmark's study: a dose every 8 h six times, with four questions
import { SIX_DOSES } from '../../bench/simulate.ts';

const HOUR = 3600;

const COOLING: object = {
  format: 'ratebook-study', version: 1, title: 'cooling',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.8 / h' }, { name: 'Ta', value: '20 degC' }, { name: 'target', value: '40 degC' }] },
    { id: 'cooling', kind: 'rate', state: 'T', unit: 'degC', rate: '-k * (T - Ta)', initial: '70 degC' },
    { id: 'run', kind: 'simulate', rates: ['cooling'], from: '0 h', to: '6 h', find: [{ name: 't_40', crossing: 'T', level: 'target', direction: 'down' }, { name: 'T_2h', valueOf: 'T', at: '2 h' }] },
    { id: 'after', kind: 'parameters', items: [{ name: 'margin', value: '6 h - t_40' }] },
  ],
};

const CHAIN = {
  format: 'ratebook-study', version: 1, title: 'chain',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'weight', value: '70 kg' }, { name: 'Vd', value: '0.7 L / kg * weight' }, { name: 'k', value: '0.2 / h' }, { name: 'CL', value: 'k * Vd', unit: 'L / h' }, { name: 'other', value: '3 h' }] },
    { id: 'q', kind: 'parameters', items: [{ name: 'half', value: 'log(2) / k' }, { name: 'dailyCL', value: 'CL * 24 h' }] },
  ],
};

const BOLUS: object = {
  format: 'ratebook-study', version: 1, title: 'bolus',
  cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '100 mg' }, { name: 'V', value: '20 L' }, { name: 'k', value: '0.3 / h' }] },
    { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: 'dose / V' },
    { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '12 h', find: [{ name: 'C6', valueOf: 'C', at: '6 h' }] },
  ],
};

function open(doc: unknown): StudySession {
  const o = openStudy(structuredClone(doc));
  assert.ok(o.ok, o.ok ? '' : o.error.message);
  return o.session;
}

function prepared(s: StudySession, wanted: string[], replaced: Parameters<StudySession['whatIf']>[1]): WhatIf {
  const w = s.whatIf(wanted, replaced);
  assert.ok(w.ok, w.ok ? '' : w.error.message);
  return w;
}

/** The session's own answer to `name` after `edits` (parameter name -> new text) are written into the study. */
function edited(doc: unknown, edits: Record<string, string>): { session: StudySession; si: Record<string, number> } {
  const s = open(doc);
  const si: Record<string, number> = {};
  for (const [name, text] of Object.entries(edits)) {
    const cell = structuredClone(s.document().cells.find((c) => c.kind === 'parameters' && (c.items as Array<{ name: string }>).some((i) => i.name === name))!) as { id: string; items: Array<{ name: string; value: string }> };
    cell.items.find((i) => i.name === name)!.value = text;
    const r = s.apply({ type: 'replace', cell });
    assert.ok(r.ok);
    const values = r.report.cells.find((c) => c.id === cell.id)!.values as Record<string, { si: number }>;
    si[name] = values[name].si;
  }
  return { session: s, si };
}

function results(s: StudySession, cell: string): Record<string, FindResult> {
  return s.report().cells.find((c) => c.id === cell)!.results as Record<string, FindResult>;
}

describe('what-if: the same answers as a real edit', () => {
  it('the 6-dose schedule with k or the dose replaced gives the session\'s four answers exactly', () => {
    const base = open(SIX_DOSES);
    const wanted = ['Cmax', 'trough', 'auc', 'above'];
    const byK = prepared(base, wanted, ['k']);
    const byDose = prepared(base, wanted, [{ name: 'dose', dimension: 'mg' }]);
    for (const [w, name, text] of [[byK, 'k', '0.07 / h'], [byK, 'k', '0.25 / h'], [byDose, 'dose', '350 mg'], [byDose, 'dose', '1 g']] as const) {
      const { session, si } = edited(SIX_DOSES, { [name]: text });
      const r = w.evaluate([si[name]]);
      assert.ok(r.ok);
      const own = results(session, 'run');
      r.answers.forEach((a) => {
        assert.ok(a.ok);
        // the answer in the unit the session shows it in, to the last bit
        assert.deepEqual(reportQuantity(a.q), own[a.name], `${a.name} with ${name} = ${text}`);
        assert.equal(r.values[wanted.indexOf(a.name)], (own[a.name] as { si: number }).si);
      });
    }
  });

  it('a cooling study with a crossing: k, the ambient and the starting temperature (a state) replaced', () => {
    const base = open(COOLING);
    const w = prepared(base, ['t_40', 'T_2h', 'margin'], ['k', 'Ta', 'T']);
    const { session, si } = edited(COOLING, { k: '1.1 / h', Ta: '15 degC' });
    // the start as a real edit of the rate cell: 80 degC is 353.15 K in SI
    const cell = structuredClone(session.document().cells[1]) as { initial: string };
    cell.initial = '80 degC';
    assert.ok(session.apply({ type: 'replace', cell: cell as never }).ok);
    const r = w.evaluate([si.k, si.Ta, 353.15]);
    assert.ok(r.ok, JSON.stringify(r.answers));
    const own = results(session, 'run');
    const margin = (session.report().cells[3].values as Record<string, unknown>).margin;
    assert.deepEqual(r.answers.map((a) => a.ok && reportQuantity(a.q)), [own.t_40, own.T_2h, margin]);
    // closed form (Newton cooling): T falls to L at t = ln((T0 - Ta) / (L - Ta)) / k
    near(r.values[0], Math.log((80 - 15) / (40 - 15)) / (1.1 / HOUR), 1e-6, 'closed form: t_40');
    // closed form: T(2 h) = Ta + (T0 - Ta) e^(-2 k)
    near(r.values[1], 273.15 + 15 + 65 * Math.exp(-2.2), 1e-6, 'closed form: T_2h');
  });

  it('a parameter chain: only the parameters between the replaced and the wanted names run', () => {
    const base = open(CHAIN);
    const w = prepared(base, ['CL', 'dailyCL'], [{ name: 'weight', dimension: 'kg' }]);
    assert.deepEqual(w.plan, ['p/1', 'p/3', 'q/1']);
    const { session, si } = edited(CHAIN, { weight: '82.5 kg' });
    const r = w.evaluate([si.weight]);
    const p = session.report().cells[0].values as Record<string, unknown>;
    const q = session.report().cells[1].values as Record<string, unknown>;
    assert.ok(r.ok);
    assert.deepEqual(r.answers.map((a) => a.ok && reportQuantity(a.q)), [p.CL, q.dailyCL]);
    // hand-worked: CL = 0.2 / h * 0.7 L / kg * 82.5 kg = 11.55 L / h, shown in L / h
    near((r.answers[0] as { q: { si: number } }).q.si * HOUR * 1000, 11.55, 1e-12, 'hand-worked: CL in L / h');
  });

  it('a wanted name that is replaced, or that nothing replaced reaches, answers as it is', () => {
    const base = open(CHAIN);
    const w = prepared(base, ['weight', 'other', 'half'], ['weight']);
    assert.deepEqual(w.plan, []);
    const r = w.evaluate([90]);
    assert.deepEqual([...r.values], [90, 3 * HOUR, Math.LN2 / (0.2 / HOUR)]);
  });
});

describe('what-if: closed forms', () => {
  it('one-compartment bolus: C(6 h) = dose / V · exp(-6 k), linear in the dose', () => {
    const s = open(BOLUS);
    const w = prepared(s, ['C6'], [{ name: 'dose', dimension: 'mg' }, { name: 'k', dimension: '1 / h' }]);
    const at = (doseMg: number, kPerHour: number) => {
      const r = w.evaluate([doseMg * 1e-6, kPerHour / HOUR]);
      assert.ok(r.ok);
      return r.values[0];
    };
    for (const [dose, k] of [[100, 0.3], [250, 0.3], [40, 0.05], [100, 1.2]]) {
      // closed form: C(t) = dose / V · exp(-k t), in kg / m³ (1 mg / L = 1e-3 kg / m³)
      near(at(dose, k), (dose / 20) * 1e-3 * Math.exp(-k * 6), 1e-5, `closed form: C(6 h) with dose ${dose} mg, k ${k} / h`);
    }
    // closed form: doubling the dose doubles C(6 h) (to the run's tolerance)
    near(at(200, 0.3) / at(100, 0.3), 2, 1e-6, 'closed form: C linear in the dose');
  });

  it('the initial value of a state replaced directly', () => {
    const s = open(BOLUS);
    const w = prepared(s, ['C6', 'C'], [{ name: 'C', dimension: 'mg / L' }]);
    const r = w.evaluate([8e-3]);
    assert.ok(r.ok);
    // closed form: C(6 h) = C0 exp(-0.3 · 6)
    near(r.values[0], 8e-3 * Math.exp(-1.8), 1e-5, 'closed form: C(6 h) from C0 = 8 mg / L');
    assert.equal(r.values[1], 8e-3);
    assert.deepEqual(reportQuantity((r.answers[1] as Extract<WhatIfAnswer, { ok: true }>).q), { value: 8, unit: 'mg / L', si: 8e-3 });
  });
});

describe('what-if: no answer, and why', () => {
  it('a crossing that becomes unreached says why, as the session does', () => {
    const w = prepared(open(COOLING), ['t_40', 'T_2h', 'margin'], ['Ta']);
    const { session, si } = edited(COOLING, { Ta: '45 degC' });
    const r = w.evaluate([si.Ta]);
    assert.equal(r.ok, false);
    const [t40, t2h, margin] = r.answers;
    assert.ok(!t40.ok && t2h.ok && !margin.ok);
    const own = results(session, 'run').t_40 as { notReached: boolean; message: string };
    assert.ok(own.notReached);
    assert.equal(t40.reason, `"t_40" was ${own.message}`);
    assert.match(t40.reason, /not reached: no T falling through 40 degC by the end of the run/);
    assert.ok(Number.isNaN(r.values[0]));
    // the parameter reading it waits on the run, in the session's own words
    assert.equal(margin.reason, session.report().cells[3].error!.message);
    assert.match(margin.reason, /^waits on cell "run": "t_40" was not reached/);
    // and back: a reachable value answers again
    assert.ok(w.evaluate([293.15]).ok);
  });

  it('an upstream error (a dose divided by a volume of zero) is reported on the answers', () => {
    const w = prepared(open(SIX_DOSES), ['Cmax', 'dose'], ['V']);
    const { session } = edited(SIX_DOSES, { V: '0 L' });
    const r = w.evaluate([0]);
    const [cmax, dose] = r.answers;
    assert.ok(!cmax.ok && dose.ok);
    const error = session.report().cells[2].error!;
    assert.equal(cmax.reason, `"Cmax" has an error (${error.path}: ${error.message})`);
    assert.match(cmax.reason, /events\[0\]\.add\.C.*infinite/);
  });

  it('values that are missing or not finite are refused on every answer', () => {
    const w = prepared(open(SIX_DOSES), ['Cmax', 'auc'], ['k', 'dose']);
    for (const [values, message] of [[[1e-5], /expected 2 values \(for "k", "dose"\), got 1/], [[NaN, 1e-4], /"k" is not a finite number/], [[1e-5, Infinity], /"dose" is not a finite number/]] as const) {
      const r = w.evaluate(values);
      assert.equal(r.ok, false);
      assert.equal(r.ran, 0);
      for (const a of r.answers) assert.match((a as { reason: string }).reason, message);
    }
  });
});

describe('what-if: refusals', () => {
  const s = open(SIX_DOSES);
  const refused = (wanted: string[], replaced: Parameters<StudySession['whatIf']>[1]) => {
    const w = s.whatIf(wanted, replaced);
    assert.ok(!w.ok, 'should be refused');
    return w.error;
  };

  it('a name no cell defines, with a suggestion', () => {
    assert.deepEqual(refused(['Cmax'], ['kk']), { message: 'no cell defines "kk" (did you mean "k"?)', name: 'kk' });
    assert.match(refused(['Cmx'], ['k']).message, /no cell defines "Cmx" \(did you mean "Cmax"\?\)/);
  });

  it('a wrong dimension, or a dimension that is not a unit', () => {
    assert.deepEqual(refused(['Cmax'], [{ name: 'k', dimension: 'mg' }]), { message: '"k" is rate (per time), but its values were declared as mass ("mg")', name: 'k' });
    assert.match(refused(['Cmax'], [{ name: 'C', dimension: 'h' }]).message, /"C" is mass concentration, but its values were declared as time/);
    assert.match(refused(['Cmax'], [{ name: 'k', dimension: 'per hour' }]).message, /"per hour" \(the dimension given for "k"\) is not a unit/);
  });

  it('a computed answer, a cell, a name twice, a true/false parameter', () => {
    assert.match(refused(['auc'], ['Cmax']).message, /"Cmax" is computed by simulate cell "run"; only parameters and the initial values of states can be replaced/);
    assert.match(refused(['Cmax'], ['#law']).message, /a replaced name must be the name of a parameter or a state/);
    assert.match(refused(['#run'], ['k']).message, /a wanted name must be the name of a value/);
    assert.match(refused(['Cmax'], ['k', 'k']).message, /"k" is replaced twice/);
    const v = open({ format: 'ratebook-study', version: 1, title: 'v', cells: [{ id: 'p', kind: 'parameters', items: [{ name: 'x', value: '2' }, { name: 'ok', value: 'x > 1' }, { name: 'y', value: 'ok ? 1 : 2' }] }] });
    const w = v.whatIf(['y'], ['ok']);
    assert.ok(!w.ok && /"ok" is true\/false; only quantities can be replaced/.test(w.error.message));
  });

  it('a name without a value now', () => {
    const bad = open({ format: 'ratebook-study', version: 1, title: 'b', cells: [{ id: 'p', kind: 'parameters', items: [{ name: 'a', value: '1 m + 1 s' }, { name: 'b', value: '2 * a' }] }] });
    const w = bad.whatIf(['b'], ['a']);
    assert.ok(!w.ok && /^"a" has no value now/.test(w.error.message));
  });
});

describe('what-if: the session is left alone', () => {
  it('the report is byte-identical after thousands of what-if runs, and later edits agree with a fresh session', () => {
    const s = open(SIX_DOSES);
    const before = JSON.stringify(s.report());
    const document = JSON.stringify(s.document());
    const w = prepared(s, ['Cmax', 'trough', 'auc', 'above'], ['k', 'dose', 'C']);
    for (let i = 0; i < 3000; i++) w.evaluate([(0.02 + (i % 97) * 0.005) / HOUR, (100 + (i % 13) * 50) * 1e-6, (i % 5) * 1e-3]);
    assert.equal(JSON.stringify(s.report()), before);
    assert.equal(JSON.stringify(s.document()), document);
    // the next real edit gives what a fresh session gives
    const cell = structuredClone(s.document().cells[0]) as { items: Array<{ value: string }> };
    cell.items[2].value = '0.15 / h';
    const r = s.apply({ type: 'replace', cell: cell as never });
    assert.ok(r.ok);
    assert.deepEqual(r.rerun, ['p', 'law', 'run']);
    const fresh = edited(SIX_DOSES, { k: '0.15 / h' }).session;
    assert.equal(JSON.stringify(r.report), JSON.stringify(fresh.report()));
  });

  it('nodes not between the replaced and the wanted names are not run', () => {
    const doc = structuredClone(SIX_DOSES) as { cells: unknown[] };
    doc.cells.push(
      { id: 'p2', kind: 'parameters', items: [{ name: 'k2', value: '0.3 / h' }] },
      { id: 'law2', kind: 'rate', state: 'D', unit: 'mg / L', rate: '-k2 * D', initial: '5 mg / L' },
      { id: 'run2', kind: 'simulate', rates: ['law2'], from: '0 h', to: '12 h', find: [{ name: 'Dmax', maximum: 'D' }] },
      { id: 'uses', kind: 'parameters', items: [{ name: 'ratio', value: 'Dmax / MIC' }] },
    );
    const s = open(doc);
    const runs = new Map<string, number>();
    // the session's cell nodes (engine/session-nodes.ts), each cell's as built
    const built = (s as unknown as { built: { built: Map<string, { nodes: GraphNode[] }> } }).built.built;
    for (const { nodes } of built.values()) {
      for (const node of nodes) {
        const run = node.run;
        (node as { run: GraphNode['run'] }).run = (ctx) => {
          runs.set(node.key, (runs.get(node.key) ?? 0) + 1);
          return run(ctx);
        };
      }
    }
    const w = prepared(s, ['Cmax', 'ratio'], ['k']);
    assert.deepEqual(w.plan, ['law/law', 'run/simulate']);
    for (let i = 0; i < 5; i++) assert.equal(w.evaluate([(0.1 + i * 0.01) / HOUR]).ran, 2);
    assert.deepEqual(Object.fromEntries(runs), { 'law/law': 5, 'run/simulate': 5 });
    // a name read downstream of the replaced one but upstream of nothing wanted: MIC feeds ratio only
    const w2 = prepared(s, ['ratio'], ['MIC']);
    assert.deepEqual(w2.plan, ['uses/0']);
  });

  it('leaves out a fit whose measurements a run only draws on its plot', () => {
    // the fit observes the run's state and goes through the run, so the run reads the fit's
    // measurements (to draw them) and the fit reads the dose: re-fitting on every what-if call
    // would cost a whole fit per call for nothing the answers need
    const s = open({
      format: 'ratebook-study', version: 1, title: 'levels',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '100 mg' }, { name: 'V', value: '20 L' }, { name: 'k', value: '0.3 / h' }] },
        { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
        { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '24 h', events: [{ at: '0 h', every: '8 h', add: { C: 'dose / V' } }],
          find: [{ name: 'C_last', valueOf: 'C', at: '23 h' }] },
        { id: 'levels', kind: 'data', columns: [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }], rows: [[2, 3.1], [7, 1.2], [10, 4.0]] },
        { id: 'fit', kind: 'fit', run: 'run', data: 'levels', time: 't', observe: { C: 'C' }, estimate: [{ parameter: 'V', as: 'V_i', guess: '20 L' }] },
      ],
    });
    const w = prepared(s, ['C_last'], ['dose']);
    assert.ok(!w.plan.some((key) => key.startsWith('fit/')), w.plan.join(', '));
    // superposition of three boluses at 0, 8 and 16 h read at 23 h (closed form, common practice),
    // in SI: a dose of 250 mg is 2.5e-4 kg, V = 20 L is 0.02 m^3
    const expected = (doseKg: number) => (doseKg / 0.02) * [23, 15, 7].reduce((sum, dt) => sum + Math.exp(-0.3 * dt), 0);
    near(w.evaluate([2.5e-4]).values[0], expected(2.5e-4), 1e-6, 'C_last at 250 mg (kg / m^3)');
  });
});
