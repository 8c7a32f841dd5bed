/**
 * One result at a glance as text, the same in the study view and on the printed sheet: its value
 * at the point values, and where an uncertainty cell follows it, how sure (the engine's `sure`:
 * a verdict's probability of yes with its Monte Carlo error, a quantity's 95% interval, as that
 * cell shows them), never a point verdict alone. While the uncertainty cell is still computing
 * its figures are not shown: "how sure: still computing". Renders only.
 */
import { html, nothing, type TemplateResult } from 'lit';
import { cellWords, type Cell, type GlanceEntry, type GlanceSure, type Progress } from '../src/index.ts';
import { showQ, showValue } from './cells/common.ts';

/** The cells still computing, and the progress of the one computing (the controller's). */
export interface GlanceWork {
  readonly pending: readonly string[];
  readonly progress?: Progress;
}

type Study = { readonly cells: readonly Cell[] };

const count = (p: Progress) => `${p.done.toLocaleString('en-US')} of ${p.total.toLocaleString('en-US')} ${p.unit}`;

/** Why there is no value: the wait in words, else the engine's reason. */
function missing(study: Study, own: string, reason: string, waitsOn: readonly string[] | undefined): string {
  return waitsOn?.length ? `not computed: ${waitsOn.filter((id) => id !== own).map((id) => `waits on ${cellWords(study, id)}`).join('; ') || 'waits'}` : reason;
}

/** How sure, in words: the figures, still computing, or why there are none. */
function sureText(s: GlanceSure, study: Study, work: GlanceWork): string {
  if (work.pending.includes(s.cell)) {
    const p = work.progress?.cell === s.cell ? ` (${count(work.progress)})` : '';
    return `how sure: still computing${p}`;
  }
  if (s.words) return s.words;
  return `how sure: ${missing(study, s.cell, s.unavailable ?? 'not computed', s.waitsOn)}`;
}

/** The point value or verdict of an entry, or why it has none. */
function pointText(g: GlanceEntry, study: Study): string {
  if (g.waitsOn?.length || g.unavailable !== undefined) return missing(study, g.cell, g.unavailable ?? 'not computed', g.waitsOn);
  if (g.notReachedBy) return `not reached by ${showQ(g.notReachedBy)}`;
  if (g.kind === 'verdict') return showValue(g.value);
  return `${g.value ? showQ(g.value) : ''}${g.standardError ? ` ± ${showQ(g.standardError)} (SE)` : ''}`;
}

/**
 * The value of one entry: without an uncertainty cell, the value as before; with one, a verdict
 * reads "yes in 54% of 2,000 samples (± 1.1 points, Monte Carlo)" over "at the point values: yes",
 * a quantity "12.4 mg / L at the point values" over its 95% interval and method.
 */
export function glanceValue(g: GlanceEntry, study: Study, work: GlanceWork): TemplateResult {
  const point = pointText(g, study);
  const s = g.sure;
  if (!s) return html`<span class="point">${point}</span>`;
  const pending = work.pending.includes(s.cell);
  const sure = html`<span class="sure ${pending ? 'still' : s.probability !== undefined ? 'probability' : s.words ? '' : 'none'}">${sureText(s, study, work)}</span>`;
  return g.kind === 'verdict'
    ? html`${sure}<span class="point">at the point values: ${point}</span>`
    : html`<span class="point">${point}${g.value ? ' at the point values' : nothing}</span>${sure}`;
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
