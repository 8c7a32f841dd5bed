/**
 * Completion of the word before the cursor: the study's names (with their current value),
 * the allowed functions, the constants and the units. Where the word continues a quantity
 * (`1 g`, `100 L / min`) units come first, elsewhere the study's names (`completion-order.ts`);
 * a unit spelled exactly as typed leads its section, as the best match. Nothing is selected
 * when the list opens, and only accepting a function inserts its "(" (`complete-keys.ts`).
 */
import {
  autocompletion, insertCompletionText, pickedCompletion,
  type Completion, type CompletionContext, type CompletionResult, type CompletionSection,
} from '@codemirror/autocomplete';
import type { Extension } from '@codemirror/state';
import type { EditorView } from '@codemirror/view';
import { commonUnitNames, constantNames, functionNames, unitNames } from '../../src/index.ts';
import { completionKeys } from './complete-keys.ts';
import { NAME_PLACE_ORDER, UNIT_PLACE_ORDER, offerOrder, type OfferKind } from './completion-order.ts';
import { fieldProps } from './props.ts';
import { isCalled } from './tokens.ts';

const SECTION_NAMES: Readonly<Record<OfferKind, string>> = {
  name: 'In this study',
  function: 'Functions',
  constant: 'Constants',
  unit: 'Units',
};

type Sections = Readonly<Record<OfferKind, CompletionSection>>;

function sectionsFor(order: readonly OfferKind[]): Sections {
  const entry = (kind: OfferKind): [OfferKind, CompletionSection] => [kind, { name: SECTION_NAMES[kind], rank: order.indexOf(kind) }];
  return Object.fromEntries(order.map(entry)) as Sections;
}

/** Inserts the function's name and a "(", unless a "(" already follows. */
function applyFunction(view: EditorView, completion: Completion, from: number, to: number): void {
  const called = isCalled(view.state.doc.toString(), to);
  view.dispatch({
    ...insertCompletionText(view.state, called ? completion.label : `${completion.label}(`, from, to),
    annotations: pickedCompletion.of(completion),
  });
}

/**
 * Functions, constants and units never change, so their options are built once per order.
 * The most used units rank first among units that match equally well.
 */
function buildFixed(sections: Sections): readonly Completion[] {
  const common = new Set(commonUnitNames());
  return [
    ...functionNames().map((f): Completion => ({ label: f, apply: applyFunction, type: 'function', section: sections.function })),
    ...constantNames().map((c): Completion => ({ label: c, type: 'constant', section: sections.constant })),
    ...unitNames().map((u): Completion => ({ label: u, type: 'unit', section: sections.unit, ...(common.has(u) ? { boost: 1 } : {}) })),
  ];
}

interface Offer {
  readonly sections: Sections;
  fixed?: readonly Completion[];
}

const OFFERS = new Map<readonly OfferKind[], Offer>(
  [NAME_PLACE_ORDER, UNIT_PLACE_ORDER].map((order) => [order, { sections: sectionsFor(order) }]),
);

const WORD_BEFORE = /[\p{L}_$][\p{L}\p{N}_$]*$/u;

function complete(context: CompletionContext): CompletionResult | null {
  if (context.state.readOnly) return null;
  const word = context.matchBefore(WORD_BEFORE);
  if (!word && !context.explicit) return null;
  const from = word ? word.from : context.pos;
  const names = context.state.field(fieldProps).names;
  const offer = OFFERS.get(offerOrder(context.state.sliceDoc(0, from), names))!;
  offer.fixed ??= buildFixed(offer.sections);
  const studyOptions = [...names].map(([label, detail]): Completion => ({ label, detail: detail ?? 'no value yet', type: 'variable', section: offer.sections.name }));
  return {
    from,
    options: [...studyOptions, ...offer.fixed],
    validFor: /^[\p{L}_$][\p{L}\p{N}_$]*$/u,
  };
}

/** The completion extension, with its keys; needs `fieldProps` in the same state. */
export const exprCompletion: Extension = [
  autocompletion({ override: [complete], icons: false, maxRenderedOptions: 60, selectOnOpen: false, defaultKeymap: false }),
  completionKeys,
];
