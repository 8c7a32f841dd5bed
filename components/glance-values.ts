/**
 * One result at a glance as text, the same in the study view and on the printed sheet: its value
 * at the point values, and where an uncertainty cell follows it, how sure (the engine's `sure`:
 * a verdict's probability of yes with its Monte Carlo error, a quantity's 95% interval, as that
 * cell shows them), never a point verdict alone. While the uncertainty cell is still computing
 * its figures are not shown: "how sure: still computing". The words are the engine's
 * (`src/output/glance-words.ts`, which the command line's text report uses too). Renders only.
 */
import { html, nothing, type TemplateResult } from 'lit';
import { glanceWords, type Cell, type GlanceEntry, type GlanceWork } from '../src/index.ts';

export type { GlanceWork } from '../src/index.ts';

type Study = { readonly cells: readonly Cell[] };

/**
 * The value of one entry, in the engine's words (`glanceWords`): without an uncertainty cell,
 * the value as before; with one, a verdict reads "yes in 54% of 2,000 samples (± 1.1 points,
 * Monte Carlo)" over "at the point values: yes", a quantity "12.4 mg / L at the point values"
 * over its 95% interval and method.
 */
export function glanceValue(g: GlanceEntry, study: Study, work: GlanceWork): TemplateResult {
  const w = glanceWords(g, study, work);
  const point = html`<span class="point">${w.point}</span>`;
  if (w.sure === undefined) return point;
  const sure = html`<span class="sure ${w.sureState === 'figures' ? '' : w.sureState}">${w.sure}</span>`;
  return w.sureFirst ? html`${sure}${point}` : html`${point}${sure}`;
}

/** The mark beside a result whose own cell is still computing: its value is from the previous inputs. */
export function glancePending(g: GlanceEntry, work: GlanceWork): TemplateResult | typeof nothing {
  return work.pending.includes(g.cell) ? html` <span class="pending-glance">(previous inputs: still computing)</span>` : nothing;
}

/** The styles of a glance value's parts: each part on a line of its own, a verdict's probability in bold. */
export const GLANCE_VALUE_CSS = `
  .glance span.point, .glance span.sure { display: block; }
  .glance span.sure.probability { font-weight: 600; }
  .glance span.sure.still, .glance span.sure.none { font-weight: normal; font-style: italic; }
`;
