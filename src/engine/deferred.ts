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
  /** It fails with a problem of its own (a node that cannot run is never deferred). */
  readonly problem: boolean;
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
  private job?: Job;

  /** Starts an evaluation's pass. */
  begin(): void {
    this.next = new Set();
  }

  /** For each node in run order: true when it is left pending (not run in this evaluation). */
  defers(key: string, node: GraphNode, s: NodeStanding): boolean {
    const wait = s.readsPending || (!!node.slices && !s.problem && !s.keep);
    const job = this.job;
    if (job?.key === key && (!wait || s.readsPending || s.inputsChanged || s.sig !== job.sig || job.node !== node)) this.job = undefined;
    if (wait) this.next.add(key);
    return wait;
  }

  /** Ends the pass: the nodes it left pending are the pending ones. */
  end(): void {
    this.pending = this.next;
    if (this.job && !this.pending.has(this.job.key)) this.job = undefined;
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
   * Works on the first pending node until `until` (a performance.now() time), at least one unit
   * of it; its outcome when it is done (the session stores it, then calls `finished`).
   */
  step(until: number, host: DeferHost): Finished | undefined {
    if (!this.job) {
      const key = host.order.find((k) => this.pending.has(k));
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
