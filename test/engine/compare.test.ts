// The compare cell against closed forms and against real edits of the study: a tank flushed
// with clean water, C' = -(Q/V) C, reaches 1% of its start at t = V/Q ln 100 for each flow Q
// (closed form of the first-order washout); each scenario's answers equal those of the study
// edited to the scenario's values; and its refusals, each on its field. Invented numbers.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { openStudy, type ReportOf, type StudySession, type FindResult } from '../../src/index.ts';
import { near } from './helpers.ts';

const MIN = 60;

/** A 2,000 L tank flushed at Q, its concentration from 40 mg/L. Invented numbers. */
function flush(Q = '100 L / min', extra: object[] = []) {
  return {
    format: 'ratebook-study', version: 1, title: 'flush',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'V', value: '2000 L' }, { name: 'Q', value: Q }, { name: 'C0', value: '40 mg / L' }] },
      { id: 'tank', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-(Q / V) * C', initial: 'C0' },
      { id: 'run', kind: 'simulate', rates: ['tank'], from: '0 min', to: '240 min',
        find: [{ name: 't_1pct', crossing: 'C', level: '0.01 * C0', direction: 'down' }, { name: 'C_30', valueOf: 'C', at: '30 min' }] },
      ...extra,
    ],
  };
}

const SCENARIOS = [
  { name: 'slow', set: { Q: '50 L / min' } },
  { name: 'usual', set: {} },
  { name: 'fast', set: { Q: '200 L / min' } },
];

function open(doc: unknown): StudySession {
  const o = openStudy(structuredClone(doc));
  assert.ok(o.ok, o.ok ? '' : o.error.message);
  return o.session;
}

function compareOf(cell: object, Q?: string): { r: ReportOf<'compare'>; s: StudySession } {
  const s = open(flush(Q, [{ id: 'cmp', kind: 'compare', run: 'run', ...cell }]));
  return { r: s.report().cells.find((c) => c.id === 'cmp') as ReportOf<'compare'>, s };
}

const si = (x: FindResult | undefined) => {
  assert.ok(x && !('notReached' in x), JSON.stringify(x));
  return x.si;
};

describe('compare: closed forms and real edits', () => {
  it('flush to 1%: t = V/Q ln 100 for each Q, and C at 30 min = C0 e^(-Q·30 min/V)', () => {
    const { r } = compareOf({ scenarios: SCENARIOS });
    assert.ok(r.ok, JSON.stringify(r.error));
    assert.deepEqual(r.scenarios!.map((x) => [x.name, x.ok]), [['slow', true], ['usual', true], ['fast', true]]);
    for (const [name, q] of [['slow', 50], ['usual', 100], ['fast', 200]] as const) {
      const sc = r.scenarios!.find((x) => x.name === name)!;
      // closed form of the washout: C = C0 e^(-Q t / V)
      near(si(sc.results.t_1pct), (2000 / q) * Math.log(100) * MIN, 1e-5, `t_1pct (${name})`);
      near(si(sc.results.C_30), 40e-3 * Math.exp((-q * 30) / 2000), 1e-5, `C_30 (${name}), SI kg/m³`);
    }
    assert.equal(r.evaluations, 3);
    assert.deepEqual(r.questions, ['t_1pct', 'C_30']);
    // one curve per scenario (named by it: the run has one state), each starting at C0 = 40 mg/L
    assert.deepEqual(r.plot!.series, [{ scenario: 'slow', state: 'C' }, { scenario: 'usual', state: 'C' }, { scenario: 'fast', state: 'C' }]);
    assert.deepEqual(r.plot!.states.map((x) => x.name), ['slow', 'usual', 'fast']);
    const t = r.plot!.t;
    near(t[t.length - 1], 240, 1e-12, 'end time in min');
    for (const x of r.plot!.states) {
      assert.equal(x.unit, 'mg / L');
      near(x.values[0], 40, 1e-12, 'start');
      // closed form at the end of the run: 40 e^(-Q·240 min/V) mg/L, within the run's tolerance
      // (rtol 1e-6; near 0 its absolute tolerance rules: 1e-6 of C0 allowed)
      const q = { slow: 50, usual: 100, fast: 200 }[x.name]!;
      const end = x.values[x.values.length - 1];
      assert.ok(Math.abs(end - 40 * Math.exp((-q * 240) / 2000)) < 40e-6, `end (${x.name}): ${end}`);
    }
    assert.equal(r.plot!.timeUnit, 'min');
  });

  it('each scenario answers exactly what a real edit of the study answers', () => {
    const { r } = compareOf({ scenarios: SCENARIOS });
    for (const [name, Q] of [['slow', '50 L / min'], ['fast', '200 L / min'], ['usual', '100 L / min']] as const) {
      const edited = open(flush(Q)).report().cells.find((c) => c.id === 'run') as ReportOf<'simulate'>;
      const sc = r.scenarios!.find((x) => x.name === name)!;
      assert.deepEqual(sc.results, edited.results, `scenario ${name}`);
    }
  });

  it('defines <question>_<scenario> downstream, and a reader follows an edit of the scenario', () => {
    const reader = { id: 'q', kind: 'parameters', items: [{ name: 'gain', value: 't_1pct_slow / t_1pct_fast' }] };
    const s = open(flush(undefined, [{ id: 'cmp', kind: 'compare', run: 'run', scenarios: SCENARIOS }, reader]));
    const gain = () => (s.report().cells.find((c) => c.id === 'q') as ReportOf<'parameters'>).values!.gain.si;
    // closed form: t ∝ 1/Q, so the ratio is 200/50 = 4
    near(gain(), 4, 1e-5, 'slow over fast');
    const r = s.apply({ type: 'replace', cell: { id: 'cmp', kind: 'compare', run: 'run', scenarios: [{ name: 'slow', set: { Q: '40 L / min' } }, SCENARIOS[2]] } });
    assert.ok(r.ok);
    near(gain(), 5, 1e-5, 'slow over fast after the edit (200/40)');
  });

  it('scenarios with different dosing intervals share one time axis, each jump drawn at its own time', () => {
    const doc = {
      format: 'ratebook-study', version: 1, title: 'intervals',
      cells: [
        { id: 'p', kind: 'parameters', items: [{ name: 'dose', value: '500 mg' }, { name: 'V', value: '50 L' }, { name: 'k', value: '0.1 / h' }, { name: 'tau', value: '8 h' }] },
        { id: 'law', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
        { id: 'run', kind: 'simulate', rates: ['law'], from: '0 h', to: '24 h', events: [{ at: '0 h', every: 'tau', add: { C: 'dose / V' } }],
          find: [{ name: 'Cmax', maximum: 'C' }] },
        { id: 'cmp', kind: 'compare', run: 'run', scenarios: [{ name: 'q8', set: {} }, { name: 'q12', set: { tau: '12 h' } }] },
      ],
    };
    const r = open(doc).report().cells.find((c) => c.id === 'cmp') as ReportOf<'compare'>;
    assert.ok(r.ok, JSON.stringify(r.error));
    const { t, states } = r.plot!;
    const [q8, q12] = states;
    assert.ok(t.every((x, i) => i === 0 || x >= t[i - 1]), 'times in order');
    assert.ok([...q8.values, ...q12.values].every(Number.isFinite));
    // at 8 h: the q8 run jumps by dose/V = 10 mg/L (two entries), the q12 run does not
    const at8 = t.flatMap((x, i) => (x === 8 ? [i] : []));
    assert.equal(at8.length, 2);
    near(q8.values[at8[1]] - q8.values[at8[0]], 10, 1e-9, 'q8 jump at 8 h (mg/L)');
    near(q12.values[at8[1]], q12.values[at8[0]], 1e-12, 'q12 at 8 h');
    // closed form: q12 at 8 h is 10 e^(-0.8) mg/L (one dose at 0 h)
    near(q12.values[at8[0]], 10 * Math.exp(-0.8), 1e-5, 'q12 at 8 h (mg/L)');
  });

  it('a crossing not reached in one scenario is said there, and its name waits with the reason', () => {
    const { r } = compareOf({ scenarios: [{ name: 'trickle', set: { Q: '20 L / min' } }, { name: 'fast', set: { Q: '200 L / min' } }] });
    assert.ok(r.ok, JSON.stringify(r.error));
    const trickle = r.scenarios![0].results.t_1pct;
    assert.ok(trickle && 'notReached' in trickle);
    assert.equal(r.scenarios![0].ok, true);
    assert.ok('si' in r.scenarios![1].results.t_1pct);
  });

  it('the run\'s questions edited: the compare cell is built again with the new names', () => {
    const s = open(flush(undefined, [{ id: 'cmp', kind: 'compare', run: 'run', scenarios: SCENARIOS }]));
    const doc = flush();
    const run = { ...doc.cells[2], find: [{ name: 'C_60', valueOf: 'C', at: '60 min' }] };
    assert.ok(s.apply({ type: 'replace', cell: run }).ok);
    const r = s.report().cells.find((c) => c.id === 'cmp') as ReportOf<'compare'>;
    assert.deepEqual(r.questions, ['C_60']);
    // closed form: 40 e^(-50·60/2000) mg/L
    near(si(r.scenarios![0].results.C_60), 40e-3 * Math.exp(-1.5), 1e-5, 'C_60 slow (kg/m³)');
  });
});

describe('compare: bad input, each on its field', () => {
  const first = (cell: object) => {
    const { r } = compareOf(cell);
    assert.equal(r.ok, false);
    return `${r.error!.path}: ${r.error!.message}`;
  };

  it('a scenario naming an unknown parameter, with "did you mean"', () => {
    assert.match(first({ scenarios: [{ name: 'a', set: { q: '5 L / min' } }] }), /^cells\[3\]\.scenarios\[0\]\.set: .*did you mean "Q"/);
  });

  it('a value of the wrong dimension, on its own field', () => {
    assert.match(first({ scenarios: [{ name: 'a', set: { Q: '5 L' } }] }), /^cells\[3\]\.scenarios\[0\]\.set\.Q: Q is volume per time .*5 L is volume/);
  });

  it('a name computed by another cell cannot be set', () => {
    assert.match(first({ scenarios: [{ name: 'a', set: { C_30: '5 mg / L' } }] }), /^cells\[3\]\.scenarios\[0\]\.set: .*only parameters and the initial values of states can be replaced/);
  });

  it('duplicate scenario names, and a name that cannot end a name', () => {
    assert.equal(first({ scenarios: [{ name: 'a', set: {} }, { name: 'a', set: {} }] }), 'cells[3].scenarios[1].name: the scenario name "a" is used twice');
    assert.match(first({ scenarios: [{ name: 'big pump', set: {} }] }), /^cells\[3\]\.scenarios\[0\]\.name: "big pump" cannot end a name/);
  });

  it('a run that is not a simulate cell, or no cell at all', () => {
    assert.match(first({ run: 'tank', scenarios: SCENARIOS }), /^cells\[3\]\.run: cell "tank" is not a run/);
    assert.match(first({ run: 'rn', scenarios: SCENARIOS }), /^cells\[3\]\.run: there is no cell "rn" \(did you mean "run"\?\)/);
  });
});
