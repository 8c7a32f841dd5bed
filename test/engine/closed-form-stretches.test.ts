// A run whose law changes within it (a `set` of the parameters the law reads) reports and says
// its exact solution stretch by stretch, each with its own figures, never the first stretch's
// figures as the whole run's (the two-stage cooling template read "settles toward 24 degC"
// while the run ended in a 3 degC walk-in).
//
// Own derivation, Newton cooling in two stages, T' = -k (T - Ta):
//   on the bench, 0 <= t <= tm:  T(t) = Ta + (T0 - Ta) e^(-k t)
//   in the walk-in, t >= tm:     T(t) = Tc + (Tm - Tc) e^(-kc (t - tm)),  Tm = T(tm) from the first
// each stretch's rate constant is -k, its time constant 1/k, its half-life ln 2 / k and its
// equilibrium the air's temperature (Ta, then Tc).
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { runStudy, closedFormWords, type ClosedFormReport, type Study } from '../../src/index.ts';

const H = 3600, K = 273.15;
const template = JSON.parse(readFileSync(new URL('../../examples/two-stage-cooling-check.ratebook.json', import.meta.url), 'utf8')) as Study;
// the template's own figures: 57 degC at the start, 0.5 /h in 24 degC air, moved at 30 min into 3 degC air at 0.8 /h, run to 8 h
const T0 = 57 + K, Ta = 24 + K, k = 0.5 / H, tm = 0.5 * H, Tc = 3 + K, kc = 0.8 / H;
const Tm = Ta + (T0 - Ta) * Math.exp(-k * tm);
const exact = (t: number) => (t <= tm ? Ta + (T0 - Ta) * Math.exp(-k * t) : Tc + (Tm - Tc) * Math.exp(-kc * (t - tm)));

function run(study: Study) {
  const r = runStudy(study);
  if (!r.ok) throw new Error(r.error.message);
  const cell = r.report.cells.find((c) => c.id === 'run') as { ok: boolean; closedForm?: Record<string, ClosedFormReport>; results: Record<string, { si: number }> };
  assert.ok(cell.ok);
  return cell;
}

const near = (got: number, want: number, rel: number, what: string) => assert.ok(Math.abs(got - want) <= rel * Math.abs(want), `${what}: ${got} against ${want}`);

test('two-stage cooling: each stretch has its own rate constant, time constant, half-life and equilibrium', () => {
  const cell = run(template);
  const cf = cell.closedForm!.T;
  // the run's answers follow the closed form above (the run's tolerance, relative 1e-6)
  near(cell.results.T_at_stage1.si, exact(2 * H), 1e-6, 'T at 2 h');
  near(cell.results.T_at_total.si, exact(6 * H), 1e-6, 'T at 6 h');
  assert.ok(cf.maxError.si < 1e-3, `the run differs from the exact piecewise solution by ${cf.maxError.si} K`);
  const s = cf.stretches!;
  assert.equal(s.length, 2, 'bench, then walk-in');
  const want = [
    { from: 0, to: tm, k, air: Ta },
    { from: tm, to: 8 * H, k: kc, air: Tc },
  ];
  want.forEach((w, i) => {
    near(s[i].from.si, w.from, 1e-12, `stretch ${i} from`);
    near(s[i].to.si, w.to, 1e-12, `stretch ${i} to`);
    near(s[i].rateConstant.si, -w.k, 1e-9, `stretch ${i} rate constant`);
    near(s[i].timeConstant!.si, 1 / w.k, 1e-9, `stretch ${i} time constant`);
    near(s[i].halfLife!.si, Math.LN2 / w.k, 1e-9, `stretch ${i} half-life`);
    near(s[i].equilibrium!.si, w.air, 1e-9, `stretch ${i} equilibrium`);
    assert.equal(s[i].stable, true);
  });
  assert.equal(s[1].equilibrium!.unit, 'degC');
  // the contract's own fields stay the figures at the start
  near(cf.rateConstant.si, -k, 1e-9, 'rate constant at the start');
  near(cf.equilibrium!.si, Ta, 1e-9, 'equilibrium at the start');
});

test('two-stage cooling: the words go stretch by stretch with the figures of each', () => {
  const words = closedFormWords('T', run(template).closedForm!.T);
  assert.match(words, /stretch by stretch/);
  assert.match(words, /from 0 h to 0\.5 h, rate constant -0\.5 \/h, time constant 2 h, half-life 1\.386 h, settling toward 24 degC/);
  assert.match(words, /from 0\.5 h to 8 h, rate constant -0\.8 \/h, time constant 1\.25 h, half-life 0\.8664 h, settling toward 3 degC/);
  assert.match(words, /differs from the exact piecewise solution by at most/);
});

test('one law over the whole run, doses or not, is one stretch: no stretches, one set of figures', () => {
  const still = structuredClone(template);
  const runCell = still.cells.find((c) => c.id === 'run') as { events: unknown[] };
  runCell.events = [];
  const cf = run(still).closedForm!.T;
  assert.equal(cf.stretches, undefined);
  // stayed on the bench: T(t) = Ta + (T0 - Ta) e^(-k t), toward Ta
  near(cf.equilibrium!.si, Ta, 1e-9, 'equilibrium');
  assert.match(closedFormWords('T', cf), /^Exact solution \(T linear in itself\): rate constant -0\.5 \/h, time constant 2 h, half-life 1\.386 h, settling toward 24 degC; this run differs from it by at most /);
  // a jump in the state (an `add`) changes where the state is, not its law
  runCell.events = [{ at: '1 h', add: { T: '-5 K' } }];
  assert.equal(run(still).closedForm!.T.stretches, undefined);
});
