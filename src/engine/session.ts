/**
 * A study session: the one way to evaluate and change a study. Load a document, apply edits
 * to it, read the report. Each edit re-runs only the nodes whose own text changed or whose
 * inputs changed value, and says which cells re-ran and which cells' results changed.
 *
 * Nothing here throws for bad input: a bad document is refused with a message, a bad cell
 * carries its error, and an unexpected failure inside a cell is reported on that cell.
 */
import type { Cell, Study } from '../study/types.ts';
import { readStudy, checkCell, type Problem } from '../study/validate.ts';
import { applyEdit, type Edit } from '../study/edit.ts';
import type { Binding, CellError, GraphNode, MessagePart, Outcome, RunContext } from './node.ts';
import { buildCellNodes, buildContext, resolvePath, CELL_PATH } from '../cells/index.ts';
import { buildGraph, upstreamOf, type Graph } from './graph.ts';
import { prepareWhatIf, type Replacement, type WhatIfPrepared } from './what-if.ts';
import { unitHints, withUnitHint } from './hidden-units.ts';
import { type CellReport, type Report, mergeOutput } from './report.ts';
import { cautionsFor } from '../study/cautions.ts';
import { glanceOf } from '../output/glance.ts';
import { KeptTex } from '../output/sheet-tex.ts';
import { studyUnits } from './study-units.ts';
import { type StudyUnits, studyUnitsKey } from '../units/simplest-unit.ts';
import { metered } from '../numerics/work-meter.ts';
import { DEFAULT_CELL_WORK, stoppedError, type WorkLimits } from './budget.ts';
import { DeferredWork, type DeferHost } from './deferred.ts';
import { bound, bounded, deepEqual, internalError, unavailable, waitingOn, type Slot } from './session-parts.ts';
import type { Progress } from './sliced.ts';


export type { Edit } from '../study/edit.ts';
export type { Replacement, WhatIfPrepared } from './what-if.ts';

/** What a name defined by a cell of each kind is called in messages. */
const KIND_WORDS: Partial<Record<string, string>> = { parameters: 'parameter', simulate: 'answer', fit: 'estimate', nca: 'result' };

export type EditResult =
  | { readonly ok: true; readonly rerun: readonly string[]; readonly changed: readonly string[]; readonly report: Report }
  | { readonly ok: false; readonly error: Problem };

export type OpenResult = { readonly ok: true; readonly session: StudySession } | { readonly ok: false; readonly error: Problem };

export interface SessionOptions extends WorkLimits {
  /** 'check' validates without the heavy numerics. */
  readonly mode?: 'run' | 'check';
  /**
   * Leave long cells (a Monte Carlo uncertainty cell) and what reads them pending in an
   * evaluation, for `work` to compute in slices afterwards (the app's worker); the figures are
   * the same as without.
   */
  readonly defer?: boolean;
}

/** What a slice of deferred work did: how far the running cell is, and the answer of an evaluation when a cell finished. */
export interface WorkStep {
  readonly progress?: Progress;
  readonly answer?: { readonly rerun: readonly string[]; readonly changed: readonly string[]; readonly report: Report };
}

/** Opens a study from JSON text or a parsed document. Never throws. */
export function openStudy(input: unknown, options: SessionOptions = {}): OpenResult {
  const read = readStudy(input);
  if (!read.ok) return read;
  return { ok: true, session: new StudySession(read.study, read.cellProblems, read.notes, options.mode ?? 'run', options) };
}

export class StudySession {
  private cells: Cell[];
  private title: string;
  private description?: string;
  private author?: string;
  private readonly cellProblems = new Map<string, readonly Problem[]>();
  private readonly notes: readonly string[];
  private readonly built = new Map<string, { sig: string; nodes: GraphNode[] }>();
  private graph!: Graph;
  private readonly outcomes = new Map<string, Outcome>();
  private readonly staticSigs = new Map<string, string>();
  private readonly slots = new Map<string, Slot>();
  /** By cell: the error messages its report was last written with (see hintText). */
  private readonly hintTexts = new Map<string, string>();
  /** Each cell's last report, with the position it was made at. */
  private readonly reports = new Map<string, { index: number; report: CellReport }>();
  private lastReport!: Report;
  /** The units the study's inputs are written in, gathered once per evaluation. */
  private units!: StudyUnits;
  /** Each cell's TeX for the printed sheet, made again when the cell or the study's names change. */
  private readonly tex = new KeptTex();

  /** performance.now() after which the evaluation under way stops its cells (Infinity: none). */
  private deadline = Infinity;
  /** The long cells left for later, with `defer` (engine/deferred.ts). */
  private readonly deferred?: DeferredWork;

  constructor(study: Study, problems: ReadonlyMap<string, readonly Problem[]>, notes: readonly string[], private readonly mode: 'run' | 'check', private readonly limits: SessionOptions = {}) {
    if (limits.defer && mode === 'run') this.deferred = new DeferredWork();
    this.cells = [...study.cells];
    this.title = study.title;
    this.description = study.description;
    this.author = study.author;
    for (const [id, p] of problems) this.cellProblems.set(id, p);
    this.notes = notes;
    this.evaluate();
  }

  /** The current report. Cost: none; it is kept up to date by each edit. */
  report(): Report {
    return this.lastReport;
  }

  /** The study as it now stands, in the contract's format. */
  document(): Study {
    return {
      format: 'ratebook-study',
      version: 1,
      title: this.title,
      ...(this.description !== undefined ? { description: this.description } : {}),
      ...(this.author !== undefined ? { author: this.author } : {}),
      cells: this.cells.map((c) => structuredClone(c)),
    };
  }

  /** Applies one edit. A refused edit changes nothing. Cost: the re-run cells plus O(nodes). */
  apply(edit: Edit): EditResult {
    const problem = this.applyToCells(edit);
    if (problem) return { ok: false, error: problem };
    const { rerun, changed } = this.evaluate();
    return { ok: true, rerun, changed, report: this.lastReport };
  }

  private applyToCells(edit: Edit): Problem | undefined {
    const out = applyEdit({
      format: 'ratebook-study', version: 1, title: this.title,
      ...(this.description !== undefined ? { description: this.description } : {}),
      ...(this.author !== undefined ? { author: this.author } : {}),
      cells: this.cells,
    }, edit);
    if (!out.ok) return out.error;
    this.positions = undefined;
    this.cells = out.study.cells;
    this.title = out.study.title;
    this.description = out.study.description;
    this.author = out.study.author;
    // a whole document brings the problems of all its cells; the cells it leaves unchanged
    // keep their nodes, so only what differs re-runs
    if (out.problems) {
      this.cellProblems.clear();
      for (const [id, p] of out.problems) this.cellProblems.set(id, p);
    }
    const live = new Set(this.cells.map((c) => c.id));
    for (const id of [...this.cellProblems.keys()]) if (!live.has(id)) this.cellProblems.delete(id);
    if (out.written) {
      const problems = checkCell(out.written as unknown as Record<string, unknown>, `cells[${this.indexOf(out.written.id)}]`);
      if (problems.length) this.cellProblems.set(out.written.id, problems);
      else this.cellProblems.delete(out.written.id);
    }
    return undefined;
  }

  private positions?: Map<string, number>;

  /** A cell's position; -1 when absent. Cost: O(1) after the first call since the last edit. */
  private indexOf(id: string): number {
    this.positions ??= new Map(this.cells.map((c, i) => [c.id, i]));
    return this.positions.get(id) ?? -1;
  }

  /** Nodes of every cell, rebuilt only for cells whose text changed. */
  private nodes(rebuilt: Set<string>): GraphNode[] {
    const all: GraphNode[] = [];
    const live = new Set<string>();
    this.cells.forEach((cell) => {
      live.add(cell.id);
      const sig = `${JSON.stringify(cell)}|${buildContext(cell, this.cells)}`;
      let entry = this.built.get(cell.id);
      if (!entry || entry.sig !== sig) {
        entry = { sig, nodes: this.withShapeProblems(cell, buildCellNodes(cell, this.cells)) };
        this.built.set(cell.id, entry);
        rebuilt.add(cell.id);
      }
      all.push(...entry.nodes);
    });
    for (const id of [...this.built.keys()]) if (!live.has(id)) this.built.delete(id);
    return all;
  }

  /** Field problems found by the document check fail the cell's first node, on their path. */
  private withShapeProblems(cell: Cell, nodes: GraphNode[]): GraphNode[] {
    const problems = this.cellProblems.get(cell.id);
    if (!problems?.length) return nodes;
    const errors: CellError[] = problems.map((p) => ({ kind: 'shape', message: p.message, path: p.path.replace(/^cells\[\d+\]/, CELL_PATH) }));
    if (nodes.length === 0) {
      return [{ key: `${cell.id}/shape`, cell: cell.id, defines: [], uses: [], allowsTime: false, signature: JSON.stringify(errors), problems: errors, run: () => ({ ok: true, bindings: new Map(), output: {} }) }];
    }
    return nodes.map((n, i) => (i === 0 || n.sharesShapeProblems ? { ...n, problems: [...errors, ...n.problems], signature: `${n.signature}|${JSON.stringify(errors)}` } : n));
  }

  /**
   * Ids of the cells whose report is not current: a long cell still computing (see `work`),
   * and the cells that read what it defines. In document order; empty without `defer`.
   */
  pending(): string[] {
    const d = this.deferred;
    if (!d?.size) return [];
    return this.cells.filter((c) => (this.built.get(c.id)?.nodes ?? []).some((n) => d.has(n.key))).map((c) => c.id);
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
   */
  work(until: number): WorkStep | undefined {
    const d = this.deferred;
    if (!d?.size) return undefined;
    const done = d.step(until, this.deferHost());
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
      staticSig: (key) => this.staticSig(key),
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

  /** A node's change signature: its own, where each name it reads comes from, its graph problem, what it defines. */
  private staticSig(key: string): string {
    const node = this.graph.nodes.get(key)!;
    const problem = this.graph.problems.get(key);
    let sig = node.signature;
    for (const [name, s] of this.graph.sources.get(key)!) sig += `|${name}=${'node' in s ? s.node : s.builtin}`;
    if (problem) sig += `|!${problem.path}:${problem.message}`;
    for (const d of node.defines) sig += `|${d.name}@${d.path}:${this.graph.definers.get(d.name) === key}`;
    return sig;
  }

  /** `finished`: cells whose deferred node has just been computed (reported as re-run). */
  private evaluate(finished?: ReadonlySet<string>): { rerun: string[]; changed: string[] } {
    // a rebuilt cell is reported again even when no node re-runs: its title, or a node it
    // no longer has, changes its report
    const rebuilt = new Set<string>();
    this.deadline = this.limits.timeLimit === undefined ? Infinity : performance.now() + this.limits.timeLimit * 1000;
    const list = this.nodes(rebuilt);
    this.units = studyUnits(this.cells);
    // a parameter is shown in the study's units of its dimension: it runs again when they change
    const kinds = new Map(this.cells.map((c) => [c.id, c.kind]));
    const unitsKey = (node: GraphNode, o: Outcome | undefined) => {
      if (kinds.get(node.cell) !== 'parameters') return '';
      const b = o?.bindings?.values().next().value;
      return b?.kind === 'value' ? `|units=${studyUnitsKey(this.units, b.q.dim)}` : '';
    };
    this.graph = buildGraph(list, (cell, path) => resolvePath(path, this.indexOf(cell)), (id) => this.cellName(id));
    const changedNames = new Set<string>();
    const rerunCells = new Set<string>(finished);
    // with `defer`: names of the nodes left pending in this pass
    const pendingNames = new Set<string>();
    this.deferred?.begin();
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
      const staticSig = this.staticSig(key);
      let inputsChanged = false;
      for (const [name, s] of sources) if ('node' in s && changedNames.has(name)) inputsChanged = true;
      if (node.readsUpstream && !inputsChanged && changedNames.size) {
        inputsChanged = [...sources.keys()].some((name) => [...upstreamOf(this.graph, name)].some((n) => changedNames.has(n)));
      }
      const kept = this.outcomes.get(key);
      // a node left pending before runs now (what it read may have changed meanwhile)
      const keep = !!kept && this.staticSigs.get(key) === staticSig + unitsKey(node, kept) && !inputsChanged && !this.deferred?.has(key);
      // left for later: its previous outcome, bindings and report stay until `work` computes it
      if (this.deferred?.defers(key, node, { sig: staticSig, keep, inputsChanged, problem: !!problem,
        readsPending: pendingNames.size > 0 && [...sources.keys()].some((n) => pendingNames.has(n)) })) {
        for (const d of node.defines) pendingNames.add(d.name);
        continue;
      }
      const outcome = keep ? kept : this.runNode(node, problem);
      if (!keep) {
        this.outcomes.set(key, outcome);
        this.staticSigs.set(key, staticSig + unitsKey(node, outcome));
        rerunCells.add(node.cell);
      }
      // a kept outcome is bound again too: the reason a name is unavailable gives the path
      // of its definer's error, which changes when that cell moves
      for (const d of node.defines) {
        if (this.graph.definers.get(d.name) !== key) continue;
        const slot: Slot = outcome.bindings?.get(d.name) ?? unavailable(node, d.name, outcome, this.indexOf(node.cell));
        const old = this.slots.get(d.name);
        if (!old || old.kind !== slot.kind || old.sig !== slot.sig) changedNames.add(d.name);
        this.slots.set(d.name, slot);
      }
    }

    this.deferred?.end();
    const changed: string[] = [];
    const reports: CellReport[] = [];
    // the TeX the printed sheet typesets, made here (in the app: in the engine's worker); made
    // again for a cell whose text changed, and for every cell when the study's names change
    // (they decide how a symbol is set)
    this.tex.study(this.cells);
    for (const cell of this.cells) {
      const old = this.reports.get(cell.id);
      let r = old;
      const index = this.indexOf(cell.id);
      const tex = this.tex.of(cell, this.built.get(cell.id)!.sig);
      if (!r || rerunCells.has(cell.id) || rebuilt.has(cell.id) || r.index !== index
        || (!r.report.ok && this.hintText(cell) !== this.hintTexts.get(cell.id))) r = { index, report: this.cellReport(cell, index, tex) };
      else if (!deepEqual(r.report.tex, tex)) {
        const { tex: _old, ...rest } = r.report;
        r = { index, report: (tex === undefined ? rest : { ...rest, tex }) as CellReport };
      }
      if (r !== old) {
        if (!old || !deepEqual(old.report, r.report)) changed.push(cell.id);
        this.reports.set(cell.id, r);
      }
      reports.push(r.report);
    }
    for (const id of [...this.reports.keys()]) if (this.indexOf(id) < 0) this.reports.delete(id);
    for (const id of [...this.hintTexts.keys()]) if (this.indexOf(id) < 0) this.hintTexts.delete(id);
    this.lastReport = this.studyReport(reports);
    return { rerun: this.cells.filter((c) => rerunCells.has(c.id)).map((c) => c.id), changed };
  }

  /** The report of the whole study from its cells' reports. */
  private studyReport(reports: CellReport[]): Report {
    return {
      title: this.title,
      ok: reports.every((c) => c.ok),
      warnings: [...this.notes, ...this.graph.warnings.map((w) => w.text)],
      warningParts: [...this.notes.map((n) => [n]), ...this.graph.warnings.map((w) => [...w.parts])],
      cautions: cautionsFor(this.cells),
      glance: glanceOf(this.cells, reports),
      cells: reports,
    };
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
   * A node's own error (not one it waits on) explained when its field reads a name that hides a
   * unit (hidden-units.ts). Added when the cell is reported, as it names where the name is
   * defined, which moves with its cell.
   */
  private hinted(node: GraphNode, o: Outcome | undefined): Outcome | undefined {
    if (!o || o.ok || this.graph.problems.has(node.key)) return o;
    return withUnitHint(o, unitHints(node, this.graph, (definer, def) => this.definedAt(definer, def.path)));
  }

  /** The hints a cell's errors carry, to tell when its report must be written again. */
  private hintText(cell: Cell): string {
    return (this.built.get(cell.id)?.nodes ?? []).map((n) => {
      const o = this.hinted(n, this.outcomes.get(n.key));
      return o && !o.ok ? o.error.message : '';
    }).join('\n');
  }

  /** A cell as warnings name it: its title, else its id. */
  private cellName(id: string): string {
    const title = this.cells[this.indexOf(id)]?.title;
    return typeof title === 'string' && title.trim() ? `"${title.trim()}"` : `cell "${id}"`;
  }

  /** What a definer's name is, and where: "the parameter defined at cells[0].items[1]", the place as a part. */
  private definedAt(definer: GraphNode, path: string): MessagePart[] {
    const kind = definer.role === 'state' ? 'state' : KIND_WORDS[this.cells[this.indexOf(definer.cell)]?.kind] ?? 'name';
    return [`the ${kind} defined at `, { path: resolvePath(path.replace(/\.name$/, ''), this.indexOf(definer.cell)) }];
  }

  /**
   * A what-if evaluator over the study as it stands now (`engine/what-if.ts`): the `wanted`
   * names computed with the `replaced` parameters and states' initial values given new SI
   * values, re-running only the nodes between them, never touching this session. Planned
   * once here; each call of its `evaluate` only runs those nodes. It keeps answering for the
   * study as it was when prepared: prepare again after an edit. Never throws.
   */
  whatIf(wanted: readonly string[], replaced: readonly Replacement[]): WhatIfPrepared {
    const graph = this.graph;
    const index = new Map(this.cells.map((c, i) => [c.id, i]));
    const kinds = new Map(this.cells.map((c) => [c.id, c.kind]));
    return prepareWhatIf({
      graph,
      studyUnits: this.units,
      slot: (name) => this.slots.get(name),
      cellKind: (id) => kinds.get(id),
      waitingOn: (node, slotOf) => waitingOn(graph, node, slotOf),
      unavailable: (node, name, outcome) => unavailable(node, name, outcome, index.get(node.cell) ?? -1),
      internalError,
    }, wanted, replaced);
  }

  /** Names `name` is computed from, following the graph's resolved sources. */
  private upstream(name: string): ReadonlySet<string> {
    return upstreamOf(this.graph, name);
  }

  /** A cell's report from its nodes' outcomes, with `tex` last (as a report whose TeX changed alone gets it). */
  private cellReport(cell: Cell, index: number, tex: CellReport['tex']): CellReport {
    const errors: CellError[] = [];
    const waits = new Set<string>();
    const output: Record<string, unknown> = {};
    for (const node of this.built.get(cell.id)?.nodes ?? []) {
      const o = this.hinted(node, this.outcomes.get(node.key));
      if (!o) continue;
      if (o.output) mergeOutput(output, o.output);
      if (!o.ok) {
        const { cause: _cause, ...error } = o.error;
        // two nodes of a cell that fail alike (a run and its model) report it once
        if (errors.some((e) => e.message === bounded(error.message) && e.path === resolvePath(o.error.path, index))) continue;
        errors.push({ ...error, message: bounded(error.message), path: resolvePath(o.error.path, index) });
        if (o.error.waitsOn !== undefined) waits.add(o.error.waitsOn);
      }
    }
    this.hintTexts.set(cell.id, this.hintText(cell));
    // one object literal: assigning the fields one by one after made each report a slow object
    const r: CellReport = { id: cell.id, kind: cell.kind, ...(typeof cell.title === 'string' ? { title: cell.title } : {}), ok: errors.length === 0, ...output };
    if (errors.length) {
      r.error = errors[0];
      if (errors.length > 1) r.errors = errors;
      if (waits.size) r.waitsOn = [...waits];
    }
    if (tex !== undefined) r.tex = tex;
    return r;
  }
}
