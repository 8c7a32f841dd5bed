// "Did you mean": the nearest defined name to an unknown one. Every name a study defines is a
// candidate, whatever defines it: parameters, states, a run's answers, a fit's estimates, a
// profile summary's results; in every field that reads names, and in the what-if evaluator.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { distance, nearest } from '../../src/expression/suggest.ts';
import { openStudy, runStudy } from '../../src/index.ts';
import { cell } from './helpers.ts';

const example = (name: string) => JSON.parse(readFileSync(new URL(`../../examples/${name}.ratebook.json`, import.meta.url), 'utf8'));

describe('the edit distance', () => {
  it('counts insertions, deletions, substitutions and adjacent swaps as one edit each', () => {
    // hand-worked: kfit → k_fit inserts "_"; k_fti → k_fit swaps "it"; k_fot → k_fit swaps o for i
    assert.equal(distance('kfit', 'k_fit'), 1);
    assert.equal(distance('k_fti', 'k_fit'), 1);
    assert.equal(distance('k_fot', 'k_fit'), 1);
    // hand-worked: kitten → sitting is 3 (k→s, e→i, +g), the classic example
    assert.equal(distance('kitten', 'sitting'), 3);
  });

  it('suggests within a third of the name, and nothing further off', () => {
    assert.equal(nearest('C0_fti', ['C0_fit', 'k_fit', 'V']), 'C0_fit');
    assert.equal(nearest('zzzz', ['C0_fit', 'k_fit']), undefined);
  });
});

/** The plasma template with one more cell whose field reads `text`. */
function withReader(reader: Record<string, unknown>) {
  const doc = example('plasma-levels');
  doc.cells.push(reader);
  return runStudy(doc);
}

describe('a name close to a fit\'s estimate', () => {
  const typos: Array<[string, string]> = [['k_fti', 'k_fit'], ['C0fit', 'C0_fit'], ['K_FIT', 'k_fit'], ['C0_fi', 'C0_fit']];

  for (const [typo, meant] of typos) {
    it(`"${typo}" in a parameter's value suggests "${meant}"`, () => {
      const r = withReader({ id: 'typo', kind: 'parameters', items: [{ name: 'z', value: `2 * ${typo}` }] });
      assert.ok(r.ok);
      assert.equal(cell(r.report, 'typo').error?.message, `unknown name "${typo}" (did you mean "${meant}"?)`);
    });
  }

  it('is suggested in a rate law, a run\'s level and another fit\'s guess too', () => {
    const r = withReader({ id: 'typo', kind: 'rate', state: 'D', unit: 'mg / L', rate: '-k_fti * D', initial: '1 mg / L' });
    assert.ok(r.ok);
    assert.equal(cell(r.report, 'typo').error?.message, 'unknown name "k_fti" (did you mean "k_fit"?)');
    const run = withReader({ id: 'typo', kind: 'simulate', rates: ['plasma'], from: '0 h', to: '12 h', find: [{ name: 'tc', crossing: 'Cp', level: 'C0_fti / 2' }] });
    assert.ok(run.ok);
    assert.equal(cell(run.report, 'typo').error?.message, 'unknown name "C0_fti" (did you mean "C0_fit"?)');
  });

  it('is suggested by the what-if evaluator', () => {
    const session = openStudy(example('plasma-levels'));
    assert.ok(session.ok);
    const w = session.session.whatIf(['V_fi'], ['dose']);
    assert.ok(!w.ok);
    assert.equal(w.error.message, 'no cell defines "V_fi" (did you mean "V_fit"?)');
  });
});

describe('a name close to a profile summary\'s result or a run\'s answer', () => {
  it('suggests them like any other name', () => {
    const doc = example('plasma-levels');
    const nca = doc.cells.find((c: { kind: string }) => c.kind === 'nca');
    const prefix = nca.prefix ?? '';
    doc.cells.push({ id: 'typo', kind: 'parameters', items: [{ name: 'z', value: `2 * ${prefix}AUCinff` }] });
    const r = runStudy(doc);
    assert.ok(r.ok);
    assert.equal(cell(r.report, 'typo').error?.message, `unknown name "${prefix}AUCinff" (did you mean "${prefix}AUCinf"?)`);

    const bolus = example('iv-bolus-repeated');
    bolus.cells.push({ id: 'typo', kind: 'parameters', items: [{ name: 'z', value: 'Cmxa / 2' }] });
    const b = runStudy(bolus);
    assert.ok(b.ok);
    assert.equal(cell(b.report, 'typo').error?.message, 'unknown name "Cmxa" (did you mean "Cmax"?)');
  });
});
