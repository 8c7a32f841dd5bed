/**
 * The dependency graph of a study: who defines each name, what each node reads, the order
 * to run nodes in, and the problems that are known before anything runs (unknown names,
 * duplicate names, cycles, a state or `t` used where it has no meaning).
 *
 * Built afresh from the node list on every edit: linear in nodes plus uses, a few
 * microseconds for a 50-cell study. What is expensive (parsing, running) is cached elsewhere.
 */
import type { CellError, GraphNode, StudyNote } from './node.ts';
import { isConstantName } from '../expression/constants.ts';
import { nearest } from '../expression/suggest.ts';
import { hiddenUnitWarnings, isUnitName } from './hidden-units.ts';
import { findWord } from '../expression/find-word.ts';

/** Where a used name comes from; `optional` when the reader runs without it (it only shows it). */
export type Source = { readonly node: string; readonly optional?: boolean } | { readonly builtin: 'time' | 'constant' | 'unit' };

export interface Graph {
  readonly nodes: ReadonlyMap<string, GraphNode>;
  /** Node keys in a valid run order (nodes on a cycle, then those behind them, at the end). */
  readonly order: readonly string[];
  readonly definers: ReadonlyMap<string, string>;
  /** For each node, each name it reads and where that comes from (unresolved names are absent). */
  readonly sources: ReadonlyMap<string, ReadonlyMap<string, Source>>;
  /** Problems known before running, per node key. */
  readonly problems: ReadonlyMap<string, CellError>;
  /** Notes on how the study's names are read (names hiding constants or units), with their places as parts. */
  readonly warnings: readonly StudyNote[];
}

/**
 * Builds the graph. `resolve(cell, path)` writes a node's cell-relative path out in full,
 * for messages that point at another cell; `cellName(cell)` names a cell in warnings (its
 * title, else its id).
 */
export function buildGraph(list: readonly GraphNode[], resolve: (cell: string, path: string) => string, cellName: (cell: string) => string = (c) => `cell "${c}"`): Graph {
  const nodes = new Map(list.map((n) => [n.key, n]));
  const definers = new Map<string, string>();
  const definedAt = new Map<string, string>();
  const problems = new Map<string, CellError>();
  const warnings: StudyNote[] = [];
  const flag = (key: string, e: CellError) => { if (!problems.has(key)) problems.set(key, e); };

  for (const n of list) {
    if (n.problems.length) flag(n.key, n.problems[0]);
    for (const d of n.defines) {
      const first = definers.get(d.name);
      if (first !== undefined) {
        const what = d.name.startsWith('#') ? `the cell id "${d.name.slice(1)}"` : `"${d.name}"`;
        const firstCell = nodes.get(first)!.cell;
        const firstAt = resolve(firstCell, definedAt.get(d.name)!);
        flag(n.key, { kind: 'duplicate', message: `${what} is already defined in cell "${firstCell}" (${firstAt})`, path: d.path, parts: [`${what} is already defined in `, { path: firstAt }] });
        continue;
      }
      if (d.name === 't') {
        flag(n.key, { kind: 'misplaced', message: '"t" is time and cannot be defined: choose another name', path: d.path });
        continue;
      }
      definers.set(d.name, n.key);
      definedAt.set(d.name, d.path);
      if (!d.name.startsWith('#') && isConstantName(d.name)) {
        const at = resolve(n.cell, d.path);
        warnings.push({ text: `the name "${d.name}" (${at}) hides the constant ${d.name}`, parts: [`the name "${d.name}" (`, { path: at }, `) hides the constant ${d.name}`] });
      }
    }
  }
  warnings.push(...hiddenUnitWarnings(list, definers, { resolve, cellName }));

  const lawOf = (state: string): string | undefined => {
    const key = definers.get(state);
    const n = key ? nodes.get(key) : undefined;
    return n?.role === 'state' ? `#${n.cell}` : undefined;
  };

  const sources = new Map<string, Map<string, Source>>();
  for (const n of list) {
    const src = new Map<string, Source>();
    sources.set(n.key, src);
    const uses = [...n.uses];
    if (n.pullsCoupledLaws) uses.push(...coupledLaws(n, nodes, definers, lawOf));
    for (const u of uses) {
      const def = definers.get(u.name);
      // a name read as a unit in one field may be read as a state in another: the state wins
      if (src.has(u.name) && !(def !== undefined && 'builtin' in src.get(u.name)!)) continue;
      if (def !== undefined) {
        const target = nodes.get(def)!;
        if (target.role === 'state' && !u.readsStates) {
          // a state hides a unit only where states can be read: elsewhere the unit keeps its meaning
          if (isUnitName(u.name)) {
            if (!src.has(u.name)) src.set(u.name, { builtin: 'unit' });
            continue;
          }
          flag(n.key, { kind: 'misplaced', message: `"${u.name}" is the state of rate cell "${target.cell}": it changes with time, so it can be read only in rate laws and event amounts`, path: u.path, ...span(u) });
        }
        src.set(u.name, u.optional ? { node: def, optional: true } : { node: def });
      } else if (u.name === 't' && n.allowsTime) {
        src.set(u.name, { builtin: 'time' });
      } else if (u.name === 't') {
        flag(n.key, { kind: 'misplaced', message: '"t" is time and can be used only in rate laws and schedules (for metric tons write "tonne")', path: u.path, ...span(u) });
      } else if (u.name.startsWith('#')) {
        const ids = [...definers.keys()].filter((k) => k.startsWith('#') && !k.includes('/')).map((k) => k.slice(1));
        const hint = nearest(u.name.slice(1), ids);
        flag(n.key, { kind: 'unknown-name', message: `there is no cell "${u.name.slice(1)}"${hint ? ` (did you mean "${hint}"?)` : ''}`, path: u.path });
      } else if (isConstantName(u.name)) {
        src.set(u.name, { builtin: 'constant' });
      } else if (isUnitName(u.name)) {
        src.set(u.name, { builtin: 'unit' });
      } else {
        const names = [...definers.keys()].filter((k) => !k.startsWith('#'));
        const hint = nearest(u.name, n.allowsTime ? [...names, 't'] : names);
        flag(n.key, { kind: 'unknown-name', message: `unknown name "${u.name}"${hint ? ` (did you mean "${hint}"?)` : ''}`, path: u.path, ...span(u) });
      }
    }
  }

  for (const n of list) if (n.pullsMeasurements) addMeasurements(n, list, nodes, sources, definers);

  const { order, cycles } = orderNodes(list, sources);
  for (const [key, path] of cycles) {
    const n = nodes.get(key)!;
    const hints = [...new Set(path.keys.flatMap((k) => nodes.get(k)?.cycleHint ?? []))];
    flag(key, { kind: 'cycle', message: `circular definition: ${path.text}${hints.map((h) => `; ${h}`).join('')}`, path: n.defines[0]?.path ?? '@' });
  }
  return { nodes, order, definers, sources, problems, warnings };
}

function span(u: { name: string; text?: string }): { span?: readonly [number, number] } {
  if (!u.text) return {};
  const at = findWord(u.text, u.name);
  return at ? { span: at } : {};
}

/**
 * Adds to n's sources, as optional uses, the names that measure a state of the laws n reads
 * (its own and those coupled to them), except where the measurer depends on n: reading it
 * would close a cycle, and the measurements are only shown.
 */
function addMeasurements(n: GraphNode, list: readonly GraphNode[], nodes: Map<string, GraphNode>, sources: Map<string, Map<string, Source>>, definers: Map<string, string>): void {
  const src = sources.get(n.key)!;
  const lawCells = new Set<string>();
  for (const s of src.values()) {
    const law = 'node' in s ? nodes.get(s.node) : undefined;
    if (law?.role === 'law') lawCells.add(law.cell);
  }
  const states = new Set(list.filter((x) => x.role === 'state' && lawCells.has(x.cell)).flatMap((x) => x.defines.map((d) => d.name)));
  for (const m of list) {
    if (!m.measures || definers.get(m.measures.name) !== m.key || !m.measures.states.some((s) => states.has(s))) continue;
    if (!dependsOn(m.key, n.key, sources)) src.set(m.measures.name, { node: m.key, optional: true });
  }
}

/** Whether node `from` reads `to`, directly or through others. */
function dependsOn(from: string, to: string, sources: Map<string, Map<string, Source>>): boolean {
  const seen = new Set<string>();
  const stack = [from];
  while (stack.length) {
    const k = stack.pop()!;
    if (k === to) return true;
    if (seen.has(k)) continue;
    seen.add(k);
    for (const s of sources.get(k)?.values() ?? []) if ('node' in s) stack.push(s.node);
  }
  return false;
}

/** The laws reachable from the laws n names, through the states those laws read. */
function coupledLaws(n: GraphNode, nodes: Map<string, GraphNode>, definers: Map<string, string>, lawOf: (s: string) => string | undefined) {
  const seen = new Set(n.uses.filter((u) => u.name.startsWith('#')).map((u) => u.name));
  const queue = [...seen];
  const extra: Array<{ name: string; path: string }> = [];
  while (queue.length) {
    const law = nodes.get(definers.get(queue.pop()!) ?? '');
    if (law?.role !== 'law') continue;
    for (const s of law.couples ?? []) {
      const ref = lawOf(s);
      if (ref && !seen.has(ref)) {
        seen.add(ref);
        queue.push(ref);
        extra.push({ name: ref, path: law.uses.find((u) => u.name === s)?.path ?? '' });
      }
    }
  }
  return extra;
}

/**
 * Kahn's algorithm, taking ready nodes in document order; what is left over lies on or
 * behind a cycle. Each node on a cycle gets the cycle written out as names: `k -> V -> k`.
 */
function orderNodes(list: readonly GraphNode[], sources: Map<string, Map<string, Source>>) {
  const index = new Map(list.map((n, i) => [n.key, i]));
  const deps = new Map<string, string[]>();
  const users = new Map<string, string[]>();
  for (const n of list) {
    const ds: string[] = [];
    for (const s of sources.get(n.key)!.values()) if ('node' in s && !ds.includes(s.node)) ds.push(s.node);
    deps.set(n.key, ds);
    for (const d of ds) {
      const us = users.get(d);
      if (us) us.push(n.key);
      else users.set(d, [n.key]);
    }
  }
  const pending = new Map(list.map((n) => [n.key, deps.get(n.key)!.length]));
  const ready = new MinHeap((k: string) => index.get(k)!);
  for (const n of list) if (pending.get(n.key) === 0) ready.push(n.key);
  const order: string[] = [];
  const done = new Set<string>();
  const take = (k: string) => {
    order.push(k);
    done.add(k);
    for (const u of users.get(k) ?? []) {
      const left = pending.get(u)! - 1;
      pending.set(u, left);
      if (left === 0 && !done.has(u)) ready.push(u);
    }
  };
  const drain = () => {
    while (ready.size) {
      const k = ready.pop()!;
      if (!done.has(k)) take(k);
    }
  };
  drain();
  const cycles = new Map<string, { text: string; keys: string[] }>();
  if (order.length < list.length) {
    const left = list.filter((n) => !done.has(n.key));
    for (const n of left) {
      const path = cyclePath(n.key, deps, sources, new Set(left.map((x) => x.key)));
      if (path) cycles.set(n.key, path);
    }
    // nodes on a cycle fail without reading anything: they go first, and the nodes behind
    // them follow in dependency order, so that each reads why its input failed
    for (const k of cycles.keys()) take(k);
    drain();
    order.push(...list.filter((n) => !done.has(n.key)).map((n) => n.key));
  }
  return { order, cycles };
}

/** The shortest cycle through `start`, written as the names read along it; undefined if none. */
function cyclePath(start: string, deps: Map<string, string[]>, sources: Map<string, Map<string, Source>>, within: Set<string>): { text: string; keys: string[] } | undefined {
  const back = new Map<string, string>();
  const queue = [start];
  const seen = new Set([start]);
  while (queue.length) {
    const k = queue.shift()!;
    for (const d of deps.get(k) ?? []) {
      if (!within.has(d)) continue;
      if (d === start) {
        const keys = [start];
        for (let x = k; x !== start; x = back.get(x)!) keys.splice(1, 0, x);
        keys.push(start);
        const names = keys.map((key, i) => readName(i === 0 ? keys[keys.length - 2] : keys[i - 1], key, sources));
        return { text: names.join(' -> '), keys };
      }
      if (!seen.has(d)) {
        seen.add(d);
        back.set(d, k);
        queue.push(d);
      }
    }
  }
  return undefined;
}

function readName(reader: string, definer: string, sources: Map<string, Map<string, Source>>): string {
  for (const [name, s] of sources.get(reader)!) if ('node' in s && s.node === definer) return show(name);
  return definer;
}

function show(name: string): string {
  return name.startsWith('#') ? `cell "${name.slice(1)}"` : name;
}

/** A binary heap of keys ordered by a numeric rank (document position): O(log n) push and pop. */
class MinHeap {
  private readonly items: string[] = [];
  constructor(private readonly rank: (k: string) => number) {}

  get size(): number {
    return this.items.length;
  }

  push(k: string): void {
    const a = this.items;
    a.push(k);
    let i = a.length - 1;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (this.rank(a[parent]) <= this.rank(a[i])) break;
      [a[parent], a[i]] = [a[i], a[parent]];
      i = parent;
    }
  }

  pop(): string | undefined {
    const a = this.items;
    if (a.length === 0) return undefined;
    const top = a[0];
    const last = a.pop()!;
    if (a.length) {
      a[0] = last;
      let i = 0;
      for (;;) {
        const l = 2 * i + 1, r = l + 1;
        let m = i;
        if (l < a.length && this.rank(a[l]) < this.rank(a[m])) m = l;
        if (r < a.length && this.rank(a[r]) < this.rank(a[m])) m = r;
        if (m === i) break;
        [a[m], a[i]] = [a[i], a[m]];
        i = m;
      }
    }
    return top;
  }
}

/** Names `name` is computed from, following the resolved sources. Cost: O(nodes upstream). */
export function upstreamOf(graph: Graph, name: string): ReadonlySet<string> {
  const out = new Set<string>();
  const queue = [name];
  while (queue.length) {
    const key = graph.definers.get(queue.pop()!);
    const sources = key ? graph.sources.get(key) : undefined;
    for (const [n, s] of sources ?? []) {
      if ('node' in s && !out.has(n)) {
        out.add(n);
        queue.push(n);
      }
    }
  }
  return out;
}
