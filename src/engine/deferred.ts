/**
 * A session's deferred work (`SessionOptions.defer`, as in the app's worker). In an
 * evaluation, a node with `slices` (engine/sliced.ts) whose inputs changed is not run: it is
 * left pending, and so is every node that reads a name a pending node defines; they keep their
 * previous outcomes, which the page shows as not current. `step` then runs the first pending
 * node in run order a slice at a time, and gives back its outcome when it is done, for the
 * session to evaluate again (which runs what reads it, or starts the next pending node).
 *
 * A running job whose inputs change (or that reads a name now pending) is dropped and starts
 * again from its first unit on the new values; one whose inputs do not change goes on. Its work
 * meter's units carry over from slice to slice, so its budget is the one `run` would have.
 *
 * Each pending node remembers when an edit last changed its inputs (its stamp): `step` starts
 * only a node stamped at or before the time it is given (the app's worker gives "100 ms ago", so
 * that a dragged slider does not start work the next position throws away), while work whose
 * inputs the edits did not reach starts, or goes on, at once. A node that reads a name a pending
 * node defines never starts before that node is done.
 */
import type { CellError, GraphNode, Outcome, RunContext } from './node.ts';
import { metered, WorkExceeded } from '../numerics/work-meter.ts';
import { isSliced, type Progress, type SlicedRun } from './sliced.ts';

/** What the session lends its deferred work. */
export interface DeferHost {
  /** The keys of the current graph in run order, and a key's node. */
  readonly order: readonly string[];
  node(key: string): GraphNode | undefined;
  /** A node's change signature as the evaluation computes it (`StudySession.staticSig`). */
  staticSig(key: string): string;
  /** The context a node runs in, or the error of a node that waits on a failed input. */
  context(node: GraphNode): RunContext | { readonly waits: CellError };
  /** The units of work a node may use, and the performance.now() time its work must end by. */
  budget(node: GraphNode): { readonly limit: number; readonly deadline: number };
  /** The outcome of a node stopped by its budget or the clock, and of one that threw. */
  stopped(node: GraphNode, stop: WorkExceeded): Outcome;
  internal(node: GraphNode, err: unknown): Outcome;
  /** Runs a node at once (a pending node without slices: not expected, as its pending input comes first). */
  runNow(node: GraphNode): Outcome;
}

/** How a node stands in an evaluation, for `defers`. */
export interface NodeStanding {
  /** Its change signature in this evaluation. */
  readonly sig: string;
  /** Its previous outcome still holds (same signature, no input changed, not left pending before). */
  readonly keep: boolean;
  /** A name it reads changed in this evaluation. */
  readonly inputsChanged: boolean;
  /** It reads a name a pending node defines. */
  readonly readsPending: boolean;
  /** It fails with a problem of its own (a node that cannot run is never deferred: its error shows at once). */
  readonly problem: boolean;
  /** It would wait on a failed input that is not pending (never deferred either: the wait shows at once). */
  readonly waits: boolean;
}

/** A finished node: its outcome and the signature it was computed under. */
export interface Finished {
  readonly key: string;
  readonly sig: string;
  readonly outcome: Outcome;
}

interface Job {
  readonly key: string;
  readonly node: GraphNode;
  readonly sig: string;
  readonly run: SlicedRun;
  readonly limit: number;
  readonly deadline: number;
  used: number;
}

export class DeferredWork {
  /** Keys of the pending nodes, as the last evaluation left them. */
  private pending = new Set<string>();
  private next = new Set<string>();
  /** Pending nodes that read a name a pending node defines: they start only after it. */
  private blocked = new Set<string>();
  private nextBlocked = new Set<string>();
  /** By pending node: its signature in the last pass, and when an edit last changed its inputs (performance.now()). */
  private sigs = new Map<string, string>();
  private stamps = new Map<string, number>();
  /** The pass's edit time; undefined for a pass after a node finished (no edit). */
  private editedAt?: number;
  private job?: Job;

  /** Starts an evaluation's pass: `editedAt`, the time of the edit it applies (none when a node has finished, or at opening). */
  begin(editedAt?: number): void {
    this.next = new Set();
    this.nextBlocked = new Set();
    this.editedAt = editedAt;
  }

  /** For each node in run order: true when it is left pending (not run in this evaluation). */
  defers(key: string, node: GraphNode, s: NodeStanding): boolean {
    const wait = !s.problem && !s.waits && (s.readsPending || (!!node.slices && !s.keep));
    const job = this.job;
    if (job?.key === key && (!wait || s.readsPending || s.inputsChanged || s.sig !== job.sig || job.node !== node)) this.job = undefined;
    if (!wait) return false;
    this.next.add(key);
    if (s.readsPending) this.nextBlocked.add(key);
    // an edit that reaches its inputs (or first leaves it pending) stamps it; a pass after a
    // node finished keeps its stamp, so what waited for that node starts at once
    const touched = !this.pending.has(key) || s.inputsChanged || s.sig !== this.sigs.get(key);
    if (touched && this.editedAt !== undefined) this.stamps.set(key, this.editedAt);
    else if (!this.stamps.has(key)) this.stamps.set(key, -Infinity);
    this.sigs.set(key, s.sig);
    return true;
  }

  /** Ends the pass: the nodes it left pending are the pending ones. */
  end(): void {
    this.pending = this.next;
    this.blocked = this.nextBlocked;
    for (const map of [this.sigs, this.stamps]) for (const key of [...map.keys()]) if (!this.pending.has(key)) map.delete(key);
    if (this.job && !this.pending.has(this.job.key)) this.job = undefined;
  }

  /**
   * When nothing is running and no pending node may start by `startable` (each was stamped
   * later), the earliest stamp among those that could start: the caller comes back once it is
   * old enough. Undefined when a node is running or may start.
   */
  notBefore(startable: number): number | undefined {
    if (this.job) return undefined;
    let earliest = Infinity;
    for (const key of this.pending) {
      if (this.blocked.has(key)) continue;
      const at = this.stamps.get(key) ?? -Infinity;
      if (at <= startable) return undefined;
      earliest = Math.min(earliest, at);
    }
    return earliest === Infinity ? undefined : earliest;
  }

  /** Whether a node is pending. */
  has(key: string): boolean {
    return this.pending.has(key);
  }

  get size(): number {
    return this.pending.size;
  }

  /** How far the running job is; undefined before its first slice. */
  progress(): Progress | undefined {
    const j = this.job;
    return j && { cell: j.node.cell, done: j.run.done, total: j.run.total, unit: j.run.unit };
  }

  /**
   * Works on the running node, else on the first pending node in run order that reads no pending
   * name and was stamped at or before `startable`, until `until` (performance.now() times), at
   * least one unit of it; its outcome when it is done (the session stores it, then calls
   * `finished`). Does nothing when no node may start (see `notBefore`).
   */
  step(until: number, host: DeferHost, startable = Infinity): Finished | undefined {
    if (!this.job) {
      const key = host.order.find((k) => this.pending.has(k) && !this.blocked.has(k) && (this.stamps.get(k) ?? -Infinity) <= startable);
      const node = key !== undefined ? host.node(key) : undefined;
      if (key === undefined || !node) return undefined;
      const sig = host.staticSig(key);
      if (!node.slices) return { key, sig, outcome: host.runNow(node) };
      const ctx = host.context(node);
      if ('waits' in ctx) return { key, sig, outcome: { ok: false, error: ctx.waits } };
      const { limit, deadline } = host.budget(node);
      const job = { key, node, sig, limit, deadline, used: 0 } as Omit<Job, 'run'> & { run?: SlicedRun };
      const started = this.metered(job as Job, host, () => node.slices!(ctx));
      if (started.outcome) return { key, sig, outcome: started.outcome };
      if (!isSliced(started.value!)) return { key, sig, outcome: started.value! };
      job.run = started.value;
      this.job = job as Job;
    }
    const job = this.job;
    const stepped = this.metered(job, host, () => job.run.step(until));
    let outcome = stepped.outcome;
    if (!outcome) {
      if (!stepped.value) return undefined;
      const f = this.metered(job, host, () => job.run.finish());
      outcome = f.outcome ?? f.value!;
    }
    this.job = undefined;
    return { key: job.key, sig: job.sig, outcome };
  }

  /** The node whose outcome `step` gave is no longer pending. */
  finished(key: string): void {
    this.pending.delete(key);
    this.sigs.delete(key);
    this.stamps.delete(key);
  }

  /** Runs part of a job under its meter, the units used so far carried over; a stop or a throw as the node's outcome. */
  private metered<T>(job: Job, host: DeferHost, fn: () => T): { value?: T; outcome?: Outcome } {
    try {
      const r = metered(job.limit - job.used, job.deadline, fn);
      job.used += r.used;
      if (r.exceeded) return { outcome: host.stopped(job.node, new WorkExceeded(r.exceeded.reason, job.limit)) };
      return { value: r.value };
    } catch (err) {
      return { outcome: host.internal(job.node, err) };
    }
  }
}
