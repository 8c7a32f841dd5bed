/**
 * The unit of evaluation: a graph node. A cell is compiled into one or more nodes (a
 * parameters cell into one per parameter, a rate cell into its state and its law), each
 * declaring the names it defines and the names it reads. The graph orders and re-runs nodes;
 * a node never reads a name it did not declare.
 */
import type { SlicedRun } from './sliced.ts';
import type { Quantity } from '../units/quantity.ts';
import type { DisplayUnit } from '../units/units.ts';
import type { Expr } from '../expression/ast.ts';
import type { StudyUnits } from '../units/simplest-unit.ts';
import type { Replacement, WhatIfPrepared } from './what-if.ts';

/**
 * The kinds of problem a cell can have:
 * - `shape`: a field is missing or not of its type (the document check, or a field that is not text);
 * - `syntax`: an expression that does not parse;
 * - `unknown-name`: a name, or a cell id, that nothing defines;
 * - `misplaced`: a name used or defined where it means nothing (a state outside rate laws, `t`);
 * - `duplicate`: a name or cell id defined twice;
 * - `cycle`: a circular definition;
 * - `waits`: an input this node reads failed upstream (`waitsOn` names its cell);
 * - `unit`: a unit that is not one, or a value of the wrong dimension;
 * - `invalid`: a value or reference that cannot serve (out of order, out of range, of the wrong kind);
 * - `numeric`: the numerics failed (a run that stopped, a fit that could not start, a value not finite);
 * - `internal`: an unexpected failure inside the engine.
 */
export const PROBLEM_KINDS = ['shape', 'syntax', 'unknown-name', 'misplaced', 'duplicate', 'cycle', 'waits', 'unit', 'invalid', 'numeric', 'internal'] as const;
export type ProblemKind = (typeof PROBLEM_KINDS)[number];

/** A piece of a message: text, or a place in the study (a contract path) that the app writes in words. */
export type MessagePart = string | { readonly path: string };

/** A problem for the user, on the field it is about; `message` is made from the other fields. */
export interface CellError {
  readonly kind: ProblemKind;
  readonly message: string;
  /** Contract path, such as `cells[1].rate`. */
  readonly path: string;
  /** [start, end) in that field's text, when known. */
  readonly span?: readonly [number, number];
  /** For `waits`: the id of the upstream cell waited on. */
  readonly waitsOn?: string;
  /**
   * For `waits`: where the failure began and its own reason, carried down a chain of waits so
   * that each waiting cell names it once (never the chain of messages). Not in the report.
   */
  readonly cause?: { readonly cell: string; readonly reason: string; readonly name?: string };
  /**
   * For `waits` whose chain ends at a cell with no problem of its own that left a name
   * undefined (a crossing not reached, a profile result not defined): that cell, the name and
   * the definer's reason, so the app can say why without reading `message`. In the report.
   */
  readonly undefinedName?: UndefinedName;
  /**
   * The message as text and places, when it names another place of the study: `message`
   * writes each place as its path (for the JSON report and the command line), the app and the
   * sheet write it in words (`output/problem-words.ts`).
   */
  readonly parts?: readonly MessagePart[];
}

/** A name its definer computed without error but left undefined, and why (the definer's words). */
export interface UndefinedName {
  readonly cell: string;
  readonly name: string;
  readonly reason: string;
}

/** A note on the whole study (a report warning): its text with paths, and the same as parts for words. */
export interface StudyNote {
  readonly text: string;
  readonly parts: readonly MessagePart[];
}

/** A message's parts as text, each place written by `place` (its path, by default). */
export function partsText(parts: readonly MessagePart[], place: (path: string) => string = (p) => p): string {
  return parts.map((x) => (typeof x === 'string' ? x : place(x.path))).join('');
}

/** A name as one node defines it. Cell references are names too: `#cooling`. */
export interface Definition {
  readonly name: string;
  readonly path: string;
}

/** A name as one node reads it, with the field that mentions it. */
export interface Use {
  readonly name: string;
  readonly path: string;
  readonly text?: string;
  /**
   * The field can read states: a rate law, an event's amount under add or infuse, the state an
   * event or a question names. Elsewhere a state's name that is spelled like a unit is that
   * unit (`every: "12 h"` with a state `h`), and any other state's name is an error.
   */
  readonly readsStates?: boolean;
  /** The node runs without it when it is unavailable (it reads it only to show it). */
  readonly optional?: boolean;
  /**
   * With `optional`: the node still waits when the name's definer failed with an error (a
   * problem of its own, or a wait whose cause is one), and runs without it only when the name
   * was left undefined with a reason another value may change (a crossing not reached): an
   * uncertainty cell's names, whose samples cannot mend a bad input upstream.
   */
  readonly waitsOnError?: boolean;
}

/** What a name is bound to after its node ran. `sig` decides whether it changed. */
export type Binding =
  /**
   * `truth` for a parameter that is a condition: q is then the plain number 1 or 0. `spread`
   * for a value that is uncertain (a parameter's spread, a fit's estimate); its `sig` then
   * says the spread too.
   */
  | { readonly kind: 'value'; readonly q: Quantity; readonly sig: string; readonly truth?: boolean; readonly spread?: InputSpread }
  | { readonly kind: 'state'; readonly q: Quantity; readonly unit: DisplayUnit; readonly cell: string; readonly sig: string }
  | { readonly kind: 'law'; readonly law: Law; readonly sig: string }
  | { readonly kind: 'data'; readonly cell: string; readonly sig: string; readonly table: DataTable }
  /** Measurements of states, in SI (a fit cell's observed columns), for plots of those states. */
  | { readonly kind: 'measured'; readonly cell: string; readonly sig: string; readonly series: readonly MeasuredSeries[] }
  /** A simulate cell's run as a model for a fit: made from the run's inputs only, never its results (`cells/run-model.ts`). */
  | { readonly kind: 'model'; readonly cell: string; readonly sig: string; readonly model: RunModel };

/**
 * How uncertain a value is, in SI: a parameter's spread (`normal` with its SD, `lognormal`
 * with the SD of its log, the value being the median, `uniform` between two values), or a
 * fit's estimate as entry `index` of its fit's joint normal.
 */
export type InputSpread =
  | { readonly kind: 'normal'; readonly sd: number }
  | { readonly kind: 'lognormal'; readonly sigma: number }
  | { readonly kind: 'uniform'; readonly from: number; readonly to: number }
  | { readonly kind: 'joint'; readonly joint: JointNormal; readonly index: number };

/**
 * A fit's estimates as a joint normal (the fit's covariance): on the working scale of each,
 * log P where `logScale` (an estimate with a prior), P otherwise. One object shared by the
 * estimates of one fit.
 */
export interface JointNormal {
  /** The fit cell's id. */
  readonly cell: string;
  readonly names: readonly string[];
  readonly center: Float64Array;
  /** n×n, row-major, on the working scale. */
  readonly covariance: Float64Array;
  readonly logScale: readonly boolean[];
}

/**
 * A simulate cell's run, to be run again with some of its inputs replaced: its laws, span and
 * whole schedule. Made by the cell's model node from the inputs alone, so a fit through the run
 * does not wait on the run's results (and a second run may use the fit's estimates).
 */
export interface RunModel {
  /** The laws integrated, in state order (those coupled to the named ones included). */
  readonly laws: readonly Law[];
  /** The run's span in SI seconds, and the unit its end is written in. */
  readonly from: number;
  readonly to: number;
  readonly timeUnit: DisplayUnit;
  /** The parameters the laws and the events read directly (no states, units or constants). */
  readonly reads: readonly string[];
  /** Their values now, by name. */
  readonly values: ReadonlyMap<string, Quantity>;
  /**
   * The run with some parameters and states' starting values replaced (SI, by name), at
   * tolerances tight enough for differences (relative 1e-10), sampled at `times` (within the
   * span, ascending): values[k][i] is state i at times[k], after any jump at that time. A
   * run that fails, or a field that cannot be evaluated with these values, gives a message.
   */
  run(replaced: ReadonlyMap<string, number>, times: readonly number[]): { readonly values?: Float64Array[]; readonly message?: string };
  /**
   * The run with these values drawn over its whole span: about `points` times spread evenly,
   * and both ends of every piece between actions, so each jump shows (for plots). With `own`,
   * at the run's own tolerances instead of the model's tight ones (a plot of the run itself).
   * `values` holds state i at `t[k]` at `k * laws.length + i` (one array, not one per time).
   */
  curve(replaced: ReadonlyMap<string, number>, points: number, own?: boolean): { readonly t?: number[]; readonly values?: number[]; readonly message?: string };
  /**
   * The run with these values at its own tolerances, at fixed times (SI, ascending): state i at
   * times[k] is written to out[i * times.length + k]; where `before[k]` is 1, the value just
   * before the actions at that time (the left side of a dose). A message when the run fails.
   */
  sampleAt(replaced: ReadonlyMap<string, number>, times: Float64Array, before: Uint8Array, out: Float64Array): string | undefined;
  /** The times (SI) at which a state jumps (`add` events) in the last run or curve made. */
  jumps(): readonly number[];
}

/** One state's measurements: times and values in SI. */
export interface MeasuredSeries {
  readonly state: string;
  readonly t: readonly number[];
  readonly y: readonly number[];
}

/** A checked rate law, ready for the numerics. */
export interface Law {
  readonly cell: string;
  readonly state: string;
  readonly stateUnit: DisplayUnit;
  readonly initial: Quantity;
  readonly expr: Expr;
  readonly text: string;
  /** Study names the law reads (parameters, states, and `t`). */
  readonly reads: readonly string[];
  /** The states it reads (its own included), each with the rate cell that defines it. */
  readonly states: ReadonlyMap<string, string>;
  /** The quantities of the names it reads, as the law was checked. */
  readonly scope: ReadonlyMap<string, Quantity>;
}

/** A table of measurements: SI magnitudes per column (null where a value is missing); the first column is time. */
export interface DataTable {
  readonly columns: ReadonlyArray<{ readonly name: string; readonly unit: DisplayUnit }>;
  readonly rows: ReadonlyArray<ReadonlyArray<number | null>>;
}

/** What a node sees while it runs. */
export interface RunContext {
  /** The binding of a declared name; undefined for units, constants and `t`. */
  binding(name: string): Binding | undefined;
  /**
   * 'check' validates only; heavy cells skip their numerics. 'what-if' computes the bindings
   * alone (`engine/what-if.ts`): a cell may leave its output empty, and must skip what only
   * its report needs (plot data, texts, display formatting); its bindings and reasons must
   * equal those of 'run'.
   */
  readonly mode: 'run' | 'check' | 'what-if';
  /** The study names a declared name is computed from, directly or through others. */
  upstream(name: string): ReadonlySet<string>;
  /** Every available binding of that kind among the names the node reads (those the graph added included). */
  bindingsOf<K extends Binding['kind']>(kind: K): Array<Extract<Binding, { kind: K }>>;
  /** The units the study's inputs are written in (engine/study-units.ts), for showing derived values. */
  readonly studyUnits?: StudyUnits;
  /**
   * A what-if evaluator (engine/what-if.ts) over the study's values as this node sees them: the
   * session's current bindings in a run, the outer what-if's values when the node itself runs
   * inside one (a nested what-if). For a node that varies a name upstream of names it reads (a
   * solve cell): its `uses` cover the varied name and every name its target reads, so all
   * that the evaluator plans over is computed before it runs. Prepare once per run.
   */
  whatIf?(wanted: readonly string[], replaced: readonly Replacement[]): WhatIfPrepared;
  /**
   * The binding of a name upstream of the names the node reads, for a node that sets
   * `readsUpstream` (an uncertainty cell looks there for spreads); undefined when unavailable.
   */
  peek?(name: string): Binding | undefined;
}

/** What a node's run gives: bindings for the names it defines and `output` (of type O) for its cell's report. */
export type Outcome<O extends object = object> =
  | {
    readonly ok: true;
    readonly bindings: ReadonlyMap<string, Binding>;
    readonly output: Readonly<O>;
    /** Why a defined name has no binding (a crossing that was not reached). */
    readonly reasons?: ReadonlyMap<string, string>;
  }
  | { readonly ok: false; readonly error: CellError; readonly bindings?: ReadonlyMap<string, Binding>; readonly output?: Readonly<O> };

/** A node whose run outputs O (its kind's `NodeOutput`) into its cell's report. */
export interface GraphNode<O extends object = object> {
  /** Unique in the study: `${cellId}/${part}`. */
  readonly key: string;
  readonly cell: string;
  readonly defines: readonly Definition[];
  readonly uses: readonly Use[];
  /** May read `t` (rate laws and schedules). */
  readonly allowsTime: boolean;
  /** 'state' for a node that defines a state, 'law' for a rate law. */
  readonly role?: 'state' | 'law';
  /** For law nodes: the names whose laws are coupled to this one when they are states. */
  readonly couples?: readonly string[];
  /** Integrates laws: the graph adds the laws coupled to the ones it names to its uses. */
  readonly pullsCoupledLaws?: boolean;
  /** Defines measurements (a `measured` binding) under `name` of these states. */
  readonly measures?: { readonly name: string; readonly states: readonly string[] };
  /**
   * Shows measurements: the graph adds to its uses, as optional, every name that measures a
   * state of the laws it integrates (unless that would close a cycle).
   */
  readonly pullsMeasurements?: boolean;
  /**
   * Its result depends on how the names it reads are computed, not only on their values (a
   * solve cell re-runs what lies between a parameter and its target): it runs again when any
   * name upstream of the names it reads changes.
   */
  readonly readsUpstream?: boolean;
  /**
   * The relative accuracy of the values it defines, where a numeric method bounds it: a run's
   * relative tolerance (`cells/simulate.ts`); NaN where no tolerance bounds it (a fixed step).
   * Absent: exact to round-off. A what-if over it reports the loosest (`WhatIf.accuracy`).
   */
  readonly accuracy?: number;
  /**
   * The node may use this many times a cell's work budget (default 1): an uncertainty cell
   * asks for one budget per 1,000 samples, as each sample is a run of part of the study.
   */
  readonly workScale?: number;
  /**
   * What to make smaller when the node's work budget runs out, in words after "its limit; "
   * (`engine/budget.ts`); by default a run's own knobs (its span, tolerance, step, sweeps,
   * repeats). An uncertainty cell's Monte Carlo names its samples.
   */
  readonly workAdvice?: string;
  /** Said after the message of each node on a cycle through this node: why such a cycle arises and the way out. */
  readonly cycleHint?: string;
  /** Fails too with the problems the document check found in its cell (which go to a cell's first node). */
  readonly sharesShapeProblems?: boolean;
  /**
   * The path (relative to its cell, `@.items[2]`) of the fields this node alone holds: the
   * document check's problems under it fail this node only, not the cell's first, so another
   * item still runs and says its own errors, and a problem the check found is not found again
   * by the node's run.
   */
  readonly ownsFields?: string;
  /** Changes whenever the node's own text changes; equal signatures mean the same node. */
  readonly signature: string;
  /** Problems found while building (field shape, syntax): the node fails with the first. */
  readonly problems: readonly CellError[];
  run(ctx: RunContext): Outcome<O>;
  /**
   * A long run that can be done in slices (engine/sliced.ts): with `SessionOptions.defer` the
   * session runs it after the other nodes, a slice at a time; `run` gives the same outcome.
   */
  readonly slices?: (ctx: RunContext) => Outcome<O> | SlicedRun<O>;
}

/** The hidden name a cell is referred to by from other cells. */
export function cellRef(id: string): string {
  return `#${id}`;
}

/** The hidden name of the measurements a cell (a fit) makes of states. */
export function measuredRef(id: string): string {
  return `#${id}/measured`;
}
