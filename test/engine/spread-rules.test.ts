// A parameter's spread as a document: choosing another distribution sets the old one's typed
// figures aside and gives them back when it is chosen again. Each spread it makes holds only
// the figures its distribution takes (the study format's own check, readStudy: normal an SD,
// log-normal a CV, uniform from and to, per the study-format contract), and a figure given
// back is the text typed, never converted.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readStudy, runStudy, setAsideWords, switchSpread, type ParameterSpread, type Report, type SpreadSetAside } from '../../src/index.ts';

/** A study whose one parameter k has `spread`; the format's problems on it, by path. */
function problemsWith(spread: ParameterSpread | undefined): string[] {
  const r = readStudy({ format: 'ratebook-study', version: 1, title: 'spread', cells: [
    { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h', ...(spread ? { spread } : {}) }] }] });
  assert.ok(r.ok);
  return [...r.cellProblems.values()].flat().map((p) => `${p.path}: ${p.message}`);
}

describe('switchSpread', () => {
  it('arrowing normal → log-normal → uniform → log-normal → normal gives the SD typed back, each step a spread the format accepts', () => {
    let spread: ParameterSpread | undefined = { distribution: 'normal', sd: '0.05 / h' };
    let aside: SpreadSetAside = {};
    const seen: Array<ParameterSpread | undefined> = [];
    for (const to of ['lognormal', 'uniform', 'lognormal', 'normal']) {
      ({ spread, aside } = switchSpread(spread, to, aside));
      seen.push(spread);
    }
    assert.deepEqual(seen, [
      { distribution: 'lognormal', cv: '' }, { distribution: 'uniform', from: '', to: '' },
      { distribution: 'lognormal', cv: '' }, { distribution: 'normal', sd: '0.05 / h' }]);
    // blank figures are the user's to fill in (a problem on the figure, never a leftover of another distribution)
    for (const s of seen) assert.ok(problemsWith(s).every((p) => !p.includes('is not a figure')), JSON.stringify(s));
    assert.deepEqual(aside, {});
    // the spread given back runs as the one typed
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 'spread', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.5 / h', spread: spread! }] }] });
    assert.ok(r.ok);
    const p = (r as { report: Report }).report.cells[0] as { values?: Record<string, { spread?: { text: string } }> };
    assert.equal(p.values?.k.spread?.text, '0.5 /h ± 0.05 /h');
  });

  it('a CV and a range come back as typed; none removes the spread and keeps its figures aside, said in words', () => {
    let { spread, aside } = switchSpread({ distribution: 'lognormal', cv: 0.2 }, 'uniform', {});
    spread = { distribution: 'uniform', from: '0.4 / h', to: '0.6 / h' };
    ({ spread, aside } = switchSpread(spread, '', aside));
    assert.equal(spread, undefined);
    assert.equal(setAsideWords(aside, undefined),
      'Set aside, not used (choose one again to have its figures back): log-normal, CV 0.2; uniform, from 0.4 / h to 0.6 / h.');
    ({ spread, aside } = switchSpread(spread, 'lognormal', aside));
    assert.deepEqual(spread, { distribution: 'lognormal', cv: 0.2 });
    ({ spread, aside } = switchSpread(spread, 'uniform', aside));
    assert.deepEqual(spread, { distribution: 'uniform', from: '0.4 / h', to: '0.6 / h' });
    assert.equal(setAsideWords(aside, 'uniform'), 'Set aside, not used (choose it again to have its figures back): log-normal, CV 0.2.');
  });

  it('blank figures are not set aside; choosing the distribution it has changes nothing; after an undo the current one is not said', () => {
    const blank = switchSpread({ distribution: 'normal', sd: '  ' }, 'uniform', {});
    assert.deepEqual(blank.aside, {});
    const same: ParameterSpread = { distribution: 'normal', sd: '1 / h' };
    assert.equal(switchSpread(same, 'normal', {}).spread, same);
    assert.equal(setAsideWords({ normal: { sd: '1 / h' } }, 'normal'), '');
  });
});

describe('a spread of a distribution named like an object property', () => {
  it('is a problem on its distribution, not a crash', () => {
    for (const d of ['constructor', 'toString', '__proto__']) {
      const problems = problemsWith({ distribution: d, sd: '1 / h' } as unknown as ParameterSpread);
      assert.ok(problems.some((p) => p.startsWith('cells[0].items[0].spread.distribution')), `${d}: ${problems.join('; ')}`);
    }
  });
});
