/**
 * A CSV header entry as a data logger writes it: a name with its unit in parentheses or
 * brackets (`Time (min)`, `Temp [°C]`, `C (mg/L)`), the unit spelled the logger's way (°C, ℃,
 * degF, µg/L) and read by the engine's own unit reader; the name made into a study name.
 */
import { NAME_PATTERN } from '../study/types.ts';
import { unitFromText } from '../expression/unit-text.ts';
import { type DisplayUnit, formatUnit } from '../units/units.ts';

/** One header entry, read. */
export interface HeaderEntry {
  /** The entry as the file has it (trimmed). */
  readonly text: string;
  /** The name part, as written (`Temp 1` of `Temp 1 (°C)`). */
  readonly label: string;
  /** `label` as a study name: letters, digits and `_`, starting with a letter (`Temp_1`). */
  readonly name: string;
  /** The unit text inside the parentheses or brackets, as written; absent without one (or with `()`). */
  readonly unitText?: string;
  /** That unit read by the engine; absent without a unit or when it is not a unit. */
  readonly unit?: DisplayUnit;
}

/** Logger spellings of units, each to the engine's name (checked against its unit reader). */
const SPELLINGS: ReadonlyArray<readonly [RegExp, string]> = [
  [/℃/g, 'degC'],
  [/℉/g, 'degF'],
  [/[°º˚]\s*C\b/g, 'degC'],
  [/[°º˚]\s*F\b/g, 'degF'],
  [/[°º˚]\s*K\b/g, 'K'],
  [/\bdeg\s+([CF])\b/g, 'deg$1'],
  [/[°º˚]/g, 'deg'],
  [/[µμ]/g, 'u'],
  [/[·⋅×]/g, ' * '],
  [/²/g, '^2'],
  [/³/g, '^3'],
];

/** A logger's unit text in the engine's spelling (`°C` → `degC`, `µg/L` → `ug/L`). */
export function engineUnitText(text: string): string {
  return SPELLINGS.reduce((s, [re, to]) => s.replace(re, to), text.trim());
}

/**
 * `label` as a study name: accents dropped, every run of other characters as one `_`,
 * `_` in front of a leading digit, and `column` (`column_2` for the second) when nothing is
 * left. `Temp 1` → `Temp_1`, `Conc.` → `Conc`, `Température` → `Temperature`.
 */
export function studyName(label: string, position: number): string {
  if (NAME_PATTERN.test(label)) return label;
  const plain = label.normalize('NFD').replace(/[\u0300-\u036f]/g, '');
  const name = plain.replace(/[^A-Za-z0-9_]+/g, '_').replace(/^_+|_+$/g, '');
  if (name === '') return `column_${position + 1}`;
  return /^[0-9]/.test(name) ? `_${name}` : name;
}

/** Reads one header entry at `position` (0-based). Never throws. */
export function readHeaderEntry(entry: string, position: number): HeaderEntry {
  const text = entry.trim();
  const m = /^(.*?)\s*(?:\(([^()]*)\)|\[([^[\]]*)\])$/.exec(text);
  const label = (m ? m[1] : text).trim();
  const unitText = m ? (m[2] ?? m[3]).trim() : undefined;
  const base = { text, label, name: studyName(label, position) };
  if (unitText === undefined || unitText === '') return base;
  const unit = unitFromText(engineUnitText(unitText));
  return unit ? { ...base, unitText, unit } : { ...base, unitText };
}

/** A header entry's unit in the engine's words (`degC`, `mg / L`). */
export function headerUnitName(e: HeaderEntry): string | undefined {
  return e.unit ? formatUnit(e.unit) : undefined;
}
