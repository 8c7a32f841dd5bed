/**
 * The command line: `ratebook run STUDY [--json] [--series]` and `ratebook check STUDY`.
 * Exit status: 0 every cell ok, 1 a cell has an error, 2 the file cannot be read or is not a
 * study (the study-format contract). Uses Node's file system; the engine itself does not.
 */
import { readFileSync } from 'node:fs';
import { runStudy, exitCodeOf } from '../engine/run.ts';
import { formatReport } from '../output/report-text.ts';
import type { Report } from '../engine/report.ts';

export const USAGE = `usage: ratebook run STUDY.json [--json] [--series]
       ratebook check STUDY.json

  run     evaluate every cell and print the report (a table; --json for the JSON report,
          --series to add each simulation's time series and the plot samples to it)
  check   read and check the study without running simulations or fits

exit status: 0 every cell is ok, 1 some cell has an error, 2 the file cannot be read or is
not a Ratebook study`;

export interface Io {
  out(text: string): void;
  err(text: string): void;
  read(path: string): string;
}

const nodeIo: Io = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
  read: (p) => readFileSync(p, 'utf8'),
};

/** Runs the command line; returns the exit status. */
export function main(argv: readonly string[], io: Io = nodeIo): number {
  const [command, ...rest] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    (command === undefined ? io.err : io.out)(`${USAGE}\n`);
    return command === undefined ? 2 : 0;
  }
  if (command !== 'run' && command !== 'check') {
    io.err(`ratebook: unknown command "${command}"\n${USAGE}\n`);
    return 2;
  }
  const flags = rest.filter((a) => a.startsWith('-'));
  const files = rest.filter((a) => !a.startsWith('-'));
  const allowed = command === 'run' ? ['--json', '--series'] : ['--json'];
  const unknown = flags.find((f) => !allowed.includes(f));
  if (unknown) {
    io.err(`ratebook: unknown option "${unknown}" for ${command}\n${USAGE}\n`);
    return 2;
  }
  if (files.length !== 1) {
    io.err(`ratebook: give exactly one study file\n${USAGE}\n`);
    return 2;
  }
  let text: string;
  try {
    text = io.read(files[0]);
  } catch (err) {
    io.err(`ratebook: cannot read ${files[0]}: ${(err as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (err as Error).message}\n`);
    return 2;
  }
  const result = runStudy(text, command === 'check' ? 'check' : 'run');
  if (!result.ok) {
    io.err(`ratebook: ${files[0]} is not a readable study${result.error.path ? ` (at ${result.error.path})` : ''}: ${result.error.message}\n`);
    return 2;
  }
  const json = flags.includes('--json');
  const report = flags.includes('--series') ? result.report : withoutSeries(result.report);
  io.out(json ? `${JSON.stringify(report, null, 2)}\n` : formatReport(report));
  return exitCodeOf(result);
}

/** The report without time series and plot samples, which only `--series` asks for. */
function withoutSeries(report: Report): Report {
  if (!report.cells.some((c) => 'series' in c || 'plot' in c)) return report;
  return { ...report, cells: report.cells.map(({ series: _series, plot: _plot, ...rest }) => rest) };
}
