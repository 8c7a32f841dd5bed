/**
 * The command line: `ratebook run STUDY [--json] [--series] [--timeout SECONDS]` and
 * `ratebook check STUDY`. Exit status: 0 every cell ok, 1 a cell has an error, 2 the file
 * cannot be read or is not a study (the study-format contract). Uses Node's file system; the
 * engine itself does not. It prints messages, never a JavaScript stack: a failure the engine
 * did not foresee is one line naming it, with exit status 2.
 */
import { readFileSync } from 'node:fs';
import { runStudy, exitCodeOf } from '../engine/run.ts';
import { formatReport } from '../output/report-text.ts';
import type { Report } from '../engine/report.ts';
import type { WorkLimits } from '../engine/budget.ts';

export const USAGE = `usage: ratebook run STUDY.json [--json] [--series] [--timeout SECONDS]
       ratebook check STUDY.json

  run     evaluate every cell and print the report (a table; --json for the JSON report,
          --series to add each simulation's time series and the plot samples to it;
          --timeout stops the cell computing when SECONDS have passed, and those after it,
          each with a message)
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

/**
 * Runs the command line; returns the exit status. Never throws. `limits` sets each cell's work
 * budget (the engine's default otherwise; the fuzz test gives a small one).
 */
export function main(argv: readonly string[], io: Io = nodeIo, limits: WorkLimits = {}): number {
  try {
    return command(argv, io, limits);
  } catch (err) {
    const what = err instanceof RangeError && /string length|call stack/i.test(err.message)
      ? 'the report is too large to print' : `an unexpected failure: ${err instanceof Error ? err.message : String(err)}`;
    io.err(`ratebook: ${what}\n`);
    return 2;
  }
}

function command(argv: readonly string[], io: Io, limits: WorkLimits): number {
  const [command, ...given] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    (command === undefined ? io.err : io.out)(`${USAGE}\n`);
    return command === undefined ? 2 : 0;
  }
  if (command !== 'run' && command !== 'check') {
    io.err(`ratebook: unknown command "${command}"\n${USAGE}\n`);
    return 2;
  }
  const timeout = timeoutOf(given);
  if (typeof timeout === 'string') {
    io.err(`ratebook: ${timeout}\n${USAGE}\n`);
    return 2;
  }
  const rest = timeout === undefined ? given : given.filter((_, i) => i !== timeout.at && i !== timeout.at + 1);
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
  const result = runStudy(text, command === 'check' ? 'check' : 'run', timeout ? { ...limits, timeLimit: timeout.seconds } : limits);
  if (!result.ok) {
    io.err(`ratebook: ${files[0]} is not a readable study${result.error.path ? ` (at ${result.error.path})` : ''}: ${result.error.message}\n`);
    return 2;
  }
  const json = flags.includes('--json');
  const report = flags.includes('--series') ? result.report : withoutSeries(result.report);
  io.out(json ? `${JSON.stringify(report, null, 2)}\n` : formatReport(report));
  return exitCodeOf(result);
}

/** `--timeout SECONDS` among the arguments: where it stands and its value, or what is wrong with it. */
function timeoutOf(args: readonly string[]): { at: number; seconds: number } | string | undefined {
  const at = args.indexOf('--timeout');
  if (at < 0) return undefined;
  if (args.indexOf('--timeout', at + 1) >= 0) return 'give --timeout once';
  const text = args[at + 1];
  const seconds = text === undefined ? NaN : Number(text);
  if (text === undefined || text.trim() === '' || !(seconds > 0) || !Number.isFinite(seconds)) {
    return `--timeout needs a number of seconds greater than zero${text === undefined ? '' : `, not "${text}"`}`;
  }
  return { at, seconds };
}

/** The report without time series and plot samples, which only `--series` asks for. */
function withoutSeries(report: Report): Report {
  if (!report.cells.some((c) => 'series' in c || 'plot' in c)) return report;
  return { ...report, cells: report.cells.map(({ series: _series, plot: _plot, ...rest }) => rest) };
}
