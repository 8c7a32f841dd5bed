/**
 * A fit through a run's schedule (`run` on a fit cell): the simulate cell's model (its laws,
 * span and whole schedule, `run-model.ts`), the parameters of it that may be estimated, and
 * the data's times checked against the run's clock. `fit.ts` calls these in place of its
 * laws-only model.
 */
import type { FitCell } from '../study/types.ts';
import type { Binding, DataTable, RunContext, RunModel } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import { type Quantity, describe } from '../units/quantity.ts';
import { TIME } from '../units/dimension.ts';
import { fail } from './fields.ts';

/** The model of the simulate cell the fit names in `run`; a message on `run` when it names another kind of cell. */
export function runModelOf(cell: FitCell, at: string, ctx: RunContext): RunModel {
  const b = ctx.binding(cellRef(cell.run!));
  if (b?.kind !== 'model') fail(`${at}.run`, `cell "${cell.run}" is not a simulate cell: a fit goes through a run (a simulate cell)`);
  return (b as Extract<Binding, { kind: 'model' }>).model;
}

/**
 * The quantity of a parameter the fit estimates through the run: one the run's laws or events
 * read directly. Refused, on `path`, when the run does not read it, or when the run reads a
 * name computed from it (that name would keep its value while the estimate moves).
 */
export function runParameter(model: RunModel, run: string, name: string, path: string, ctx: RunContext): Quantity {
  const q = model.values.get(name);
  const via = model.reads.find((n) => n !== name && ctx.upstream(n).has(name));
  if (via) {
    fail(path, `the run "${run}" reads "${via}", which is computed from "${name}": "${via}" would keep its value while "${name}" is estimated. Estimate "${via}", or write the run's laws and events with "${name}" itself`);
  }
  if (!q) fail(path, `the run "${run}" does not read "${name}" (its laws and events read: ${model.reads.join(', ') || 'no parameters'})`);
  return q;
}

/**
 * A note when data rows lie at the very time of a jump of the run (a dose): the run's value
 * there is the one after it, as its questions read it. Read after a run or curve of `model`.
 */
export function jumpTimeNote(model: RunModel, run: string, table: DataTable, ti: number): string | undefined {
  const jumps = model.jumps();
  const rows = table.rows.flatMap((row, r) => {
    const t = row[ti];
    return t !== null && jumps.some((j) => Math.abs(t - j) <= 1e-9 * Math.max(1, Math.abs(j))) ? [r + 1] : [];
  });
  if (rows.length === 0) return undefined;
  const many = rows.length > 1;
  return `row${many ? 's' : ''} ${rows.join(', ')} ${many ? 'are' : 'is'} at the very time of a dose in the run "${run}", so ${many ? 'they are' : 'it is'} fitted to the level just after that dose; a level drawn just before a dose (a trough) must be written a moment earlier`;
}

/**
 * Checks that every time in the data's time column lies within the run's span (the data's
 * times are on the run's clock); a message on `time` naming the first row outside.
 */
export function checkTimesInRun(model: RunModel, run: string, table: DataTable, ti: number, at: string): void {
  const unit = table.columns[ti].unit;
  const shown = (si: number) => describe({ si, dim: TIME, unit });
  const span = (): string => `${describe({ si: model.from, dim: TIME, unit: model.timeUnit })} to ${describe({ si: model.to, dim: TIME, unit: model.timeUnit })}`;
  table.rows.forEach((row, r) => {
    const t = row[ti];
    if (t === null) return;
    if (t < model.from || t > model.to) {
      fail(`${at}.time`, `row ${r + 1} is at ${shown(t)}, outside the run "${run}" (${span()}): the data's times are times on the run's clock`);
    }
  });
}
