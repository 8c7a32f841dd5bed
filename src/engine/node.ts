/**
 * The unit of evaluation: a graph node. A cell is compiled into one or more nodes (a
 * parameters cell into one per parameter, a rate cell into its state and its law), each
 * declaring the names it defines and the names it reads. The graph orders and re-runs nodes;
 * a node never reads a name it did not declare.
 */
import type { Quantity } from '../units/quantity.ts';
import type { DisplayUnit } from '../units/units.ts';
import type { Expr } from '../expression/ast.ts';
import type { StudyUnits } from '../units/simplest-unit.ts';

/** A message for the user, on the field it is about. */
export interface CellError {
  readonly message: string;
  /** Contract path, such as `cells[1].rate`. */
  readonly path: string;
  /** [start, end) in that field's text, when known. */
  readonly span?: readonly [number, number];
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
}

/** What a name is bound to after its node ran. `sig` decides whether it changed. */
export type Binding =
  /** `truth` for a parameter that is a condition: q is then the plain number 1 or 0. */
  | { readonly kind: 'value'; readonly q: Quantity; readonly sig: string; readonly truth?: boolean }
  | { readonly kind: 'state'; readonly q: Quantity; readonly unit: DisplayUnit; readonly cell: string; readonly sig: string }
  | { readonly kind: 'law'; readonly law: Law; readonly sig: string }
  | { readonly kind: 'data'; readonly cell: string; readonly sig: string; readonly table: DataTable };

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
  /** The units the study's inputs are written in (engine/study-units.ts), for showing derived values. */
  readonly studyUnits?: StudyUnits;
}

export type Outcome =
  | {
    readonly ok: true;
    readonly bindings: ReadonlyMap<string, Binding>;
    readonly output: Readonly<Record<string, unknown>>;
    /** Why a defined name has no binding (a crossing that was not reached). */
    readonly reasons?: ReadonlyMap<string, string>;
  }
  | { readonly ok: false; readonly error: CellError; readonly bindings?: ReadonlyMap<string, Binding>; readonly output?: Readonly<Record<string, unknown>> };

export interface GraphNode {
  /** Unique in the study: `${cellId}/${part}`. */
  readonly key: string;
  readonly cell: string;
  readonly defines: readonly Definition[];
  readonly uses: readonly Use[];
  /** May read `t` (rate laws and schedules). */
  readonly allowsTime: boolean;
  /** May read states (rate laws and schedules); elsewhere a state is an error. */
  readonly allowsStates: boolean;
  /** 'state' for a node that defines a state, 'law' for a rate law. */
  readonly role?: 'state' | 'law';
  /** For law nodes: the names whose laws are coupled to this one when they are states. */
  readonly couples?: readonly string[];
  /** Integrates laws: the graph adds the laws coupled to the ones it names to its uses. */
  readonly pullsCoupledLaws?: boolean;
  /** Changes whenever the node's own text changes; equal signatures mean the same node. */
  readonly signature: string;
  /** Problems found while building (field shape, syntax): the node fails with the first. */
  readonly problems: readonly CellError[];
  run(ctx: RunContext): Outcome;
}

/** The hidden name a cell is referred to by from other cells. */
export function cellRef(id: string): string {
  return `#${id}`;
}
