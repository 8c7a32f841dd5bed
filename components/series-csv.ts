/**
 * A simulated series as CSV text, for a spreadsheet. Formatting only: the numbers are written
 * exactly as they are given (no unit conversion, no rounding), so the caller chooses the
 * units, and says which in the column labels.
 */

/** One column of the CSV: `key` names an array of the series, `label` is its header text. */
export interface SeriesColumn {
  readonly key: string;
  readonly label: string;
}

/** Columnar data: `t` (one entry per row) and any other arrays of the same length. */
export interface SeriesData {
  readonly t: ArrayLike<number>;
  readonly [key: string]: ArrayLike<number>;
}

const LINE_END = '\r\n'; // RFC 4180

/**
 * CSV text: a header row of `columns` labels, then one row per entry of `series.t`, the
 * columns in the order given (list `t` among them to get the time column). Numbers are
 * written with JavaScript's shortest exact form (`0.1`, `1e-7`, `NaN`, `Infinity`), so
 * reading the file back gives the same doubles. Labels are quoted when they hold a comma, a
 * quote or a line break, and a label that a spreadsheet would run as a formula (starting
 * with `=`, `+`, `-`, `@`) is prefixed with `'`. Throws a RangeError naming the column when a
 * key is missing from the series, its length differs from `t`, or it holds something other
 * than a number (a caller's mistake).
 * Cost: linear in the number of values.
 */
export function exportSeriesCsv(series: SeriesData, columns: readonly SeriesColumn[]): string {
  if (columns.length === 0) throw new RangeError('exportSeriesCsv: give at least one column');
  const rows = series.t.length;
  const arrays = columns.map(({ key }) => {
    const values = Object.prototype.hasOwnProperty.call(series, key) ? series[key] : undefined;
    if (!values || typeof values.length !== 'number') throw new RangeError(`exportSeriesCsv: the series has no column "${key}"`);
    if (values.length !== rows) {
      throw new RangeError(`exportSeriesCsv: column "${key}" has ${values.length} values, but t has ${rows}`);
    }
    return values;
  });
  const lines = [columns.map((c) => textField(c.label)).join(',')];
  for (let i = 0; i < rows; i++) {
    let line = '';
    for (let j = 0; j < arrays.length; j++) {
      const v = arrays[j][i];
      if (typeof v !== 'number') throw new RangeError(`exportSeriesCsv: column "${columns[j].key}" row ${i} is not a number`);
      line += (j ? ',' : '') + String(v);
    }
    lines.push(line);
  }
  return lines.join(LINE_END) + LINE_END;
}

function textField(text: string): string {
  const safe = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}
