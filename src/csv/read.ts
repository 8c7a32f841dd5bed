/**
 * CSV text from a spreadsheet or a data logger into a table of numbers, read with papaparse:
 * title lines before the header skipped, the separator taken from the header (tab, semicolon
 * or comma), decimal commas read where the separator is not a comma, names and units read
 * from the header (`Temp (°C)`), columns matched to the cell's by name or else by position,
 * clock times and dates in the time column (the first) turned into time elapsed since the
 * first row. A row with too many or too few fields is refused with its number and its text;
 * nothing is dropped. Every interpretation is said in `notes`.
 */
import Papa from 'papaparse';
import { unitFromText } from '../expression/unit-text.ts';
import { type DisplayUnit, NO_UNIT, formatUnit, unitDim, unitFactor } from '../units/units.ts';
import { sameDim, TIME } from '../units/dimension.ts';
import { type HeaderEntry, readHeaderEntry } from './header.ts';
import { ElapsedTimes, type TimeReading, formatWords, readTime } from './clock.ts';

/** A column the cell declares: its name and its unit text. */
export interface DeclaredColumn {
  readonly name: string;
  readonly unit: string;
}

/** A column of the table read. */
export interface CsvColumn {
  /** The cell's name for it (or the header's, made a study name, when the header's columns are taken). */
  readonly name: string;
  /** The unit its numbers are in (the engine's spelling). */
  readonly unit: string;
  /** Where the unit comes from: the header, the cell, or elapsed time of clock times. */
  readonly unitFrom: 'header' | 'cell' | 'elapsed';
  /** The header entry as the file writes it. */
  readonly header: string;
  /** Its place in the file (0-based). */
  readonly position: number;
}

/** A row refused: its number among the rows (1-based, as a person counts them), its line in the text, that line, and why. */
export interface CsvRowProblem {
  readonly row: number;
  readonly line: number;
  readonly text: string;
  readonly message: string;
}

export type CsvEntry = number | string | null;

/** What reading gives: the table, or why not (with every refused row, and then the columns read). `notes` say what was interpreted. */
export type CsvRead =
  | { ok: true; columns: CsvColumn[]; rows: CsvEntry[][]; notes: string[]; start?: string }
  | { ok: false; message: string; problems: CsvRowProblem[]; notes: string[]; columns?: CsvColumn[] };

export interface CsvReadOptions {
  /** When the header's columns match the cell's neither by name nor by position, take the header's (names and units). */
  readonly adopt?: boolean;
  /** Told the number of rows read so far, every `PROGRESS_EVERY` rows while the text is parsed (for a progress bar). */
  readonly onProgress?: (rowsRead: number) => void;
}

/** How often, in rows, `onProgress` is told. */
export const PROGRESS_EVERY = 2_000;

const DOT_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
const COMMA_NUMBER = /^[-+]?(\d+,\d*|,\d+)([eE][-+]?\d+)?$/;
const SEPARATORS = ['\t', ';', ','] as const;

interface Line { readonly text: string; readonly index: number }
interface Pick { readonly position: number; readonly name: string; readonly declared?: string }

/**
 * Reads `text` for a cell that declares `declared` (in order; the first column is time).
 * Columns are matched by name (the header entry, its name part, or that made a study name);
 * when the header shares no name with the cell and has as many columns, by position; else, with
 * `adopt`, the header's own columns are taken. Entries that are not numbers stay as text for
 * the caller to report on their row; empty entries are null. Never throws. Cost: linear.
 */
export function readCsvTable(text: string, declared: readonly DeclaredColumn[], options: CsvReadOptions = {}): CsvRead {
  const notes: string[] = [];
  const fail = (message: string, problems: CsvRowProblem[] = []): CsvRead => ({ ok: false, message, problems, notes });
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  const filled: Line[] = lines.map((t, index) => ({ text: t, index })).filter((l) => l.text.trim() !== '');
  if (filled.length === 0) return fail('the CSV text is empty: give a header row of column names, then the rows');
  const firstData = filled.findIndex((l) => looksLikeValue(l.text));
  if (firstData === 0) return fail(`line ${filled[0].index + 1} ("${filled[0].text.trim()}") is a row of values: start with a header row of column names`);
  const header = filled[firstData < 0 ? filled.length - 1 : firstData - 1];
  const titles = filled.filter((l) => l.index < header.index);
  if (titles.length) notes.push(`${titles.length === 1 ? 'line' : 'lines'} ${titles.map((l) => l.index + 1).join(', ')} before the header ${titles.length === 1 ? 'is' : 'are'} not read ("${titles[0].text.trim()}"${titles.length > 1 ? ', …' : ''})`);
  const dataLine = firstData < 0 ? undefined : filled[firstData];
  const separator = SEPARATORS.find((s) => header.text.includes(s)) ?? SEPARATORS.find((s) => dataLine?.text.includes(s)) ?? ',';
  const decimalComma = separator !== ',';

  const parsed = parseFrom(lines, header.index, separator, options.onProgress);
  if ('message' in parsed) return fail(parsed.message);
  const [head, ...body] = parsed.rows;
  const entries = head.fields.map(readHeaderEntry);
  const picked = pickColumns(entries, declared, options, notes);
  if (typeof picked === 'string') return fail(picked);

  const timeFormat = firstTime(body, picked[0]?.position);
  const columns: CsvColumn[] = [];
  for (const [j, p] of picked.entries()) {
    const c = columnOf(entries[p.position], p, j === 0 && timeFormat !== undefined, options);
    if (typeof c === 'string') return fail(c);
    columns.push(c);
    const e = entries[p.position];
    if (e.text !== p.name || c.unitFrom === 'header') {
      notes.push(`CSV column ${p.position + 1} '${e.text}' read as ${p.name}${e.name === p.name && e.label !== e.name ? ' (a name is letters, digits and _)' : ''}${c.unitFrom === 'header' ? `, in ${c.unit} (from the header)` : ''}`);
    }
  }

  const problems: CsvRowProblem[] = [];
  const rows: CsvEntry[][] = [];
  let comma: string | undefined;
  let clock: ElapsedTimes | undefined;
  let start: string | undefined;
  const timeUnit = columns[0] ? unitFromText(columns[0].unit) ?? NO_UNIT : NO_UNIT;
  body.forEach((r, i) => {
    const row = i + 1;
    const problem = (message: string) => problems.push({ row, line: r.line, text: lines[r.line - 1].trim(), message });
    if (r.fields.length !== head.fields.length) {
      const more = r.fields.length > head.fields.length;
      return problem(`${r.fields.length} field${r.fields.length === 1 ? '' : 's'}; the header has ${head.fields.length} (${head.fields.join(', ')})${more && separator === ',' ? ': if the file writes decimal commas (70,5), export it with semicolons between fields (0;70,5)' : ''}`);
    }
    const values: CsvEntry[] = [];
    for (const [j, p] of picked.entries()) {
      const s = r.fields[p.position].trim();
      if (j === 0 && timeFormat !== undefined && s !== '') {
        const t = readTime(s);
        if (t === undefined || 'problem' in t) return problem(t ? t.problem : `"${s}" is not ${formatWords(timeFormat)} like the first row's time`);
        clock ??= new ElapsedTimes(t);
        start ??= t.text;
        const step = clock.next(t);
        if (!step.ok) return problem(step.message);
        if (step.rolled) notes.push(`the clock passes midnight before row ${row} ("${t.text}"): read as the next day`);
        values.push(step.seconds / unitFactor(timeUnit));
        continue;
      }
      if (j === 0 && s !== '') {
        const t = readTime(s);
        if (t !== undefined) return problem(`${'problem' in t ? t.problem : `"${s}" is ${formatWords(t.format)}; the rows above give numbers: give the times in one format`}`);
      }
      const v = entryOf(s, decimalComma);
      if (typeof v === 'number' && !DOT_NUMBER.test(s)) comma ??= s;
      values.push(v);
    }
    rows.push(values);
  });
  if (comma !== undefined) notes.push(`decimal commas read as decimal points ("${comma}" as ${entryOf(comma, true)})`);
  if (start !== undefined) notes.push(`times are ${timeFormat === 'clock' ? 'clock times' : 'dates and times'}, read as ${columns[0].unit} since the first row; starts ${start}`);
  // the columns were read all the same: a refused row does not unmake the header
  if (problems.length) return { ...fail(`${rowMessage(problems[0])}${problems.length > 1 ? ` (and ${problems.length - 1} more row${problems.length > 2 ? 's' : ''} refused)` : ''}`, problems), columns };
  return { ok: true, columns, rows, notes, ...(start !== undefined ? { start } : {}) };
}

/** A refused row's problem as one message: `row 3 (line 4: "0,70,2"): ...`. */
export function rowMessage(p: CsvRowProblem): string {
  return `row ${p.row} (line ${p.line}: "${p.text}"): ${p.message}`;
}

/** Whether a line's first filled field starts like a value (a number, a time, a date) rather than a name. */
function looksLikeValue(line: string): boolean {
  const first = line.split(/[,;\t]/).find((f) => f.trim() !== '') ?? '';
  return /^\s*"?\s*[-+]?\.?\d/.test(first);
}

interface Parsed { readonly fields: string[]; readonly line: number }

/** The rows from line `from` on, each with its line number (1-based); rows of empty fields left out. */
function parseFrom(lines: readonly string[], from: number, delimiter: string, onProgress?: (rowsRead: number) => void): { rows: Parsed[] } | { message: string } {
  const text = lines.slice(from).join('\n');
  const rows: Parsed[] = [];
  let offset = 0;
  let line = from + 1;
  let error: string | undefined;
  Papa.parse<string[]>(text, {
    delimiter,
    step: (r) => {
      const at = line;
      const end = r.meta.cursor;
      for (let k = offset; k < end && k < text.length; k++) if (text[k] === '\n') line += 1;
      offset = end;
      if (r.errors.length && error === undefined) error = `the CSV text cannot be read (line ${at}): ${r.errors[0].message}`;
      const fields = r.data;
      if (fields.some((f) => f.trim() !== '')) rows.push({ fields, line: at });
      if (onProgress && rows.length % PROGRESS_EVERY === 0) onProgress(rows.length - 1);
    },
  });
  return error !== undefined ? { message: error } : { rows };
}

/** Which columns of the file make the table, in the table's order. A string says why none can. */
function pickColumns(entries: readonly HeaderEntry[], declared: readonly DeclaredColumn[], options: CsvReadOptions, notes: string[]): Pick[] | string {
  const found = declared.map((d) => entries.findIndex((e) => e.text === d.name || e.label === d.name || e.name === d.name));
  if (declared.length && found.every((i) => i >= 0)) return declared.map((d, j) => ({ position: found[j], name: d.name, declared: d.unit }));
  const shares = found.some((i) => i >= 0);
  if (declared.length && !shares && entries.length === declared.length) return declared.map((d, j) => ({ position: j, name: d.name, declared: d.unit }));
  if (options.adopt) {
    const used = new Set<string>();
    if (declared.length) notes.push(`the header's columns take the place of the cell's (${declared.map((d) => d.name).join(', ')})`);
    return entries.map((e, position) => {
      let name = e.name;
      for (let k = 2; used.has(name); k++) name = `${e.name}_${k}`;
      used.add(name);
      return { position, name };
    });
  }
  const absent = declared.filter((_, j) => found[j] < 0).map((d) => `"${d.name}"`);
  const header = entries.map((e) => e.text).join(', ');
  return `the CSV header (${header}) has no column ${absent.join(', ')}${shares ? ' (it shares other names with the cell, so its columns are not matched by position)' : `; its ${entries.length} columns cannot be matched by position to the cell's ${declared.length} (${declared.map((d) => d.name).join(', ')})`}`;
}

/** The format of the time column's first time, when it holds clock times or dates. */
function firstTime(body: readonly Parsed[], position: number | undefined): TimeReading['format'] | undefined {
  if (position === undefined) return undefined;
  const first = body.find((r) => (r.fields[position] ?? '').trim() !== '');
  const t = first ? readTime(first.fields[position]) : undefined;
  return t && !('problem' in t) ? t.format : undefined;
}

/** A picked column with its unit, checked against the cell's; a string says why it cannot be read. */
function columnOf(e: HeaderEntry, p: Pick, clockTimes: boolean, options: CsvReadOptions): CsvColumn | string {
  const where = `CSV column ${p.position + 1} '${e.text}'`;
  if (e.unitText !== undefined && !e.unit) return `${where}: "${e.unitText}" is not a unit (write units as in a value, such as degC, min or mg/L)`;
  const cell = p.declared !== undefined ? unitFromText(p.declared.trim() === '1' ? '' : p.declared) : undefined;
  let unit: DisplayUnit | undefined = e.unit;
  let unitFrom: CsvColumn['unitFrom'] = e.unit ? 'header' : 'cell';
  if (clockTimes) {
    if (e.unit && !sameDim(unitDim(e.unit), TIME)) return `${where} holds clock times, so its unit must be a time; it is ${formatUnit(e.unit)}`;
    if (!e.unit) {
      unit = cell && sameDim(unitDim(cell), TIME) ? cell : [['min', 1]];
      unitFrom = 'elapsed';
    }
  }
  if (unit && cell && !sameDim(unitDim(unit), unitDim(cell)) && !options.adopt) {
    return `${where} is in ${formatUnit(unit)}${clockTimes ? ' (time since the first row)' : ''}; the cell's column ${p.name} is in ${p.declared}, which measures something else`;
  }
  const text = unit ? formatUnit(unit) : p.declared ?? '1';
  return { name: p.name, unit: text === '' ? '1' : text, unitFrom, header: e.text, position: p.position };
}

/** An entry as a number (decimal comma allowed when asked), null when empty, else its text. */
function entryOf(s: string, decimalComma: boolean): CsvEntry {
  if (s === '') return null;
  if (DOT_NUMBER.test(s)) return Number(s);
  if (decimalComma && COMMA_NUMBER.test(s)) return Number(s.replace(',', '.'));
  return s;
}
