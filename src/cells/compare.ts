/**
 * A compare cell: the simulate cell `run` again under each named scenario (a set of replaced
 * parameters or states' initial values), by the what-if evaluator (engine/what-if.ts), so the
 * study's own values are never touched. Each scenario's answers to the run's questions are
 * defined as `<question>_<scenario>`; its curves come from the run's model (`#run`,
 * cells/run-model.ts) with the values the scenario gives the names the run reads directly.
 *
 * The cell reads the run's document (its questions) when it is built: `buildContext` in
 * cells/index.ts puts them in the signature, so the cell is built again when they change.
 */
import type { Cell, CompareCell } from '../study/types.ts';
import { NAME_PATTERN } from '../study/types.ts';
import { SCENARIO_NAME } from '../study/validate-scenarios.ts';
import type { CellError, Definition, GraphNode, Use } from '../engine/node.ts';
import { cellRef } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';
import { type Field, field, usesOf, guarded } from './fields.ts';
import { runCompare, type ScenarioFields } from './compare-run.ts';

/** The run's questions, by name, as its document lists them (the rows of the comparison). */
export function runQuestions(run: string, cells: readonly Cell[]): string[] {
  const c = cells.find((x) => x.id === run);
  if (c?.kind !== 'simulate' || !Array.isArray(c.find)) return [];
  return c.find.flatMap((q) => (typeof q?.name === 'string' && NAME_PATTERN.test(q.name) ? [q.name] : []));
}

export function compareNodes(cell: CompareCell, at: string, cells: readonly Cell[] = []): Array<GraphNode<NodeOutput<'compare'>>> {
  const problems: CellError[] = [];
  const run = typeof cell.run === 'string' ? cell.run : '';
  const questions = runQuestions(run, cells);
  const scenarios: ScenarioFields[] = (Array.isArray(cell.scenarios) ? cell.scenarios : []).map((s, j) => {
    const set = s && typeof s.set === 'object' && s.set !== null && !Array.isArray(s.set) ? s.set : {};
    const entries = Object.entries(set).map(([name, v]) => ({ name, value: field(v, `${at}.scenarios[${j}].set.${name}`, problems) }));
    return { name: typeof s?.name === 'string' ? s.name : '', path: `${at}.scenarios[${j}]`, entries };
  });
  const values: Array<Field | undefined> = scenarios.flatMap((s) => s.entries.map((e) => e.value));
  const uses: Use[] = [
    ...(run ? [{ name: cellRef(run), path: `${at}.run` }] : []),
    // the run's answers as they stand: a scenario that changes nothing the run reads keeps them
    ...questions.map((name) => ({ name, path: `${at}.run`, optional: true })),
    ...scenarios.flatMap((s) => s.entries.map((e) => ({ name: e.name, path: `${s.path}.set`, readsStates: true }))),
    ...usesOf(values),
  ];
  const seen = new Set<string>();
  const defines: Definition[] = scenarios.flatMap((s) => {
    if (!SCENARIO_NAME.test(s.name) || seen.has(s.name)) return [];
    seen.add(s.name);
    return questions.map((q) => ({ name: `${q}_${s.name}`, path: `${s.path}.name` }));
  });
  return [{
    key: `${cell.id}/compare`,
    cell: cell.id,
    defines,
    uses,
    allowsTime: false,
    // the answers depend on how the run computes them from the replaced names
    readsUpstream: true,
    signature: `${JSON.stringify(cell)}|${questions.join(',')}`,
    problems,
    run: (ctx) => guarded(() => runCompare(at, run, questions, scenarios, ctx)),
  }];
}
