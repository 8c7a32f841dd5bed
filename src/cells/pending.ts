/**
 * Cells whose computation is not in this version yet (fit).
 * Their fields are read and checked (shape, expression syntax, names, references to other
 * cells), their names are declared so that the graph is complete, and their report says
 * plainly that nothing was computed. Downstream readers of their names wait on them.
 */
import type { Cell, CellKind } from '../study/types.ts';
import type { CellError, Definition, GraphNode, Use } from '../node.ts';
import { cellRef } from '../node.ts';
import { type Field, field, usesOf } from './fields.ts';

const WHAT: Partial<Record<CellKind, string>> = {
  fit: 'the fit',
};

export function pendingNodes(cell: Cell, at: string): GraphNode[] {
  const problems: CellError[] = [];
  const c = cell as unknown as Record<string, any>;
  const fields: Array<Field | undefined> = [];
  const refs: Use[] = [];
  const defines: Definition[] = [];
  const expr = (v: unknown, path: string) => { if (v !== undefined) fields.push(field(v, path, problems)); };
  const ref = (id: unknown, path: string) => { if (typeof id === 'string') refs.push({ name: cellRef(id), path }); };
  const list = (v: unknown): any[] => (Array.isArray(v) ? v : []);
  const obj = (v: unknown): Record<string, unknown> => (v && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : {});

  switch (cell.kind) {
    case 'fit':
      list(c.rates).forEach((r, i) => ref(r, `${at}.rates[${i}]`));
      ref(c.data, `${at}.data`);
      list(c.estimate).forEach((e, i) => {
        const p = `${at}.estimate[${i}]`;
        for (const k of ['guess', 'min', 'max']) expr(obj(e)[k], `${p}.${k}`);
        if (typeof obj(e).as === 'string') defines.push({ name: e.as, path: `${p}.as` });
      });
      break;
  }
  const message = `${WHAT[cell.kind] ?? 'this cell'} is not computed in this version of Ratebook yet`;
  return [{
    key: `${cell.id}/${cell.kind}`,
    cell: cell.id,
    defines,
    uses: [...usesOf(fields), ...refs],
    allowsTime: false,
    allowsStates: true,
    pullsCoupledLaws: cell.kind === 'fit',
    signature: JSON.stringify(cell),
    problems,
    run: () => ({ ok: true, bindings: new Map(), output: { computed: false, message } }),
  }];
}

/** The names an nca cell defines, before its prefix (the study-format contract). */
export const NCA_NAMES = ['Cmax', 'tmax', 'Clast', 'tlast', 'AUClast', 'AUCinf', 'AUCextrap', 'lambda_z', 't_half', 'CL', 'Vz', 'AUMClast', 'MRT', 'r2adj'];
