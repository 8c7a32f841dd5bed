/**
 * A parameter's spread (the `spread` field of a parameters item): read, checked against the
 * value, turned into the binding's `InputSpread` (SI) and the report's `SpreadReport` with its
 * text for people ("0.6 /h ± 15%", "0.6 /h ± 0.05 /h", "0.5–0.7 /h"). Each problem is on its
 * own field (`items[j].spread.sd`).
 */
import type { ParameterSpread } from '../study/types.ts';
import { missingFigureWords } from '../study/spread-rules.ts';
import type { CellError, InputSpread } from '../engine/node.ts';
import type { SpreadReport } from '../engine/report.ts';
import type { Lookup } from '../expression/evaluate.ts';
import { type Field, field, FieldError, finiteQuantityOf, valueOf } from './fields.ts';
import { type Quantity, describe, deltaUnit, report, shownUnit, valueIn, formatNumber } from '../units/quantity.ts';
import { formatUnit, unitAfterNumber } from '../units/units.ts';
import { sameDim, describeDim } from '../units/dimension.ts';
import { stepOf } from './solve.ts';

/** A spread's fields, parsed. */
export interface SpreadFields {
  readonly distribution: string;
  readonly path: string;
  readonly sd?: Field;
  readonly cv?: Field;
  readonly from?: Field;
  readonly to?: Field;
}

/** Parses an item's `spread` (at `path`, `...items[j].spread`); undefined when there is none. Problems of syntax are recorded. */
export function spreadFields(spread: ParameterSpread | undefined, path: string, problems: CellError[]): SpreadFields | undefined {
  if (!spread || typeof spread !== 'object') return undefined;
  const opt = (key: 'sd' | 'from' | 'to') => (spread[key] !== undefined ? field(spread[key], `${path}.${key}`, problems) : undefined);
  const cvText = typeof spread.cv === 'number' ? String(spread.cv) : spread.cv;
  return {
    distribution: String(spread.distribution), path,
    sd: opt('sd'), from: opt('from'), to: opt('to'),
    cv: cvText !== undefined ? field(cvText, `${path}.cv`, problems) : undefined,
  };
}

const bad = (path: string, message: string, kind: 'invalid' | 'unit' | 'shape' = 'invalid'): never => { throw new FieldError({ kind, path, message }); };

/** The difference a field gives, as a size (a temperature reading such as `0.5 degC` read as a size of degree). */
function sizeOf(f: Field, lookup: Lookup, q: Quantity, name: string, what: string): number {
  const s = finiteQuantityOf(f, lookup);
  if (!sameDim(s.dim, q.dim)) bad(f.path, `the ${what} of ${name} must be ${describeDim(q.dim)} like its value (${describe(q)}); it is ${describeDim(s.dim)} (${describe(s)})`, 'unit');
  return stepOf(s);
}

/**
 * The spread of `name`, whose value is q: checked (SD and CV above zero, a log-normal value
 * above zero, a uniform's ends in order around the value, every figure of the value's
 * dimension), as the binding's spread and as reported.
 */
export function checkedSpread(name: string, q: Quantity, f: SpreadFields, lookup: Lookup): { spread: InputSpread; report: SpreadReport } {
  const unit = shownUnit(q);
  const inUnit = (si: number) => ({ ...q, si });
  const diff: Quantity = { si: 0, dim: q.dim, unit: deltaUnit(unit), ...(q.temp ? { temp: 'delta' as const } : {}) };
  const missing = (key: string) => bad(`${f.path}.${key}`, missingFigureWords(f.distribution, key), 'shape');
  switch (f.distribution) {
    case 'normal': {
      if (!f.sd) return missing('sd');
      const sd = sizeOf(f.sd, lookup, q, name, 'SD');
      if (!(sd > 0)) bad(f.sd.path, `the SD of ${name} must be above zero; it is ${describe({ ...diff, si: sd })}`);
      const sdQ = { ...diff, si: sd };
      return { spread: { kind: 'normal', sd }, report: { distribution: 'normal', sd: report(sdQ), text: `${describe(q)} ± ${describe(sdQ)}` } };
    }
    case 'lognormal': {
      if (!f.cv) return missing('cv');
      const v = valueOf(f.cv, lookup);
      if (typeof v === 'boolean' || v.dim.some((d) => d !== 0)) bad(f.cv.path, `the CV of ${name} must be a plain number (0.15, or 15%)${typeof v === 'boolean' ? '' : `; it is ${describeDim(v.dim)}`}`, 'unit');
      const cv = (v as Quantity).si;
      if (!(Number.isFinite(cv) && cv > 0)) bad(f.cv.path, `the CV of ${name} must be above zero; it is ${formatNumber(cv)}`);
      if (q.temp === 'point') bad(f.cv.path, `${name} is a temperature reading; a log-normal spread needs a value on a ratio scale: give a normal spread with an SD`);
      if (!(q.si > 0)) bad(f.cv.path, `a log-normal spread needs a value above zero (its median); ${name} is ${describe(q)}`);
      const sigma = Math.sqrt(Math.log1p(cv * cv));
      return { spread: { kind: 'lognormal', sigma }, report: { distribution: 'lognormal', cv, text: `${describe(q)} ± ${formatNumber(cv * 100, 3)}%` } };
    }
    case 'uniform': {
      if (!f.from) return missing('from');
      if (!f.to) return missing('to');
      const ends = [f.from, f.to].map((e, i) => {
        const x = finiteQuantityOf(e, lookup);
        if (!sameDim(x.dim, q.dim)) bad(e.path, `the ${i ? 'upper' : 'lower'} end of ${name}'s spread must be ${describeDim(q.dim)} like its value (${describe(q)}); it is ${describeDim(x.dim)} (${describe(x)})`, 'unit');
        return x;
      });
      const [lo, hi] = ends;
      if (!(lo.si < hi.si)) bad(f.from.path, `the spread of ${name} must run from a lower to a higher value: ${describe(lo)} is not below ${describe(hi)}`);
      if (q.si < lo.si || q.si > hi.si) bad(f.from.path, `${name} (${describe(q)}) lies outside its spread, ${describe(lo)} to ${describe(hi)}`);
      const u = unitAfterNumber(formatUnit(unit));
      const text = `${formatNumber(valueIn(lo, unit))}–${formatNumber(valueIn(hi, unit))}${u ? ` ${u}` : ''}`;
      return { spread: { kind: 'uniform', from: lo.si, to: hi.si }, report: { distribution: 'uniform', from: report(inUnit(lo.si)), to: report(inUnit(hi.si)), text } };
    }
    default:
      return bad(`${f.path}.distribution`, `must be one of normal, lognormal, uniform`, 'shape');
  }
}

/** The spread's part of a binding's signature. */
export function spreadSig(s: InputSpread): string {
  switch (s.kind) {
    case 'normal': return `~n${s.sd}`;
    case 'lognormal': return `~ln${s.sigma}`;
    case 'uniform': return `~u${s.from},${s.to}`;
    case 'joint': return `~j${s.index}:${Array.from(s.joint.covariance).join(',')}`;
  }
}
