/**
 * A run's band as the app and the printed sheet show it: the band an uncertainty cell drew for
 * the run (`bands` in its report), or why there is none, in words. It picks from the report;
 * it computes nothing.
 */
import type { Cell } from '../study/types.ts';
import type { Report, UncertaintyBand } from '../engine/report.ts';
import { cellWords } from './field-words.ts';

/** A band with its curves, from the uncertainty cell `cell`. */
export type DrawnBand = Required<Pick<UncertaintyBand, 'run' | 't' | 'states' | 'samples' | 'note'>> & UncertaintyBand;

export type RunBand = { readonly band: DrawnBand; readonly cell: string } | { readonly reason: string };

const list = (names: readonly string[]) => names.map((n) => `"${n}"`).join(', ');

/**
 * The band of run `run`: from the first uncertainty cell (in the study's order) whose names
 * include one of the run's answers and that drew it; else the reason of the first such cell,
 * or why no cell draws one. Cost: O(cells).
 */
export function runBand(study: { readonly cells: readonly Cell[] }, report: Pick<Report, 'cells'>, run: string): RunBand {
  const cell = study.cells.find((c) => c.id === run);
  const answers = cell?.kind === 'simulate' && Array.isArray(cell.find) ? cell.find.flatMap((f) => (typeof f?.name === 'string' ? [f.name] : [])) : [];
  const uncertain = study.cells.filter((c): c is Extract<Cell, { kind: 'uncertainty' }> => c.kind === 'uncertainty');
  if (!answers.length) return { reason: 'This run asks no questions. A band is drawn from the samples of an uncertainty cell that lists a run\'s answers among its names.' };
  if (!uncertain.length) return { reason: `No uncertainty cell in this study: add one whose names include this run's answers (${list(answers)}); the band is drawn from its samples.` };
  const asking = uncertain.filter((c) => Array.isArray(c.of) && c.of.some((n) => answers.includes(n)));
  if (!asking.length) return { reason: `No uncertainty cell lists this run's answers (${list(answers)}) among its names: add one of them to ${cellWords(study, uncertain[0].id)}, and the band is drawn from its samples.` };
  const reasons: string[] = [];
  for (const c of asking) {
    const r = report.cells.find((x) => x.id === c.id);
    const who = cellWords(study, c.id);
    if (!r || r.kind !== 'uncertainty') { reasons.push(`${who} has not run yet.`); continue; }
    if (c.method === 'linear') { reasons.push(`${who} uses the linear method, which draws no samples: choose Monte Carlo there for a band.`); continue; }
    if (!r.ok) { reasons.push(`${who} has a problem (see that cell), so there are no samples to draw the band from.`); continue; }
    if (r.computed === false) { reasons.push(`${who} has not run yet.`); continue; }
    const b = r.bands?.find((x) => x.run === run);
    if (b?.t && b.states && b.samples !== undefined && b.note !== undefined) return { band: b as DrawnBand, cell: c.id };
    reasons.push(b?.reason ? `No band from ${who}: ${b.reason}.` : `${who} has not drawn this run's band yet.`);
  }
  return { reason: reasons[0] };
}
