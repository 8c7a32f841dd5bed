/**
 * Completion of the word before the cursor: the study's names (with their current value),
 * the allowed functions (inserting "name("), the constants and the units, in that order.
 */
import { autocompletion, type Completion, type CompletionContext, type CompletionResult, type CompletionSection } from '@codemirror/autocomplete';
import type { Extension } from '@codemirror/state';
import { commonUnitNames, constantNames, functionNames, unitNames } from '../../src/index.ts';
import { fieldProps } from './props.ts';

const section = (name: string, rank: number): CompletionSection => ({ name, rank });
const NAMES = section('In this study', 0);
const FUNCTIONS = section('Functions', 1);
const CONSTANTS = section('Constants', 2);
const UNITS = section('Units', 3);

let fixed: readonly Completion[] | undefined;

/**
 * Functions, constants and units never change, so their options are built once. The most
 * used units rank first among units that match equally well.
 */
function fixedOptions(): readonly Completion[] {
  if (fixed) return fixed;
  const common = new Set(commonUnitNames());
  fixed = [
    ...functionNames().map((f): Completion => ({ label: f, apply: `${f}(`, type: 'function', section: FUNCTIONS })),
    ...constantNames().map((c): Completion => ({ label: c, type: 'constant', section: CONSTANTS })),
    ...unitNames().map((u): Completion => ({ label: u, type: 'unit', section: UNITS, ...(common.has(u) ? { boost: 1 } : {}) })),
  ];
  return fixed;
}

const WORD_BEFORE = /[\p{L}_$][\p{L}\p{N}_$]*$/u;

function complete(context: CompletionContext): CompletionResult | null {
  if (context.state.readOnly) return null;
  const word = context.matchBefore(WORD_BEFORE);
  if (!word && !context.explicit) return null;
  const names = context.state.field(fieldProps).names;
  const studyOptions = [...names].map(([label, detail]): Completion => ({ label, detail: detail ?? 'no value yet', type: 'variable', section: NAMES }));
  return {
    from: word ? word.from : context.pos,
    options: [...studyOptions, ...fixedOptions()],
    validFor: /^[\p{L}_$][\p{L}\p{N}_$]*$/u,
  };
}

/** The completion extension; needs `fieldProps` in the same state. */
export const exprCompletion: Extension = autocompletion({ override: [complete], icons: false, maxRenderedOptions: 60 });
