/**
 * A study session: the one way to evaluate and change a study. Load a document, apply edits
 * to it, read the report. Each edit re-runs only the nodes whose own text changed or whose
 * inputs changed value, and says which cells re-ran and which cells' results changed.
 *
 * Nothing here throws for bad input: a bad document is refused with a message, a bad cell
 * carries its error, and an unexpected failure inside a cell is reported on that cell.
 */
import type { Study } from '../study/types.ts';
import { readStudy, type Problem } from '../study/validate.ts';
import type { Edit } from '../study/edit.ts';
import { SessionDocument } from './session-doc.ts';
import type { Binding, CellError, GraphNode, Outcome, RunContext } from './node.ts';
import { resolvePath } from '../cells/index.ts';
import { buildGraph, upstreamOf, type Graph } from './graph.ts';
import type { Replacement, WhatIfPrepared } from './what-if.ts';
import { prepareSessionWhatIf } from './session-what-if.ts';
import { hintedOutcome } from './session-hints.ts';
import type { Report } from './report.ts';
import type { EditResult, OpenResult, SessionOptions, WorkStep } from './session-api.ts';
import { studyUnits } from './study-units.ts';
import { type StudyUnits, studyUnitsKey } from '../units/simplest-unit.ts';
import { metered } from '../numerics/work-meter.ts';
import { DEFAULT_CELL_WORK, stoppedError } from './budget.ts';
import { DeferredWork, type DeferHost } from './deferred.ts';
import { bound, internalError, staticSignature, unavailable, waitingOn, type Slot } from './session-parts.ts';
import { CellNodes } from './session-nodes.ts';
import { ReportCache } from './session-report.ts';
import type { Progress } from './sliced.ts';


export type { Edit } from '../study/edit.ts';
export type { Replacement, WhatIfPrepared } from './what-if.ts';
export type { EditResult, OpenResult, SessionOptions, WorkStep } from './session-api.ts';

/** A pending name's slot while deciding whether a node waits: taken as bound, as its value is still to come. */
const PENDING_SLOT: Slot = { kind: 'pending' } as unknown as Slot;

/** Opens a study from JSON text or a parsed document. Never throws. */
export function openStudy(input: unknown, options: SessionOptions = {}): OpenResult {
  const read = readStudy(input);
  if (!read.ok) return read;
  return { ok: true, session: new StudySession(read.study, read.cellProblems, read.notes, options.mode ?? 'run', options) };
}

export class StudySession {
  private readonly doc: SessionDocument;
  private readonly notes: readonly string[];
  private readonly built = new CellNodes();
  private graph!: Graph;
  private readonly outcomes = new Map<string, Outcome>();
  private readonly staticSigs = new Map<string, string>();
  private readonly slots = new Map<string, Slot>();
  private readonly reports = new ReportCache();
  private lastReport!: Report;
  /** The units the study's inputs are written in, gathered once per evaluation. */
  private units!: StudyUnits;

  /** performance.now() after which the evaluation under way stops its cells (Infinity: none). */
  private deadline = Infinity;
  /** The long cells left for later, with `defer` (engine/deferred.ts). */
  private readonly deferred?: DeferredWork;

  constructor(study: Study, problems: ReadonlyMap<string, readonly Problem[]>, notes: readonly string[], private readonly mode: 'run' | 'check', private readonly limits: SessionOptions = {}) {
    if (limits.defer && mode === 'run') this.deferred = new DeferredWork();
    this.doc = new SessionDocument(study, problems);
    this.notes = notes;
    this.evaluate();
  }

  /** The current report. Cost: none; it is kept up to date by each edit. */
  report(): Report {
    return this.lastReport;
  }

  /** The study as it now stands, in the contract's format. */
  document(): Study {
    return this.doc.study(true);
  }

  /** Applies one edit. A refused edit changes nothing. Cost: the re-run cells plus O(nodes). */
  apply(edit: Edit): EditResult {
    return this.applyAll([edit]);
  }

  /**
   * Applies edits in order, then evaluates once: a batch of a slider's positions runs only the
   * last value. At a refused edit it stops: the edits before it stay applied (and evaluated),
   * and its problem is returned. Cost: one evaluation.
   */
  applyAll(edits: readonly Edit[]): EditResult {
    const at = performance.now();
    for (let i = 0; i < edits.length; i++) {
      const problem = this.doc.apply(edits[i]);
      if (!problem) continue;
      if (i > 0) this.evaluate(undefined, at);
      return { ok: false, error: problem };
    }
    const { rerun, changed } = this.evaluate(undefined, at);
    return { ok: true, rerun, changed, report: this.lastReport };
  }

  /**
   * Ids of the cells whose report is not current: a long cell still computing (see `work`),
   * and the cells that read what it defines. In document order; empty without `defer`.
   */
  pending(): string[] {
    const d = this.deferred;
    if (!d?.size) return [];
    return this.doc.cells.filter((c) => this.built.of(c.id).some((n) => d.has(n.key))).map((c) => c.id);
  }

  /** How far the pending cell being computed is; undefined when none has started. */
  progress(): Progress | undefined {
    return this.deferred?.progress();
  }

  /**
   * Computes the pending cells (with `defer`) until `until`, a performance.now() time: a slice
   * of the first (a few milliseconds past `until` at most: one sample). When a cell finishes,
   * the study is evaluated again (what reads it runs) and the answer says so. Undefined when
   * nothing is pending. Never throws.
   *
   * `startable` (a performance.now() time): a pending cell whose inputs an edit changed after
   * it does not start yet (`notBefore` says when the first of them was edited); a cell the edits
   * did not reach starts, or goes on, whatever the time. The app's worker gives "100 ms ago".
   */
  work(until: number, startable = Infinity): WorkStep | undefined {
    const d = this.deferred;
    if (!d?.size) return undefined;
    const notBefore = d.notBefore(startable);
    if (notBefore !== undefined) return { notBefore };
    const done = d.step(until, this.deferHost(), startable);
    if (!done) return { progress: d.progress() };
    const node = this.graph.nodes.get(done.key)!;
    this.outcomes.set(done.key, done.outcome);
    this.staticSigs.set(done.key, done.sig);
    d.finished(done.key);
    const { rerun, changed } = this.evaluate(new Set([node.cell]));
    return { progress: d.progress(), answer: { rerun, changed, report: this.lastReport } };
  }

  private deferHost(): DeferHost {
    return {
      order: this.graph.order,
      node: (key) => this.graph.nodes.get(key),
      staticSig: (key) => staticSignature(this.graph, key),
      context: (node) => {
        const waits = waitingOn(this.graph, node, (name) => this.slots.get(name));
        return waits ? { waits } : this.context(node);
      },
      budget: (node) => ({
        limit: (this.limits.cellWork ?? DEFAULT_CELL_WORK) * Math.max(1, node.workScale ?? 1),
        deadline: this.limits.timeLimit === undefined ? Infinity : performance.now() + this.limits.timeLimit * 1000,
      }),
      stopped: (node, stop) => ({ ok: false, error: stoppedError(node, stop, this.limits) }),
      internal: internalError,
      runNow: (node) => this.runNode(node, this.graph.problems.get(node.key)),
    };
  }

  /**
   * `finished`: cells whose deferred node has just been computed (reported as re-run);
   * `editedAt`: the time of the edits this evaluation applies (none at opening or after a finish).
   */
  private evaluate(finished?: ReadonlySet<string>, editedAt?: number): { rerun: string[]; changed: string[] } {
    // a rebuilt cell is reported again even when no node re-runs: its title, or a node it
    // no longer has, changes its report
    const rebuilt = new Set<string>();
    this.deadline = this.limits.timeLimit === undefined ? Infinity : performance.now() + this.limits.timeLimit * 1000;
    const list = this.built.all(this.doc.cells, this.doc.problems, rebuilt);
    this.units = studyUnits(this.doc.cells);
    // a parameter is shown in the study's units of its dimension: it runs again when they change
    const kinds = new Map(this.doc.cells.map((c) => [c.id, c.kind]));
    const unitsKey = (node: GraphNode, o: Outcome | undefined) => {
      if (kinds.get(node.cell) !== 'parameters') return '';
      const b = o?.bindings?.values().next().value;
      return b?.kind === 'value' ? `|units=${studyUnitsKey(this.units, b.q.dim)}` : '';
    };
    this.graph = buildGraph(list, (cell, path) => resolvePath(path, this.doc.indexOf(cell)), (id) => this.doc.cellName(id));
    const changedNames = new Set<string>();
    const rerunCells = new Set<string>(finished);
    // with `defer`: names of the nodes left pending in this pass
    const pendingNames = new Set<string>();
    this.deferred?.begin(editedAt);
    const liveKeys = new Set(list.map((n) => n.key));

    for (const key of [...this.outcomes.keys()]) {
      if (liveKeys.has(key)) continue;
      this.outcomes.delete(key);
      this.staticSigs.delete(key);
    }
    for (const name of [...this.slots.keys()]) {
      if (!this.graph.definers.has(name)) {
        this.slots.delete(name);
        changedNames.add(name);
      }
    }

    for (const key of this.graph.order) {
      const node = this.graph.nodes.get(key)!;
      const sources = this.graph.sources.get(key)!;
      const problem = this.graph.problems.get(key);
      const staticSig = staticSignature(this.graph, key);
      let inputsChanged = false;
      for (const [name, s] of sources) if ('node' in s && changedNames.has(name)) inputsChanged = true;
      if (node.readsUpstream && !inputsChanged && changedNames.size) {
        inputsChanged = [...sources.keys()].some((name) => [...upstreamOf(this.graph, name)].some((n) => changedNames.has(n)));
      }
      const kept = this.outcomes.get(key);
      // a node left pending before runs now (what it read may have changed meanwhile)
      const keep = !!kept && this.staticSigs.get(key) === staticSig + unitsKey(node, kept) && !inputsChanged && !this.deferred?.has(key);
      // a node that would be left pending but waits on a failed input that is not pending fails at once
      const waits = this.deferred && !keep && !problem && (node.slices || pendingNames.size)
        ? waitingOn(this.graph, node, (name) => (pendingNames.has(name) ? PENDING_SLOT : this.slots.get(name))) : undefined;
      // left for later: its previous outcome, bindings and report stay until `work` computes it
      if (this.deferred?.defers(key, node, { sig: staticSig, keep, inputsChanged, problem: !!problem, waits: !!waits,
        readsPending: pendingNames.size > 0 && [...sources.keys()].some((n) => pendingNames.has(n)) })) {
        for (const d of node.defines) pendingNames.add(d.name);
        continue;
      }
      const outcome = keep ? kept : waits ? { ok: false as const, error: waits } : this.runNode(node, problem);
      if (!keep) {
        this.outcomes.set(key, outcome);
        this.staticSigs.set(key, staticSig + unitsKey(node, outcome));
        rerunCells.add(node.cell);
      }
      // a kept outcome is bound again too: the reason a name is unavailable gives the path
      // of its definer's error, which changes when that cell moves
      for (const d of node.defines) {
        if (this.graph.definers.get(d.name) !== key) continue;
        const slot: Slot = outcome.bindings?.get(d.name) ?? unavailable(node, d.name, outcome, this.doc.indexOf(node.cell));
        const old = this.slots.get(d.name);
        if (!old || old.kind !== slot.kind || old.sig !== slot.sig) changedNames.add(d.name);
        this.slots.set(d.name, slot);
      }
    }

    this.deferred?.end();
    const { report, changed } = this.reports.update({
      cells: this.doc.cells,
      indexOf: (id) => this.doc.indexOf(id),
      nodesOf: (id) => this.built.of(id),
      sigOf: (id) => this.built.sigOf(id),
      outcome: (node) => this.reported(node),
    }, rerunCells, rebuilt, {
      title: this.doc.title,
      warnings: [...this.notes, ...this.graph.warnings.map((w) => w.text)],
      warningParts: [...this.notes.map((n) => [n]), ...this.graph.warnings.map((w) => [...w.parts])],
    });
    this.lastReport = report;
    return { rerun: this.doc.cells.filter((c) => rerunCells.has(c.id)).map((c) => c.id), changed };
  }

  private runNode(node: GraphNode, problem: CellError | undefined): Outcome {
    if (problem) return { ok: false, error: problem };
    const waiting = waitingOn(this.graph, node, (name) => this.slots.get(name));
    if (waiting) return { ok: false, error: waiting };
    const ctx = this.context(node);
    try {
      const done = metered((this.limits.cellWork ?? DEFAULT_CELL_WORK) * Math.max(1, node.workScale ?? 1), this.deadline, () => node.run(ctx));
      return done.exceeded ? { ok: false, error: stoppedError(node, done.exceeded, this.limits) } : done.value!;
    } catch (err) {
      return internalError(node, err);
    }
  }

  /** What a node sees while it runs: the session's bindings of the names it reads. */
  private context(node: GraphNode): RunContext {
    const sources = this.graph.sources.get(node.key)!;
    return {
      mode: this.mode,
      binding: (name) => (sources.has(name) ? bound(this.slots.get(name)) : undefined),
      bindingsOf: (kind) => [...sources.keys()].flatMap((name) => {
        const b = bound(this.slots.get(name));
        return b?.kind === kind ? [b as Extract<Binding, { kind: typeof kind }>] : [];
      }),
      upstream: (name) => this.upstream(name),
      studyUnits: this.units,
      whatIf: (wanted, replaced) => this.whatIf(wanted, replaced),
      ...(node.readsUpstream ? { peek: (name: string) => bound(this.slots.get(name)) } : {}),
    };
  }

  /**
   * A node's outcome as its cell's report shows it. A pending node's previous failure is not
   * shown: what it failed on has changed, and its new outcome is not known yet (its previous
   * figures, when it had some, stay, shown as such).
   */
  private reported(node: GraphNode): Outcome | undefined {
    const o = this.outcomes.get(node.key);
    if (o && !o.ok && this.deferred?.has(node.key)) return undefined;
    return hintedOutcome(this.graph, this.doc, node, o);
  }

  /**
   * A what-if evaluator over the study as it stands now (`engine/what-if.ts`): the `wanted`
   * names computed with the `replaced` parameters and states' initial values given new SI
   * values, re-running only the nodes between them, never touching this session. Planned
   * once here; each call of its `evaluate` only runs those nodes. It keeps answering for the
   * study as it was when prepared: prepare again after an edit. Never throws.
   */
  whatIf(wanted: readonly string[], replaced: readonly Replacement[]): WhatIfPrepared {
    return prepareSessionWhatIf(this.graph, this.doc.cells, this.units, (name) => this.slots.get(name), wanted, replaced);
  }

  /** Names `name` is computed from, following the graph's resolved sources. */
  private upstream(name: string): ReadonlySet<string> {
    return upstreamOf(this.graph, name);
  }
}
