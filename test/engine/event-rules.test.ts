// Schedule events of a simulate cell as a document: an event's action, its target and amount,
// changing its action, and its optional fields. The results are valid events (the study
// format's own check) and the engine runs them as their closed forms say.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import {
  EVENT_ACTIONS, eventActionOf, eventTarget, withTarget, eventTargets, withTargetAt, withoutTargetAt, switchAction, withEventField, readStudy, runStudy,
  type Report, type ScheduleEvent,
} from '../../src/index.ts';
import { near } from './helpers.ts';

/** One compartment, C' = -k C with k = 0.5 / h, from C = 0, with one event; the level at 1 h and 3 h. */
function oneCompartment(event: ScheduleEvent) {
  return {
    format: 'ratebook-study', version: 1, title: 'events',
    cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h' }, { name: 'V', value: '10 L' }] },
      { id: 'c', kind: 'rate', state: 'C', unit: 'mg / L', rate: '-k * C', initial: '0 mg / L' },
      {
        id: 'run', kind: 'simulate', rates: ['c'], from: '0 h', to: '4 h', events: [event],
        find: [{ name: 'C1', valueOf: 'C', at: '1 h' }, { name: 'C3', valueOf: 'C', at: '3 h' }],
      },
    ],
  };
}

function levels(event: ScheduleEvent): { C1: number; C3: number } {
  const r = runStudy(oneCompartment(event));
  assert.ok(r.ok);
  const run = (r as { report: Report }).report.cells.find((c) => c.id === 'run')!;
  assert.equal(run.ok, true, JSON.stringify(run.error));
  const res = run.results as Record<string, { value: number }>;
  return { C1: res.C1.value, C3: res.C3.value };
}

function valid(event: ScheduleEvent): void {
  const read = readStudy(oneCompartment(event));
  assert.ok(read.ok);
  assert.equal(read.ok && read.cellProblems.size, 0, JSON.stringify(read.ok && [...read.cellProblems]));
}

describe('event rules', () => {
  it('reads the action and the first target of an event', () => {
    assert.deepEqual([...EVENT_ACTIONS], ['add', 'set', 'infuse']);
    assert.equal(eventActionOf({ at: '0 h', add: { C: '1' } }), 'add');
    assert.equal(eventActionOf({ at: '0 h', set: { k: '1 / h' } }), 'set');
    assert.equal(eventActionOf({ at: '0 h', for: '1 h', infuse: { C: '1' } }), 'infuse');
    assert.deepEqual(eventTarget({ at: '0 h', add: { C: '5 mg / L', D: '1' } }), ['C', '5 mg / L']);
    assert.deepEqual(eventTarget({ at: '0 h', add: {} }), ['', '']);
  });

  it('a dose becomes an infusion with the same target and a duration, and back', () => {
    const dose: ScheduleEvent = { at: '0 h', add: { C: '20 mg / L' } };
    valid(dose);
    // closed form: a bolus decays as C0 e^(-k t): 20 e^-0.5 = 12.13 mg/L at 1 h
    near(levels(dose).C1, 20 * Math.exp(-0.5), 1e-6);
    const infusion = withTarget(switchAction(dose, 'infuse'), 'C', '2 mg / L / h');
    assert.deepEqual(infusion, { at: '0 h', for: '1 h', infuse: { C: '2 mg / L / h' } });
    valid(infusion);
    // closed form: a constant input R for 1 h gives (R/k)(1 - e^-kt) at its end, 4 (1 - e^-0.5)
    // = 1.574 mg/L, which then decays: times e^(-k 2 h) at 3 h
    const { C1, C3 } = levels(infusion);
    near(C1, 4 * (1 - Math.exp(-0.5)), 1e-6);
    near(C3, 4 * (1 - Math.exp(-0.5)) * Math.exp(-1), 1e-6);
    const longer = withEventField(infusion, 'for', '2 h');
    assert.deepEqual(switchAction(longer, 'infuse'), longer, 'an infusion keeps its duration');
    assert.deepEqual(switchAction(longer, 'add'), { at: '0 h', add: { C: '2 mg / L / h' } }, 'a dose has no duration');
    assert.deepEqual(dose, { at: '0 h', add: { C: '20 mg / L' } }, 'the input is left alone');
  });

  it('a parameter change keeps its target and value when it becomes a dose, times and repeats unchanged', () => {
    const change: ScheduleEvent = { at: '1 h', every: '6 h', count: 2, set: { k: '1 / h' } };
    assert.deepEqual(switchAction(change, 'add'), { at: '1 h', every: '6 h', count: 2, add: { k: '1 / h' } });
  });

  it('renames the first target in place, keeping the others and their amounts', () => {
    const ev: ScheduleEvent = { at: '0 h', add: { C: '1 mg / L', D: '2 mg / L' } };
    assert.deepEqual(withTarget(ev, 'A', '1 mg / L'), { at: '0 h', add: { A: '1 mg / L', D: '2 mg / L' } });
    assert.deepEqual(Object.keys(withTarget(ev, 'A', '1 mg / L').add!), ['A', 'D'], 'the renamed target stays first');
    assert.deepEqual(withTarget(ev, 'C', '3 mg / L'), { at: '0 h', add: { C: '3 mg / L', D: '2 mg / L' } });
    assert.deepEqual(withTarget({ at: '0 h', set: {} }, 'k', '1 / h'), { at: '0 h', set: { k: '1 / h' } });
  });

  it('sets an optional field, and removes it when blank', () => {
    const ev: ScheduleEvent = { at: '0 h', add: { C: '20 mg / L' } };
    const repeated = withEventField(withEventField(ev, 'every', '1 h'), 'count', 3);
    assert.deepEqual(repeated, { at: '0 h', add: { C: '20 mg / L' }, every: '1 h', count: 3 });
    valid(repeated);
    // closed form: doses of 20 at 0, 1 and 2 h; at 3 h: 20 (e^-1.5 + e^-1 + e^-0.5)
    near(levels(repeated).C3, 20 * (Math.exp(-1.5) + Math.exp(-1) + Math.exp(-0.5)), 1e-6);
    assert.deepEqual(withEventField(withEventField(repeated, 'every', ''), 'count', ''), ev);
  });

  it('a count may be an expression; blank removes it', () => {
    const ev: ScheduleEvent = { at: '0 h', every: '1 h', add: { C: '20 mg / L' } };
    const counted = withEventField(ev, 'count', '2 + 1');
    valid(counted);
    // closed form: three doses as above, at 3 h
    near(levels(counted).C3, 20 * (Math.exp(-1.5) + Math.exp(-1) + Math.exp(-0.5)), 1e-6);
    assert.deepEqual(withEventField(counted, 'count', ''), ev);
  });

  it('edits every target of an event in its place, and never merges two into one', () => {
    const ev: ScheduleEvent = { at: '0 h', add: { C: '1 mg / L', D: '2 mg / L' } };
    assert.deepEqual(eventTargets(ev), [['C', '1 mg / L'], ['D', '2 mg / L']]);
    assert.deepEqual(withTargetAt(ev, 1, 'E', '2 mg / L'), { at: '0 h', add: { C: '1 mg / L', E: '2 mg / L' } });
    assert.deepEqual(withTargetAt(ev, 1, 'D', '5 mg / L'), { at: '0 h', add: { C: '1 mg / L', D: '5 mg / L' } });
    assert.equal(withTargetAt(ev, 1, 'C', '2 mg / L'), null, 'a name the other target has would lose an amount');
    assert.deepEqual(withTargetAt(ev, 2, 'F', ''), { at: '0 h', add: { C: '1 mg / L', D: '2 mg / L', F: '' } });
    assert.deepEqual(withoutTargetAt(ev, 0), { at: '0 h', add: { D: '2 mg / L' } });
    assert.deepEqual(withoutTargetAt({ at: '0 h', add: { C: '1' } }, 0), { at: '0 h', add: { C: '1' } }, 'the last target stays');
    assert.deepEqual(ev, { at: '0 h', add: { C: '1 mg / L', D: '2 mg / L' } }, 'the input is never changed');
  });
});
