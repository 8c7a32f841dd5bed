/** A note cell: text only. It defines and reads nothing; its text is never run or rendered as HTML. */
import type { NoteCell } from '../study/types.ts';
import type { GraphNode } from '../engine/node.ts';
import type { NodeOutput } from '../engine/report.ts';

export function noteNodes(cell: NoteCell, at: string): Array<GraphNode<NodeOutput<'note'>>> {
  const problems = typeof cell.text === 'string' ? [] : [{ kind: 'shape' as const, path: `${at}.text`, message: 'text must be text' }];
  return [{
    key: `${cell.id}/note`,
    cell: cell.id,
    defines: [],
    uses: [],
    allowsTime: false,
    signature: JSON.stringify(cell.text ?? null),
    problems,
    run: () => ({ ok: true, bindings: new Map(), output: {} }),
  }];
}
