/**
 * Reading a study document: the checks of the contract, with messages that name the path.
 *
 * Two levels. A document that is not a study (another format, a newer version, a duplicate
 * cell id, an unknown kind) is refused whole. A cell whose fields are wrong is kept, with its
 * problems, so that the rest of the study still computes and nothing the user wrote is lost.
 */
import {
  type Cell, type Study, CELL_KINDS, CURRENT_VERSION, FORMAT, ID_PATTERN, NAME_PATTERN,
  PLOT_SCALES, WEIGHTINGS, ROUTES, AUC_RULES, NCA_RESULTS,
} from './types.ts';
import { migrate } from './migrate.ts';
import { checkSpread, checkUncertainty } from './validate-uncertainty.ts';
import { checkSensitivity, checkCompare } from './validate-scenarios.ts';
import { shortJson, textLimitProblem, valueLimitProblem, withoutByteOrderMark } from './limits.ts';
import { Checker, isObject } from './checker.ts';
import { checkData, checkSimulate, checkSolve } from './validate-run.ts';


export interface Problem {
  readonly message: string;
  readonly path: string;
}

export type ReadResult =
  | { ok: true; study: Study; cellProblems: ReadonlyMap<string, readonly Problem[]>; notes: readonly string[] }
  | { ok: false; error: Problem };

/**
 * Reads a study from JSON text or a parsed value. Never throws. The bounds of `limits.ts` are
 * checked first (a byte-order mark before the text is dropped), so nothing after walks a
 * value nested too deeply.
 */
export function readStudy(input: unknown): ReadResult {
  let doc: unknown = input;
  if (typeof input === 'string') {
    const text = withoutByteOrderMark(input);
    const bound = textLimitProblem(text);
    if (bound) return { ok: false, error: bound };
    try {
      doc = JSON.parse(text);
    } catch (err) {
      return refuse(`the file is not valid JSON: ${(err as Error).message}`, '');
    }
  }
  const bound = valueLimitProblem(doc);
  if (bound) return { ok: false, error: bound };
  if (!isObject(doc)) return refuse('a study must be a JSON object', '');
  if (doc.format !== FORMAT) {
    return refuse(`this is not a Ratebook study: "format" must be "${FORMAT}"${doc.format === undefined ? '' : `, not ${shortJson(doc.format)}`}`, 'format');
  }
  const version = doc.version;
  if (!Number.isInteger(version) || (version as number) < 1) return refuse('"version" must be a whole number, 1 or more', 'version');
  if ((version as number) > CURRENT_VERSION) {
    return refuse(`this study was written by a newer Ratebook (format version ${version}); this one reads up to version ${CURRENT_VERSION}`, 'version');
  }
  let notes: string[] = [];
  try {
    ({ doc, notes } = migrate(doc, version as number));
  } catch (err) {
    return refuse((err as Error).message, 'version');
  }
  const d = doc as Record<string, unknown>;
  if (d.title !== undefined && typeof d.title !== 'string') return refuse('"title" must be text', 'title');
  if (d.description !== undefined && typeof d.description !== 'string') return refuse('"description" must be text', 'description');
  if (d.author !== undefined && typeof d.author !== 'string') return refuse('"author" must be text', 'author');
  if (!Array.isArray(d.cells)) return refuse('"cells" must be a list of cells', 'cells');
  const seen = new Map<string, number>();
  const cellProblems = new Map<string, Problem[]>();
  for (let i = 0; i < d.cells.length; i++) {
    const c = d.cells[i];
    const at = `cells[${i}]`;
    if (!isObject(c)) return refuse('a cell must be an object', at);
    if (typeof c.id !== 'string' || !ID_PATTERN.test(c.id)) {
      return refuse(`a cell id must be lower-case letters, digits, "-" or "_", starting with a letter${typeof c.id === 'string' ? `; "${c.id}" is not` : ''}`, `${at}.id`);
    }
    if (seen.has(c.id)) return refuse(`the cell id "${c.id}" is used twice (first at cells[${seen.get(c.id)}])`, `${at}.id`);
    seen.set(c.id, i);
    if (typeof c.kind !== 'string' || !(CELL_KINDS as readonly string[]).includes(c.kind)) {
      return refuse(`unknown cell kind ${shortJson(c.kind)}; the kinds are ${CELL_KINDS.join(', ')}`, `${at}.kind`);
    }
    const problems = checkCell(c, at);
    if (problems.length) cellProblems.set(c.id, problems);
  }
  const study: Study = {
    format: FORMAT,
    version: CURRENT_VERSION,
    title: typeof d.title === 'string' ? d.title : 'Untitled study',
    ...(typeof d.description === 'string' ? { description: d.description } : {}),
    ...(typeof d.author === 'string' ? { author: d.author } : {}),
    cells: d.cells as Cell[],
  };
  return { ok: true, study, cellProblems, notes };
}

function refuse(message: string, path: string): ReadResult {
  return { ok: false, error: { message, path } };
}

/** The field-level problems of one cell; empty when its shape is right. */
export function checkCell(c: Record<string, unknown>, at: string): Problem[] {
  const p = new Checker(at);
  if (c.title !== undefined) p.text(c, 'title');
  switch (c.kind) {
    case 'parameters':
      if (p.list(c, 'items')) {
        (c.items as unknown[]).forEach((item, j) => {
          const path = `items[${j}]`;
          if (!p.object(item, path)) return;
          p.name(item, 'name', path);
          p.expr(item, 'value', path);
          if (item.range !== undefined) {
            if (!Array.isArray(item.range) || item.range.length !== 2 || item.range.some((r) => typeof r !== 'string')) {
              p.add(`${at}.${path}.range`, 'must be a list of two expressions, [low, high]');
            }
          }
          p.optionalText(item, 'note', path);
          p.optionalText(item, 'unit', path);
          p.optionalFlag(item, 'glance', path);
          if (item.spread !== undefined) checkSpread(item.spread, p, path);
        });
      }
      break;
    case 'rate':
      p.name(c, 'state');
      p.expr(c, 'unit');
      p.expr(c, 'rate');
      p.expr(c, 'initial');
      break;
    case 'phase':
      p.id(c, 'rate');
      p.expr(c, 'from');
      p.expr(c, 'to');
      if (c.sweep !== undefined && p.object(c.sweep, 'sweep')) {
        p.name(c.sweep, 'name', 'sweep');
        p.expr(c.sweep, 'from', 'sweep');
        p.expr(c.sweep, 'to', 'sweep');
        p.integer(c.sweep, 'steps', 'sweep', 2, 10000);
      }
      break;
    case 'simulate':
      checkSimulate(c, p);
      break;
    case 'data':
      checkData(c, p);
      break;
    case 'fit':
      // the model: the laws named in `rates`, or the run named in `run`, never both
      if (c.run !== undefined && c.rates !== undefined) p.add(`${at}.run`, 'name either the laws ("rates") or a run ("run"), not both');
      else if (c.run !== undefined) p.id(c, 'run');
      else if (c.rates === undefined) p.add(`${at}.rates`, 'is missing: name the laws to fit ("rates") or a run to fit through ("run")');
      else p.ids(c, 'rates');
      p.id(c, 'data');
      p.text(c, 'time');
      p.oneOf(c, 'plotScale', PLOT_SCALES, true);
      if (p.object(c.observe, 'observe')) {
        const entries = Object.entries(c.observe);
        if (entries.length === 0) p.add(`${at}.observe`, 'must name at least one state and its data column');
        for (const [state, col] of entries) {
          if (!NAME_PATTERN.test(state)) p.add(`${at}.observe`, `"${state}" is not a state name`);
          if (typeof col !== 'string') p.add(`${at}.observe.${state}`, 'must be the name of a data column');
        }
      }
      if (p.list(c, 'estimate')) {
        if ((c.estimate as unknown[]).length === 0) p.add(`${at}.estimate`, 'must list at least one parameter to estimate');
        (c.estimate as unknown[]).forEach((e, j) => {
          const path = `estimate[${j}]`;
          if (!p.object(e, path)) return;
          p.name(e, 'parameter', path);
          p.name(e, 'as', path);
          p.expr(e, 'guess', path);
          if (e.min !== undefined) p.expr(e, 'min', path);
          if (e.max !== undefined) p.expr(e, 'max', path);
          p.optionalText(e, 'unit', path);
          if (e.prior !== undefined && p.object(e.prior, `${path}.prior`)) {
            p.expr(e.prior, 'median', `${path}.prior`);
            p.numberOrExpr(e.prior, 'omega', `${path}.prior`, false);
          }
        });
      }
      p.oneOf(c, 'weighting', WEIGHTINGS, true);
      if (c.error !== undefined && p.object(c.error, 'error')) {
        if (c.error.additive !== undefined) p.expr(c.error, 'additive', 'error');
        p.numberOrExpr(c.error, 'proportional', 'error', true);
        if (c.error.additive === undefined && c.error.proportional === undefined) p.add(`${at}.error`, 'must give an additive SD, a proportional SD, or both');
      }
      break;
    case 'nca':
      p.id(c, 'data');
      p.text(c, 'time');
      p.text(c, 'concentration');
      p.expr(c, 'dose');
      p.oneOf(c, 'route', ROUTES, false);
      if (c.route === 'infusion') p.expr(c, 'duration');
      else if (c.duration !== undefined) p.expr(c, 'duration');
      p.oneOf(c, 'auc', AUC_RULES, true);
      if (c.units !== undefined && p.object(c.units, 'units')) {
        for (const [name, unit] of Object.entries(c.units)) {
          if (!NCA_RESULTS.includes(name)) p.add(`${at}.units.${name}`, `"${name}" is not a result of the profile summary (they are ${NCA_RESULTS.join(', ')})`);
          else if (typeof unit !== 'string') p.add(`${at}.units.${name}`, 'must be a unit, as text');
        }
      }
      if (c.terminal !== undefined && c.terminal !== 'auto' && !(Number.isInteger(c.terminal) && (c.terminal as number) >= 3)) {
        p.add(`${at}.terminal`, 'must be "auto" or a whole number of last points, 3 or more');
      }
      if (c.prefix !== undefined && (typeof c.prefix !== 'string' || !/^[A-Za-z0-9_]*$/.test(c.prefix))) {
        p.add(`${at}.prefix`, 'must be letters, digits or "_"');
      }
      break;
    case 'solve':
      checkSolve(c, p);
      break;
    case 'uncertainty':
      checkUncertainty(c, p);
      break;
    case 'note':
      p.text(c, 'text');
      break;
    case 'sensitivity':
      checkSensitivity(c, p);
      break;
    case 'compare':
      checkCompare(c, p);
      break;
  }
  return p.problems;
}
