// CSV as data loggers and spreadsheets export it: headers with units, decimal commas, clock
// times and timestamps, rows with a field too many or too few. The exports below are written
// for these tests (invented readings) in the styles loggers use.
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { runStudy, tableFromCsv, type CellReport } from '../../src/index.ts';
import { readCsvTable, type CsvRead } from '../../src/csv/read.ts';
import { readHeaderEntry, studyName } from '../../src/csv/header.ts';
import { dataNodes } from '../../src/cells/data.ts';
import type { DataCell } from '../../src/study/types.ts';
import type { RunContext } from '../../src/engine/node.ts';
import { formatReport } from '../../src/output/report-text.ts';
import { near } from './helpers.ts';

const T_MIN_DEGC = [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degC' }];

function ok(r: CsvRead): Extract<CsvRead, { ok: true }> {
  assert.ok(r.ok, r.ok ? '' : r.message);
  return r;
}

function refused(r: CsvRead): Extract<CsvRead, { ok: false }> {
  assert.equal(r.ok, false, 'the text should be refused');
  return r as Extract<CsvRead, { ok: false }>;
}

/** The data cell's report for `csv` with the given columns. */
function dataReport(csv: string, columns = T_MIN_DEGC): CellReport {
  const r = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [{ id: 'logger', kind: 'data', columns, csv }] });
  assert.ok(r.ok);
  return (r as { report: { cells: CellReport[] } }).report.cells[0];
}

/** The SI rows the data cell hands to fits and analyses. */
function siRows(csv: string, columns: Array<{ name: string; unit: string }>): ReadonlyArray<ReadonlyArray<number | null>> {
  const cell: DataCell = { id: 'logger', kind: 'data', columns, csv };
  const out = dataNodes(cell, 'cells[0]')[0].run({} as RunContext);
  assert.ok(out.ok, out.ok ? '' : out.error.message);
  const b = out.bindings.get('#logger');
  assert.ok(b && b.kind === 'data');
  return b.table.rows;
}

describe('a logger header: names with units', () => {
  it('reads the unit in parentheses or brackets, in the engine spelling', () => {
    // common practice: °C, ℃ and "deg C" all mean degrees Celsius; µ is the micro prefix
    assert.equal(readHeaderEntry('Temp [°C]', 0).unit?.[0][0], 'degC');
    assert.equal(readHeaderEntry('T (degF)', 0).unit?.[0][0], 'degF');
    assert.equal(readHeaderEntry('Temperature (°F)', 0).unit?.[0][0], 'degF');
    assert.equal(readHeaderEntry('T (K)', 0).unit?.[0][0], 'K');
    assert.equal(readHeaderEntry('Probe (℃)', 0).unit?.[0][0], 'degC');
    assert.deepEqual(readHeaderEntry('C (mg/L)', 0).unit, [['mg', 1], ['L', -1]]);
    assert.deepEqual(readHeaderEntry('C (µg/L)', 0).unit, [['ug', 1], ['L', -1]]);
    assert.equal(readHeaderEntry('Time (min)', 0).label, 'Time');
    assert.equal(readHeaderEntry('RH (%)', 0).unit, undefined);
    assert.equal(readHeaderEntry('RH (%)', 0).unitText, '%');
  });

  it('makes a study name of a name that is not one', () => {
    assert.equal(studyName('Temp', 0), 'Temp');
    assert.equal(studyName('Temp 1', 1), 'Temp_1');
    assert.equal(studyName('Conc.', 1), 'Conc');
    assert.equal(studyName('Température', 1), 'Temperature');
    assert.equal(studyName('1st probe', 1), '_1st_probe');
    assert.equal(studyName('%', 2), 'column_3');
  });

  it('reads "Time (min),Temp (°C)" into the cell\'s columns, and says where the units came from', () => {
    const r = ok(readCsvTable('Time (min),Temp (°C)\n0,70.0\n10,61.5\n20,54.2\n', T_MIN_DEGC));
    assert.deepEqual(r.rows, [[0, 70], [10, 61.5], [20, 54.2]]);
    assert.deepEqual(r.columns.map((c) => [c.name, c.unit, c.unitFrom]), [['t', 'min', 'header'], ['T', 'degC', 'header']]);
    assert.ok(r.notes.includes("CSV column 2 'Temp (°C)' read as T, in degC (from the header)"), r.notes.join('\n'));
    const report = dataReport('Time (min),Temp (°C)\n0,70.0\n10,61.5\n20,54.2\n');
    assert.equal(report.ok, true, JSON.stringify(report.error));
    assert.equal(report.rowCount, 3);
    assert.ok((report.csv as { notes: string[] }).notes.includes("CSV column 1 'Time (min)' read as t, in min (from the header)"));
  });

  it('converts from the header\'s unit when it differs from the cell\'s', () => {
    const rows = siRows('T (degF),time (h)\n165,0\n132.5,0.5\n', [{ name: 'time', unit: 'min' }, { name: 'T', unit: 'K' }]);
    // °F to K: (165 - 32) × 5/9 + 273.15 = 73.888… + 273.15 = 347.0389 K
    near(rows[0][1]!, 347.03888888888889, 1e-12, '165 °F in K');
    // °F to K: (132.5 - 32) × 5/9 + 273.15 = 55.8333… + 273.15 = 328.9833 K
    near(rows[1][1]!, 328.98333333333333, 1e-12, '132.5 °F in K');
    // hand-worked: 0.5 h = 1800 s
    near(rows[1][0]!, 1800, 1e-12, '0.5 h in s');
  });

  it('refuses a header unit that is not a unit, or measures something else than the cell\'s', () => {
    assert.match(refused(readCsvTable('t,T (%)\n0,1\n', T_MIN_DEGC)).message, /CSV column 2 'T \(%\)': "%" is not a unit/);
    assert.match(refused(readCsvTable('t,T (mg/L)\n0,1\n', T_MIN_DEGC)).message, /'T \(mg\/L\)' is in mg \/ L; the cell's column T is in degC, which measures something else/);
  });
});

describe('matching the CSV columns to the cell\'s', () => {
  it('maps by position when the header shares no name with the cell, and says so', () => {
    const r = ok(readCsvTable('Elapsed,Probe 1\n0,70\n5,64\n', T_MIN_DEGC));
    assert.deepEqual(r.rows, [[0, 70], [5, 64]]);
    assert.deepEqual(r.notes, ["CSV column 1 'Elapsed' read as t", "CSV column 2 'Probe 1' read as T"]);
  });

  it('maps a header name made into a study name ("Temp 1" is the cell\'s Temp_1)', () => {
    const r = ok(readCsvTable('t,Humidity,Temp 1 (°C)\n0,40,21.5\n', [{ name: 't', unit: 's' }, { name: 'Temp_1', unit: 'degC' }]));
    assert.deepEqual(r.rows, [[0, 21.5]]);
    assert.deepEqual(r.columns.map((c) => c.position), [0, 2]);
    assert.ok(r.notes.includes("CSV column 3 'Temp 1 (°C)' read as Temp_1 (a name is letters, digits and _), in degC (from the header)"), r.notes.join('\n'));
  });

  it('refuses when some names match and others do not (a misspelt name is not guessed)', () => {
    assert.match(refused(readCsvTable('time,T\n0,1\n', T_MIN_DEGC)).message, /no column "t" \(it shares other names with the cell/);
  });

  it('"turn into a table" takes the header\'s names and units when the cell\'s columns do not match', () => {
    const r = ok(tableFromCsv('Time (h),Temp 1 (°C),Temp 2 (°C)\n0,20,21\n1,25,27\n', T_MIN_DEGC));
    assert.deepEqual(r.columns.map((c) => [c.name, c.unit]), [['Time', 'h'], ['Temp_1', 'degC'], ['Temp_2', 'degC']]);
    assert.deepEqual(r.rows, [[0, 20, 21], [1, 25, 27]]);
    assert.ok(r.notes.includes("the header's columns take the place of the cell's (t, T)"));
  });
});

describe('rows with a field too many or too few', () => {
  it('refuses each on its row, with the row as written, and drops nothing', () => {
    const csv = 'Time (min),Temp (°C)\n0,70\n10,61,5\n20\n30,50.1\n';
    const r = refused(readCsvTable(csv, T_MIN_DEGC));
    assert.deepEqual(r.problems.map((p) => [p.row, p.line, p.text]), [[2, 3, '10,61,5'], [3, 4, '20']]);
    assert.match(r.problems[0].message, /^3 fields; the header has 2 \(Time \(min\), Temp \(°C\)\)/);
    assert.match(r.problems[1].message, /^1 field; the header has 2/);
    assert.match(r.message, /^row 2 \(line 3: "10,61,5"\): 3 fields/);
    assert.match(r.message, /and 1 more row refused/);
    const report = dataReport(csv);
    assert.equal(report.ok, false);
    assert.equal(report.error!.path, 'cells[0].csv');
    assert.equal((report.csv as { problems: unknown[] }).problems.length, 2);
    const r2 = runStudy({ format: 'ratebook-study', version: 1, title: 't', cells: [{ id: 'logger', kind: 'data', columns: T_MIN_DEGC, csv }] });
    assert.ok(r2.ok);
    const text = formatReport(r2.report);
    assert.match(text, /row 3 +line 4 "20": 1 field; the header has 2/);
    assert.match(text, /csv +CSV column 2 'Temp \(°C\)' read as T, in degC \(from the header\)/);
  });

  it('counts lines as a person does, past a title line and blank lines', () => {
    const r = refused(readCsvTable('Logger 7 export\r\n\r\nTime (min),Temp (°C)\r\n0,70\r\n\r\n10,61,5\r\n', T_MIN_DEGC));
    // hand-worked: the title is line 1, blank line 2, header line 3, "0,70" line 4, blank 5, "10,61,5" line 6
    assert.deepEqual(r.problems.map((p) => [p.row, p.line, p.text]), [[2, 6, '10,61,5']]);
  });
});

describe('decimal commas', () => {
  it('reads "Time [h];Conc. [mg/L]" with decimal commas, after a title line', () => {
    const csv = 'Patient 4 – plasma levels\nTime [h];Conc. [mg/L]\n0,5;12,4\n1;10,85\n2;8,2\n4;5,05\n';
    const r = ok(tableFromCsv(csv, []));
    // hand-worked: "0,5" is 0.5, "12,4" is 12.4, "10,85" is 10.85, "5,05" is 5.05
    assert.deepEqual(r.rows, [[0.5, 12.4], [1, 10.85], [2, 8.2], [4, 5.05]]);
    assert.deepEqual(r.columns.map((c) => [c.name, c.unit]), [['Time', 'h'], ['Conc', 'mg / L']]);
    assert.ok(r.notes.includes('line 1 before the header is not read ("Patient 4 – plasma levels")'));
    assert.ok(r.notes.includes('decimal commas read as decimal points ("0,5" as 0.5)'), r.notes.join('\n'));
  });

  it('with the cell\'s columns, converts to SI: 12,4 mg/L is 0.0124 kg/m³', () => {
    const rows = siRows('Time [h];Conc. [mg/L]\n0,5;12,4\n1;10,85\n', [{ name: 't', unit: 'h' }, { name: 'C', unit: 'mg / L' }]);
    // hand-worked: 0.5 h = 1800 s; 12.4 mg/L = 12.4e-6 kg / 1e-3 m³ = 0.0124 kg/m³
    near(rows[0][0]!, 1800, 1e-12);
    near(rows[0][1]!, 0.0124, 1e-12);
  });

  it('a comma-separated file with decimal commas is ambiguous: its rows are refused with a hint', () => {
    const r = refused(readCsvTable('Time (min),Temp (°C)\n0,70,2\n10,61,5\n', T_MIN_DEGC));
    assert.equal(r.problems.length, 2);
    assert.match(r.problems[0].message, /3 fields; the header has 2 .*: if the file writes decimal commas \(70,5\), export it with semicolons between fields \(0;70,5\)/);
  });

  it('a tab-separated paste reads decimal commas too', () => {
    const r = ok(readCsvTable('t\tT\n0\t70,5\n', T_MIN_DEGC));
    assert.deepEqual(r.rows, [[0, 70.5]]);
  });
});

describe('clock times and timestamps as the time column', () => {
  it('"Date Time,Temperature (°F)" with timestamps: minutes since the first row', () => {
    const csv = 'Date Time,Temperature (°F)\n2026-05-01 10:00,165\n2026-05-01 10:30,132.5\n2026-05-01 11:15,101.0\n';
    const r = ok(readCsvTable(csv, [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degF' }]));
    // hand-worked: 10:30 - 10:00 = 30 min; 11:15 - 10:00 = 75 min
    assert.deepEqual(r.rows, [[0, 165], [30, 132.5], [75, 101]]);
    assert.equal(r.start, '2026-05-01 10:00');
    assert.ok(r.notes.includes('times are dates and times, read as min since the first row; starts 2026-05-01 10:00'), r.notes.join('\n'));
    const report = dataReport(csv, [{ name: 't', unit: 'min' }, { name: 'T', unit: 'degF' }]);
    assert.equal(report.ok, true, JSON.stringify(report.error));
    assert.equal((report.csv as { start: string }).start, '2026-05-01 10:00');
  });

  it('ISO timestamps with seconds, in the cell\'s time unit (hours), across a day', () => {
    const r = ok(readCsvTable('Timestamp,Temp\n2026-05-01T22:00:00,5\n2026-05-02T01:30:00,6\n', [{ name: 'when', unit: 'h' }, { name: 'T', unit: 'degC' }]));
    // hand-worked: from 22:00 on 1 May to 01:30 on 2 May is 2 h + 1.5 h = 3.5 h
    assert.deepEqual(r.rows, [[0, 5], [3.5, 6]]);
  });

  it('timestamps with a zone: the elapsed time counts the offsets', () => {
    const r = ok(readCsvTable('Timestamp,Temp\n2026-10-25T02:30:00+02:00,5\n2026-10-25T02:10:00+01:00,6\n', T_MIN_DEGC));
    // hand-worked: 02:30+02:00 is 00:30 UTC, 02:10+01:00 is 01:10 UTC: 40 min apart
    assert.deepEqual(r.rows, [[0, 5], [40, 6]]);
  });

  it('clock times with seconds: 10:00:30 is half a minute after 10:00', () => {
    const r = ok(readCsvTable('Clock,Temp\n10:00,70\n10:00:30,69.5\n10:02:15,68\n', T_MIN_DEGC));
    // hand-worked: 10:00:30 - 10:00 = 30 s = 0.5 min; 10:02:15 - 10:00 = 135 s = 2.25 min
    assert.deepEqual(r.rows, [[0, 70], [0.5, 69.5], [2.25, 68]]);
    assert.equal(r.start, '10:00');
  });

  it('clock times default to minutes when the cell\'s time column has no time unit', () => {
    const r = ok(tableFromCsv('Clock,Temp (°C)\n2:00 PM,70\n2:45 PM,52\n', []));
    // hand-worked: 14:45 - 14:00 = 45 min
    assert.deepEqual(r.rows, [[0, 70], [45, 52]]);
    assert.deepEqual(r.columns[0], { name: 'Clock', unit: 'min', unitFrom: 'elapsed', header: 'Clock', position: 0 });
  });

  it('clock times passing midnight roll over to the next day, and the notes say so', () => {
    const r = ok(readCsvTable('Clock,Temp (°C)\n23:40,8.0\n23:50,7.6\n00:10,7.1\n00:40,6.5\n', T_MIN_DEGC));
    // hand-worked: 23:50 - 23:40 = 10 min; 00:10 the next day - 23:40 = 20 + 10 = 30 min; 00:40 → 60 min
    assert.deepEqual(r.rows, [[0, 8], [10, 7.6], [30, 7.1], [60, 6.5]]);
    assert.ok(r.notes.includes('the clock passes midnight before row 3 ("00:10"): read as the next day'), r.notes.join('\n'));
    assert.equal(r.start, '23:40');
  });

  it('a clock that falls back more than half a day is refused, not rolled over', () => {
    const r = refused(readCsvTable('Clock,Temp\n10:00,5\n09:00,6\n', T_MIN_DEGC));
    assert.match(r.problems[0].message, /the time "09:00" comes before "10:00" on the row above; if a day passed between them, give dates/);
  });

  it('refuses mixed formats in the time column on the row', () => {
    const mixed = refused(readCsvTable('Clock,Temp\n10:00,5\n2026-05-01 10:10,6\n10:20,7\n', T_MIN_DEGC));
    assert.deepEqual(mixed.problems.map((p) => p.row), [2]);
    assert.match(mixed.problems[0].message, /"2026-05-01 10:10" is a date and time; the first row's time "10:00" is a clock time: give the times in one format/);
    const numbers = refused(readCsvTable('t,T\n0,5\n10:30,6\n', T_MIN_DEGC));
    assert.match(numbers.problems[0].message, /"10:30" is a clock time; the rows above give numbers/);
  });

  it('refuses a date written day first, and an impossible time', () => {
    assert.match(refused(readCsvTable('When,Temp\n01/05/2026 10:00,5\n', T_MIN_DEGC)).problems[0].message, /write dates year first/);
    assert.match(refused(readCsvTable('When,Temp\n10:00,5\n24:10,6\n', T_MIN_DEGC)).problems[0].message, /"24:10" is not a clock time/);
  });

  it('clock times need a time column with a time unit', () => {
    assert.match(refused(readCsvTable('When,Temp\n10:00,5\n', [{ name: 't', unit: '1' }, { name: 'T', unit: 'degC' }])).message, /is in min \(time since the first row\); the cell's column t is in 1/);
  });
});

describe('what the reader keeps from before', () => {
  it('a header row is required, and an empty text is said to be empty', () => {
    assert.match(refused(readCsvTable('0,70\n10,61\n', T_MIN_DEGC)).message, /line 1 \("0,70"\) is a row of values: start with a header row/);
    assert.match(refused(readCsvTable('  \n', T_MIN_DEGC)).message, /the CSV text is empty/);
  });

  it('a first row without its time is a row, not a header', () => {
    const r = ok(readCsvTable('t,T\n,70\n10,61\n', T_MIN_DEGC));
    assert.deepEqual(r.rows, [[null, 70], [10, 61]]);
    assert.match(dataReport('t,T\n,70\n10,61\n').error!.message, /row 1 has no time \(t\)/);
  });

  it('an unclosed quote names its line', () => {
    assert.match(refused(readCsvTable('t,T\n0,1\n"5,2\n', T_MIN_DEGC)).message, /cannot be read \(line 3\)/);
  });
});
