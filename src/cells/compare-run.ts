/**
 * Running a compare cell: each scenario's values read and checked, the run's answers under
 * them by the what-if evaluator, its curves by the run's model, and the report: scenarios,
 * one overlay plot, the names `<question>_<scenario>`.
 */
import type { Binding, Outcome, RunContext, RunModel } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { CompareScenarioReport, ComparePlot, FindResult, NodeOutput, ReportQuantity } from '../engine/report.ts';
import type { WhatIfPrepared } from '../engine/what-if.ts';
import { type Field, fail, finiteQuantityOf, lookupFrom } from './fields.ts';
import { quantitySig } from './signatures.ts';
import { type Quantity, describe, report } from '../units/quantity.ts';
import { sameDim, describeDim, TIME } from '../units/dimension.ts';
import { comparePlot, type ScenarioCurve } from './compare-plot.ts';

/** Points per curve on the overlay chart (more land where the run has pieces). */
export const COMPARE_PLOT_POINTS = 200;

/** One scenario as the builder parsed it. */
export interface ScenarioFields {
  readonly name: string;
  /** `cells[i].scenarios[j]` (relative: `@.scenarios[j]`). */
  readonly path: string;
  readonly entries: ReadonlyArray<{ readonly name: string; readonly value: Field | undefined }>;
}

type Valued = Extract<Binding, { kind: 'value' | 'state' }>;

/** The scenario's values in SI, checked against the names they replace (on their fields). */
function scenarioValues(s: ScenarioFields, ctx: RunContext): Array<{ name: string; q: Quantity }> {
  const lookup = lookupFrom(ctx);
  return s.entries.map((e) => {
    const path = `${s.path}.set.${e.name}`;
    const b = ctx.binding(e.name) as Binding | undefined;
    if (b?.kind !== 'value' && b?.kind !== 'state') fail(`${s.path}.set`, `"${e.name}" is not a value that a scenario can set: name a parameter, or a state (its initial value)`);
    const target = b as Valued;
    if (target.kind === 'value' && target.truth !== undefined) fail(`${s.path}.set`, `"${e.name}" is true/false; a scenario sets quantities`);
    const q = finiteQuantityOf(e.value!, lookup);
    if (!sameDim(q.dim, target.q.dim)) {
      fail(path, `${e.name} is ${describeDim(target.q.dim)} (${describe(target.q)}), so its value must be too; ${e.value!.text} is ${describeDim(q.dim)}`, 'unit');
    }
    return { name: e.name, q };
  });
}

export function runCompare(at: string, run: string, questions: readonly string[], scenarios: readonly ScenarioFields[], ctx: RunContext): Outcome<NodeOutput<'compare'>> {
  if (ctx.mode === 'check') return { ok: true, bindings: new Map(), output: { computed: false, message: 'checked; run the study to compare' } };
  const b = ctx.binding(cellRef(run));
  if (b?.kind !== 'model') fail(`${at}.run`, `cell "${run}" is not a run: a comparison runs a simulate cell again`);
  const model: RunModel = b.model;
  if (!ctx.whatIf) fail(at, 'this cell cannot vary values here (no what-if evaluation is available)', 'internal');
  // what the curves need: the names the run reads directly, and its states' starting values
  const inputs = [...model.reads, ...model.laws.map((l) => l.state)];
  const wanted = [...questions, ...inputs];
  const read = scenarios.map((s) => scenarioValues(s, ctx));

  const prepared = new Map<string, WhatIfPrepared>();
  const bindings = new Map<string, Binding>();
  const reasons = new Map<string, string>();
  const reports: CompareScenarioReport[] = [];
  const curves: ScenarioCurve[] = [];
  const end = report({ si: model.to, dim: TIME, unit: model.timeUnit });
  let evaluations = 0;

  scenarios.forEach((s, j) => {
    const values = read[j];
    const key = values.map((v) => v.name).join(',');
    let p = prepared.get(key);
    if (!p) {
      p = ctx.whatIf!(wanted, values.map((v) => v.name));
      if (!p.ok) fail(`${s.path}.set`, p.error.message);
      prepared.set(key, p);
    }
    if (!p.ok) return;
    evaluations++;
    const r = p.evaluate(values.map((v) => v.q.si));
    const set: Record<string, ReportQuantity> = Object.fromEntries(values.map((v) => [v.name, report(v.q)]));
    const results: Record<string, FindResult> = {};
    questions.forEach((q, i) => {
      const a = r.answers[i];
      const name = `${q}_${s.name}`;
      if (a.ok) {
        results[q] = report(a.q);
        bindings.set(name, { kind: 'value', q: a.q, sig: quantitySig(a.q) });
      } else {
        results[q] = { notReached: true, message: a.reason, end };
        reasons.set(name, `under scenario "${s.name}": ${a.reason}`);
      }
    });
    const replaced = new Map<string, number>();
    r.answers.slice(questions.length).forEach((a) => { if (a.ok) replaced.set(a.name, a.si); });
    const missing = r.answers.slice(questions.length).find((a) => !a.ok);
    const curve = missing && !missing.ok ? { message: missing.reason } : model.curve(replaced, COMPARE_PLOT_POINTS, true);
    if (!curve.t || !curve.values) {
      reports.push({ name: s.name, ok: false, results, set, message: curve.message ?? 'the run gave no curve' });
      return;
    }
    curves.push({ scenario: s.name, replaced, t: curve.t, values: curve.values });
    reports.push({ name: s.name, ok: true, results, set });
  });

  const plot: ComparePlot = comparePlot(model, curves);
  return {
    ok: true,
    bindings,
    reasons,
    output: { scenarios: reports, plot, questions: [...questions], evaluations, summary: summaryOf(reports, questions) },
  };
}

/** `t_1pct: 23 min (slow), 11.5 min (fast)`, for the first question; the scenarios alone without one. */
function summaryOf(reports: readonly CompareScenarioReport[], questions: readonly string[]): string {
  const head = `${reports.length} scenario${reports.length === 1 ? '' : 's'} of the run`;
  const q = questions[0];
  if (q === undefined) return `${head}: ${reports.map((r) => r.name).join(', ')}`;
  const each = reports.map((r) => {
    const a = r.results[q];
    return `${a && !('notReached' in a) ? `${formatReport(a)}` : 'not reached'} (${r.name})`;
  });
  return `${head}; ${q}: ${each.join(', ')}`;
}

function formatReport(q: ReportQuantity): string {
  const v = Number(q.value.toPrecision(4));
  return q.unit ? `${v} ${q.unit}` : String(v);
}
