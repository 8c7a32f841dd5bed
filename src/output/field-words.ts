/**
 * Places in a study in words, as a person sees them in the editor: a report path such as
 * `cells[3].estimate[0].as` becomes `Fit "k", estimate 1, name`. The JSON report and the
 * command line keep paths; the app and the printed sheet show these words. Built from the
 * study document (titles, item and question names) and the path alone: never from a
 * message's text. Pure; linear in the path's length.
 */
import type { Cell, CellKind } from '../study/types.ts';

/** How each cell kind is named where a person meets it (the app's cell tags, the sheet). */
export const KIND_LABELS: Readonly<Record<CellKind, string>> = {
  parameters: 'Parameters', rate: 'Rate law', phase: 'Where it settles', simulate: 'Run',
  data: 'Measurements', fit: 'Fit', nca: 'Profile summary', solve: 'Solve for', note: 'Note',
  uncertainty: 'How sure',
  sensitivity: 'What matters most', compare: 'Scenarios',
};

/** The cells of a study, as much of them as the words need. */
export type CellsOf = { readonly cells: readonly Cell[] };

/** The cells of a study as far as their names go: a document's, or a report's (the command line has only the report). */
export type CellNames = { readonly cells: readonly { readonly id: string; readonly kind: CellKind; readonly title?: unknown }[] };

/** A cell in words: its kind's label and its title, else its id: `Fit "k"`. Unknown ids are quoted as given. */
export function cellWords(study: CellNames, id: string): string {
  const cell = study.cells.find((c) => c.id === id);
  if (!cell) return `cell "${id}"`;
  const title = typeof cell.title === 'string' && cell.title.trim() ? cell.title.trim() : cell.id;
  return `${KIND_LABELS[cell.kind] ?? 'Cell'} "${title}"`;
}

type Step = { readonly key: string } | { readonly index: number };

/** `.estimate[0].as` as steps; undefined when the text is not a path. */
function stepsOf(text: string): Step[] | undefined {
  const steps: Step[] = [];
  const re = /\.([^.[\]]+)|\[(\d+)\]/gy;
  let m: RegExpExecArray | null;
  let at = 0;
  while (at < text.length && (m = re.exec(text)) !== null) {
    steps.push(m[1] !== undefined ? { key: m[1] } : { index: Number(m[2]) });
    at = re.lastIndex;
  }
  return at === text.length ? steps : undefined;
}

/** Words for one field key, by the kind of thing it belongs to (`cell:<kind>`, `item`, `event`, `question`...). */
const FIELD_WORDS: Readonly<Record<string, Readonly<Record<string, string>>>> = {
  'cell:rate': { state: 'state name', unit: 'unit', rate: 'rate law', initial: 'initial value' },
  'cell:simulate': { from: 'start of the run', to: 'end of the run', step: 'fixed step', method: 'method', tolerance: 'tolerance', band: 'band from samples' },
  'cell:phase': { rate: 'rate law', from: 'lower end of the range', to: 'upper end of the range', sweep: 'sweep' },
  'cell:fit': { data: 'measurements', time: 'time column', observe: 'observed columns', weighting: 'weighting' },
  'cell:nca': { data: 'measurements', time: 'time column', concentration: 'concentration column', dose: 'dose', route: 'route', duration: 'infusion duration', auc: 'area rule', terminal: 'terminal phase', prefix: 'prefix', units: 'units' },
  'cell:data': { csv: 'CSV text' },
  'cell:note': { text: 'text' },
  'cell:solve': { vary: 'varied value', target: 'target' },
  'cell:uncertainty': { of: 'names carried', method: 'method', samples: 'samples', seed: 'seed' },
  spread: { distribution: 'spread', sd: 'spread SD', cv: 'spread CV', from: 'spread from', to: 'spread to' },
  'cell:sensitivity': { of: 'results', parameters: 'parameters' },
  'cell:compare': { run: 'run', scenarios: 'scenarios' },
  vary: { parameter: 'parameter varied', as: 'name of the result', min: 'lowest value', max: 'highest value', roundTo: 'round to', choices: 'choices', guess: 'guess' },
  target: { value: 'target', equals: 'wanted value' },
  item: { name: 'name', value: 'value', note: 'note', unit: 'shown in', glance: 'at a glance' },
  event: { at: 'time', every: 'repeats every', count: 'repeat count', for: 'infusion duration', add: 'amounts added', set: 'values set', infuse: 'infusion rates' },
  question: { name: 'name', level: 'level', at: 'time', from: 'window start', to: 'window end', direction: 'direction', occurrence: 'occurrence', unit: 'shown in', glance: 'at a glance' },
  estimate: { parameter: 'parameter', as: 'name', guess: 'first guess', min: 'lower bound', max: 'upper bound', unit: 'shown in' },
  sweep: { name: 'swept parameter', from: 'sweep start', to: 'sweep end', steps: 'steps' },
  tolerance: { relative: 'relative tolerance', absolute: 'absolute tolerance' },
  column: { name: 'name', unit: 'unit' },
  scenario: { name: 'name', set: 'values set' },
};

/** What an entry of a list is called, from its place in the list and the entry itself. */
function entryWords(list: string, i: number, entry: unknown, cell: Cell): { words: string; context: string } {
  const name = (entry as { name?: unknown } | undefined)?.name;
  const named = typeof name === 'string' && name.trim() ? `"${name.trim()}"` : undefined;
  switch (list) {
    case 'items': return { words: `parameter ${named ?? i + 1}`, context: 'item' };
    case 'find': return { words: `question ${named ?? i + 1}`, context: 'question' };
    case 'events': return { words: `event ${i + 1}`, context: 'event' };
    case 'estimate': return { words: `estimate ${i + 1}`, context: 'estimate' };
    case 'columns': return { words: `column ${named ?? i + 1}`, context: 'column' };
    case 'rows': return { words: `row ${i + 1}`, context: 'row' };
    case 'rates': return { words: `law ${i + 1}`, context: 'value' };
    case 'choices': return { words: `choice ${i + 1}`, context: 'value' };
    case 'of': return { words: `result ${typeof entry === 'string' && entry ? `"${entry}"` : i + 1}`, context: 'value' };
    case 'parameters': return { words: `parameter ${typeof entry === 'string' && entry ? `"${entry}"` : i + 1}`, context: 'value' };
    case 'scenarios': return { words: `scenario ${named ?? i + 1}`, context: 'scenario' };
    case 'range': return { words: i === 0 ? 'slider range start' : 'slider range end', context: 'value' };
    default: return { words: `${spaced(list)} ${i + 1}`, context: cell.kind };
  }
}

/** `timeOfMaximum` → `time of maximum`. */
function spaced(key: string): string {
  return key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').replace(/_/g, ' ').toLowerCase();
}

/**
 * A report path in words, from the study document: `cells[3].estimate[0].as` →
 * `Fit "k", estimate 1, name`; `cells[2].find[1].from` → `Run "dose", question "t_21", window
 * start`. With `withCell` false the cell is left out (`estimate 1, name`: for a message shown
 * inside its cell; the cell alone is then `the cell`). A path that names no cell of the study
 * is returned as it is. Cost: linear in the path.
 */
export function fieldWords(study: CellsOf, path: string, withCell = true): string {
  const m = /^cells\[(\d+)\]/.exec(path);
  const cell = m ? study.cells[Number(m[1])] : undefined;
  const steps = m ? stepsOf(path.slice(m[0].length)) : undefined;
  if (!cell || !steps) return path;
  const parts = [cellWords(study, cell.id)];
  let context = `cell:${cell.kind}`;
  let node: unknown = cell;
  let list: string | undefined;
  for (const [at, step] of steps.entries()) {
    if ('index' in step) {
      const entry = Array.isArray(node) ? node[step.index] : undefined;
      if (list === 'rows') {
        parts.push(context === 'row' ? `column ${columnName(cell, step.index)}` : `row ${step.index + 1}`);
        context = context === 'row' ? 'value' : 'row';
      } else {
        const e = entryWords(list ?? '', step.index, entry, cell);
        parts.push(e.words);
        context = e.context;
      }
      node = entry;
      continue;
    }
    const { key } = step;
    const next = node && typeof node === 'object' ? (node as Record<string, unknown>)[key] : undefined;
    if (Array.isArray(next) || key === 'items' || key === 'find' || key === 'events' || key === 'estimate' || key === 'columns' || key === 'rows' || key === 'rates' || key === 'range') {
      list = key;
      node = next;
      if (key === 'rows') context = 'rows';
      continue;
    }
    if (key === 'id' && context.startsWith('cell:')) { parts.push('id'); break; }
    if (context === 'event' && (key === 'add' || key === 'set' || key === 'infuse')) { parts.push(FIELD_WORDS.event[key]); context = `event-${key}`; node = next; continue; }
    if (context.startsWith('event-')) {
      const action = context.slice('event-'.length);
      parts.pop();
      parts.push(action === 'add' ? `amount added to ${key}` : action === 'set' ? `value set for ${key}` : `rate infused into ${key}`);
      context = 'value';
      node = next;
      continue;
    }
    if (context === 'question' && FIELD_WORDS.question[key] === undefined) { parts.push('state'); node = next; context = 'value'; continue; }
    if (context === 'scenario' && key === 'set') { parts.push(FIELD_WORDS.scenario.set); context = 'scenario-set'; node = next; continue; }
    if (context === 'scenario-set') { parts.pop(); parts.push(`value set for ${key}`); context = 'value'; node = next; continue; }
    if (context === 'cell:fit' && key === 'observe') { parts.push('observed columns'); context = 'observe'; node = next; continue; }
    if (context === 'observe') { parts.push(`column for ${key}`); context = 'value'; node = next; continue; }
    if (context === 'cell:nca' && key === 'units') { context = 'units'; node = next; continue; }
    if (context === 'units') { parts.push(`${key} shown in`); context = 'value'; node = next; continue; }
    const words = FIELD_WORDS[context]?.[key];
    parts.push(words ?? spaced(key));
    // inside a sweep, the tolerances, a solve's vary or target, the field's own words say enough (`sweep start`)
    if ((key === 'sweep' || key === 'tolerance' || key === 'vary' || key === 'target' || key === 'spread') && at < steps.length - 1) { context = key; parts.pop(); }
    node = next;
  }
  if (!withCell) return parts.length > 1 ? parts.slice(1).join(', ') : 'the cell';
  return parts.join(', ');
}

function columnName(cell: Cell, index: number): string {
  const col = cell.kind === 'data' && Array.isArray(cell.columns) ? cell.columns[index] : undefined;
  return typeof col?.name === 'string' && col.name ? `"${col.name}"` : String(index + 1);
}
