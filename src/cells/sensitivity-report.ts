/**
 * A sensitivity cell's report from its slopes: each coefficient as a quantity in the simplest
 * unit of of's unit over the parameter's, the normalized coefficient (null for an absolute
 * temperature on either side, or where of is 0), the ranking by |normalized| and a summary.
 */
import type { NodeOutput, SensitivityEntry } from '../engine/report.ts';
import { type Quantity, deltaUnit, formatNumber, report, shownUnit } from '../units/quantity.ts';
import { divDim, TEMPERATURE, sameDim } from '../units/dimension.ts';
import { mulUnits } from '../units/units.ts';
import { type StudyUnits, simplestUnit } from '../units/simplest-unit.ts';
import type { SlopeHow } from '../numerics/slopes.ts';

/** A name followed (`of`) or varied (`parameters`), with its present value. */
export interface Followed { readonly name: string; readonly q: Quantity }
export type Varied = Followed;

export interface SlopeTable {
  readonly followed: readonly Followed[];
  readonly varied: readonly Varied[];
  /** depends[i][j]: of i is computed from parameter j (or is it). */
  readonly depends: readonly (readonly boolean[])[];
  /** nOf×nParameters, row-major, SI per SI. */
  readonly d: Float64Array;
  readonly how: readonly SlopeHow[];
  /** Why a slope failed, by its index in `d`. */
  readonly reasons: ReadonlyMap<number, string>;
  readonly evaluations: number;
  readonly accuracy: number;
  readonly studyUnits?: StudyUnits;
}

/** A temperature read on a scale (a point, or kelvin serving as one): its ratio depends on the scale. */
const onScale = (q: Quantity) => sameDim(q.dim, TEMPERATURE) && q.temp !== 'delta';

/** The coefficient's unit: of's over the parameter's (a temperature reading counts as a difference), in the simplest form. */
function coefficientOf(o: Followed, p: Varied, si: number, studyUnits?: StudyUnits): Quantity {
  const unitOf = (q: Quantity) => (q.temp === 'point' ? deltaUnit(shownUnit(q)) : shownUnit(q));
  const dim = divDim(o.q.dim, p.q.dim);
  const unit = mulUnits(unitOf(o.q), unitOf(p.q), -1);
  const q: Quantity = { si, dim, unit };
  const shown = studyUnits ? { ...q, unit: simplestUnit(q.unit, dim, studyUnits) } : q;
  return sameDim(dim, TEMPERATURE) ? { ...shown, temp: 'delta' } : shown;
}

function entryOf(t: SlopeTable, i: number, j: number): SensitivityEntry {
  const o = t.followed[i], p = t.varied[j];
  if (!t.depends[i][j]) {
    return {
      coefficient: report(coefficientOf(o, p, 0, t.studyUnits)),
      normalized: 0,
      note: `${o.name} does not depend on ${p.name}: changing ${p.name} cannot change it`,
    };
  }
  const k = i * t.varied.length + j;
  const slope = t.d[k];
  if (t.how[k] === 'failed' || !Number.isFinite(slope)) {
    return { coefficient: null, normalized: null, note: `no slope: ${t.reasons.get(k) ?? 'the runs gave no value'}` };
  }
  const entry: SensitivityEntry = { coefficient: report(coefficientOf(o, p, slope, t.studyUnits)), normalized: null };
  if (t.how[k] === 'forward') entry.oneSided = 'above';
  if (t.how[k] === 'backward') entry.oneSided = 'below';
  const sideNote = entry.oneSided ? `one-sided: ${o.name} has no value on the other side of the present ${p.name}` : undefined;
  if (onScale(o.q) || onScale(p.q)) {
    const which = onScale(p.q) ? p.name : o.name;
    entry.note = [`no normalized value: ${which} is a temperature on a scale, whose ratio depends on the scale; its coefficient per kelvin is what counts`, sideNote].filter(Boolean).join('; ');
    return entry;
  }
  if (o.q.si === 0) {
    entry.note = [`no normalized value: ${o.name} is 0 now`, sideNote].filter(Boolean).join('; ');
    return entry;
  }
  entry.normalized = (slope * p.q.si) / o.q.si;
  if (sideNote) entry.note = sideNote;
  return entry;
}

/** 1 part in N, N a power of ten (grouped by thousands): a relative accuracy as people say it. */
function onePartIn(relative: number): string {
  const n = 10 ** Math.round(-Math.log10(relative));
  return `1 part in ${n.toLocaleString('en-US')}`;
}

/**
 * A slope's accuracy in words: the central difference with the step of slopes.ts is good to
 * about eps^(2/3) relative, eps the runs' relative accuracy (Nocedal & Wright, §8.1).
 */
export function slopeAccuracyWords(accuracy: number): string {
  return `each slope is good to about ${onePartIn(accuracy ** (2 / 3))} (the runs taken as good to ${onePartIn(accuracy)})`;
}

/** The report of a sensitivity cell. Cost: O(nOf·nParameters). */
export function sensitivityOutput(t: SlopeTable): NodeOutput<'sensitivity'> {
  const results: Record<string, Record<string, SensitivityEntry>> = {};
  const pairs: Array<{ of: string; parameter: string; size: number; order: number }> = [];
  t.followed.forEach((o, i) => {
    const row: Record<string, SensitivityEntry> = {};
    t.varied.forEach((p, j) => {
      const e = entryOf(t, i, j);
      row[p.name] = e;
      pairs.push({ of: o.name, parameter: p.name, size: e.normalized === null ? -1 : Math.abs(e.normalized), order: pairs.length });
    });
    results[o.name] = row;
  });
  const ranking = [...pairs].sort((a, b) => b.size - a.size || a.order - b.order).map(({ of, parameter }) => ({ of, parameter }));
  const top = ranking[0] && results[ranking[0].of][ranking[0].parameter];
  const summary = top && top.normalized !== null && top.normalized !== 0
    ? `${ranking[0].of} moves most with ${ranking[0].parameter}: ${formatNumber(Math.abs(top.normalized), 3)}% for 1% of ${ranking[0].parameter} (${top.normalized > 0 ? 'the same way' : 'the other way'})`
    : `no normalized slope to rank${ranking.length ? '' : ': nothing to follow'}`;
  return { results, ranking, accuracy: t.accuracy, accuracyWords: slopeAccuracyWords(t.accuracy), evaluations: t.evaluations, summary };
}
