/**
 * Reading a logger's CSV into a table (`readCsvTable`, what the CSV worker runs), at 10,000 and
 * 100,000 rows of invented readings. It runs off the page's thread, so its goal is the wait
 * before the table shows, not the page's responsiveness: 10,000 rows under 0.3 s, 100,000
 * under 3 s (the time a progress bar keeps someone waiting). Median of 3 runs after one
 * untimed run. Not a test: a goal not met is reported, nothing fails.
 */
import { readCsvTable } from '../src/index.ts';

export interface CsvBenchRow {
  readonly measure: string;
  readonly result: string;
  readonly goal: string;
  readonly met: boolean;
}

const GOALS_MS: ReadonlyArray<[number, number]> = [[10_000, 300], [100_000, 3_000]];

/** Invented readings: every 3 s, T = 1 + 69·exp(-t / 50 min) degC, to 0.01 degC. */
function log(rows: number): string {
  const lines = ['t (min),T (degC)'];
  for (let i = 0; i < rows; i++) lines.push(`${(i * 0.05).toFixed(2)},${(1 + 69 * Math.exp(-i * 0.05 / 50)).toFixed(2)}`);
  return lines.join('\n');
}

export function csvBenchmarks(): CsvBenchRow[] {
  return GOALS_MS.map(([rows, goal]) => {
    const text = log(rows);
    const columns = [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }];
    readCsvTable(text, columns, { adopt: true });
    const times: number[] = [];
    for (let k = 0; k < 3; k++) {
      const t0 = performance.now();
      const r = readCsvTable(text, columns, { adopt: true });
      times.push(performance.now() - t0);
      if (!r.ok || r.rows.length !== rows) throw new Error(`the ${rows}-row log was not read: ${r.ok ? r.rows.length : r.message}`);
    }
    const ms = times.sort((a, b) => a - b)[1];
    return { measure: `${rows.toLocaleString('en-US')} rows read into a table`, result: `${ms.toFixed(0)} ms`, goal: `< ${goal} ms`, met: ms < goal };
  });
}
