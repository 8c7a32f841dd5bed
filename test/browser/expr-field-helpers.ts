// Shared by the <expr-field> browser tests: make a field, reach its editor, record its events,
// wait for what the editor shows.
import { expect } from 'chai';
import { EditorView } from '@codemirror/view';
import '../../components/expr-field.ts';
import type { ExprField, ExprInputDetail } from '../../components/expr-field.ts';

export const NAMES = [
  { name: 'k', detail: '0.35 /h' },
  { name: 'Ta', detail: '21 degC' },
  { name: 'kelvinRate' },
];

/** A field in the document with the given properties, labelled "Rate law", rendered. */
export async function field(props: Partial<Pick<ExprField, 'value' | 'names' | 'error' | 'label' | 'readonly'>> = {}): Promise<ExprField> {
  const el = document.createElement('expr-field');
  el.label = 'Rate law';
  Object.assign(el, props);
  document.body.append(el);
  await el.updateComplete;
  return el;
}

/** The field's CodeMirror view. */
export function viewOf(el: ExprField): EditorView {
  const dom = el.shadowRoot!.querySelector('.cm-editor') as HTMLElement | null;
  expect(dom, 'the editor is rendered').to.not.equal(null);
  return EditorView.findFromDOM(dom!)!;
}

/** The values of every `type` event the field fires from now on, in order. */
export function record(el: ExprField, type: 'expr-input' | 'expr-commit'): string[] {
  const seen: string[] = [];
  document.body.addEventListener(type, (e) => {
    if (e.composedPath()[0] === el) seen.push((e as CustomEvent<ExprInputDetail>).detail.value);
  });
  return seen;
}

export { until } from './helpers.ts';

export const frame = () => new Promise((r) => requestAnimationFrame(() => r(undefined)));
