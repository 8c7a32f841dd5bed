/**
 * Which notes the printed sheet shows an inspector, and which stay in the editor.
 *
 * For an inspector (printed under their cell, in plain language): what qualifies a result —
 * a fit's warnings (an estimate not identifiable, no degrees of freedom left), a profile
 * summary's warnings, the phase search's notes and a sweep's warnings or where it stopped, a
 * run that switched to the stiff method, missing measurements and how a CSV text was read,
 * a rate law not finite at its start.
 *
 * Engine-only (never printed): the report's `warnings` — how the study's text is read (a name
 * that hides a unit or a constant, a format migration). They help whoever writes the study,
 * say nothing about the results; the study view shows them in words (`warningParts`).
 *
 * Pure; reads the report only.
 */
import type { CellReport } from '../engine/report.ts';

/** The notes the sheet prints under a cell, in order; none for a cell that failed (its problem is printed instead). */
export function inspectorNotes(r: CellReport): string[] {
  if (!r.ok) return [];
  const out: string[] = [];
  switch (r.kind) {
    case 'fit': {
      out.push(...(r.warnings ?? []));
      break;
    }
    case 'nca': out.push(...(r.warnings ?? [])); if (r.note) out.push(r.note); break;
    case 'phase': {
      out.push(...(r.notes ?? []));
      out.push(...(r.sweep?.warnings ?? []));
      if (r.sweep?.incomplete) out.push(r.sweep.incomplete);
      break;
    }
    case 'simulate': if (r.note) out.push(r.note); break;
    case 'data': {
      if (r.note) out.push(r.note);
      out.push(...(r.csv?.notes ?? []));
      if (r.csv?.start !== undefined) out.push(`times are counted from the first row, ${r.csv.start}`);
      break;
    }
    case 'rate': if (r.warning) out.push(r.warning); break;
    default: break;
  }
  return [...new Set(out)].map(sentence);
}

/**
 * Why a fit's residual standard deviation is not given, in words; undefined when it is. With
 * as many points as estimates no degrees of freedom are left to estimate it from.
 */
export function residualSdReason(r: Pick<CellReport & { kind: 'fit' }, 'residualSD' | 'dof' | 'n' | 'converged'>): string | undefined {
  if (r.residualSD) return undefined;
  if (typeof r.dof === 'number' && r.dof <= 0) {
    const n = r.n ?? 0;
    return `not available: ${n} point${n === 1 ? '' : 's'} for ${n - r.dof} estimate${n - r.dof === 1 ? '' : 's'} leave no degrees of freedom to estimate it from`;
  }
  return r.converged === false ? 'not available: the fit did not finish' : 'not available';
}

/** First letter up, a full stop at the end. */
function sentence(s: string): string {
  const t = s.trim();
  if (!t) return t;
  return `${t[0].toUpperCase()}${t.slice(1)}${/[.!?]$/.test(t) ? '' : '.'}`;
}
