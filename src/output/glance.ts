/**
 * Results at a glance: the few results a reader of the study looks for first, chosen by the
 * engine so that every view lists the same ones. When any parameters item or `find` entry of
 * the study carries `glance: true`, those are the glance results; otherwise: every yes/no
 * verdict, every question a run answered, the main results of each profile summary (Cmax,
 * tmax, AUCinf, t_half, CL, Vz) and every fitted estimate. In that order: verdicts first, then
 * answers, other chosen parameters, profile results, estimates; in document order within each.
 * A result an uncertainty cell follows (its `of` names it) carries `sure`: how sure that cell
 * is of it (glance-sure.ts); the choice and order of the list do not depend on it.
 */
import type { Cell } from '../study/types.ts';
import type { CellReport } from '../engine/report.ts';
import { followingCell, sureOf, uncertaintyCellsByName, type GlanceSure } from './glance-sure.ts';

export type { GlanceSure, GlanceInterval } from './glance-sure.ts';

/** A quantity as the report gives it. */
type Shown = { readonly value: number; readonly unit: string; readonly si: number; readonly truth?: boolean };

export type GlanceKind = 'verdict' | 'answer' | 'parameter' | 'profile' | 'estimate';

export interface GlanceEntry {
  /** The name the result is defined under downstream. */
  readonly name: string;
  /** The id of the cell that reports it. */
  readonly cell: string;
  readonly kind: GlanceKind;
  /** The value (a verdict's carries `truth`); absent when there is none to show. */
  readonly value?: Shown;
  /** An estimate's standard error (null when it cannot be had). */
  readonly standardError?: Shown | null;
  /** A crossing the run never reached: the run's end. */
  readonly notReachedBy?: Shown;
  /** Why a result the study chose for the glance has no value (the cell failed, or waits). */
  readonly unavailable?: string;
  /** With `unavailable`: the cells its cell waits on (ids), for words. */
  readonly waitsOn?: readonly string[];
  /**
   * Where an uncertainty cell follows the result (a Ratebook addition): a verdict's probability
   * of yes, a quantity's 95% interval, as that cell shows them, or why it has none. `value`
   * stays the result at the point values.
   */
  readonly sure?: GlanceSure;
}

/** The profile summary's results that belong at a glance by default (names without the prefix). */
export const MAIN_PROFILE_RESULTS: readonly string[] = ['Cmax', 'tmax', 'AUCinf', 't_half', 'CL', 'Vz'];

const ORDER: readonly GlanceKind[] = ['verdict', 'answer', 'parameter', 'profile', 'estimate'];

/** The glance list of a study from its cells and their reports. Cost: linear in the results. */
export function glanceOf(cells: readonly Cell[], reports: readonly CellReport[]): GlanceEntry[] {
  const chosen = cells.some((c) => (c.kind === 'parameters' && Array.isArray(c.items) && c.items.some((i) => i?.glance === true))
    || (c.kind === 'simulate' && Array.isArray(c.find) && c.find.some((f) => f?.glance === true)));
  const out: GlanceEntry[] = [];
  // the reports are in the cells' order; a look-up by id only where they are not
  let byId: Map<string, CellReport> | undefined;
  for (let i = 0; i < cells.length; i++) {
    const cell = cells[i];
    const r = reports[i]?.id === cell.id ? reports[i] : (byId ??= new Map(reports.map((x) => [x.id, x]))).get(cell.id);
    if (!r) continue;
    const why = r.ok ? 'not computed' : r.waitsOn ? `waits on ${r.waitsOn.join(', ')}` : r.error?.message ?? 'not computed';
    const waits = !r.ok && r.waitsOn ? { waitsOn: [...r.waitsOn] } : {};
    if (cell.kind === 'parameters' && Array.isArray(cell.items)) {
      const values = (r.values ?? {}) as Record<string, Shown>;
      for (const item of cell.items) {
        if (typeof item?.name !== 'string' || (chosen && item.glance !== true)) continue;
        const q = values[item.name];
        const verdict = typeof q?.truth === 'boolean';
        if (!chosen && !verdict) continue;
        out.push(q ? { name: item.name, cell: cell.id, kind: verdict ? 'verdict' : 'parameter', value: q }
          : { name: item.name, cell: cell.id, kind: 'parameter', unavailable: why, ...waits });
      }
    } else if (cell.kind === 'simulate' && Array.isArray(cell.find)) {
      const results = (r.results ?? {}) as Record<string, Shown | { notReached: true; end: Shown }>;
      for (const f of cell.find) {
        if (typeof f?.name !== 'string' || (chosen && f.glance !== true)) continue;
        const x = r.ok ? results[f.name] : undefined;
        if (!x && !chosen) continue;
        out.push(!x ? { name: f.name, cell: cell.id, kind: 'answer', unavailable: why, ...waits }
          : 'notReached' in x ? { name: f.name, cell: cell.id, kind: 'answer', notReachedBy: x.end }
          : { name: f.name, cell: cell.id, kind: 'answer', value: x });
      }
    } else if (!chosen && r.ok && cell.kind === 'nca') {
      const prefix = typeof cell.prefix === 'string' ? cell.prefix : '';
      const values = (r.values ?? {}) as Record<string, Shown | null>;
      for (const base of MAIN_PROFILE_RESULTS) {
        const q = values[`${prefix}${base}`];
        if (q) out.push({ name: `${prefix}${base}`, cell: cell.id, kind: 'profile', value: q });
      }
    } else if (!chosen && r.ok && cell.kind === 'fit') {
      const estimates = (r.estimates ?? {}) as Record<string, { value: Shown; standardError: Shown | null }>;
      for (const [name, e] of Object.entries(estimates)) out.push({ name, cell: cell.id, kind: 'estimate', value: e.value, standardError: e.standardError });
    }
  }
  const sorted = ORDER.flatMap((kind) => out.filter((e) => e.kind === kind)); // stable: document order within each kind
  const following = uncertaintyCellsByName(cells);
  if (!following.size) return sorted;
  return sorted.map((e) => {
    const list = following.get(e.name);
    if (!list || (!e.value && !e.notReachedBy)) return e;
    const verdict = e.kind === 'verdict';
    const u = followingCell(list, verdict);
    return { ...e, sure: sureOf(e.name, verdict, u.id, (byId ??= new Map(reports.map((x) => [x.id, x]))).get(u.id)) };
  });
}
