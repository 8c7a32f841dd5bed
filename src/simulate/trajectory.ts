/**
 * A simulated trajectory: the pieces between scheduled actions, each with the solver's
 * dense output. States may jump at a piece boundary (a bolus); the value at a boundary time
 * is the value after the actions there (right-continuous), except at the run's end.
 */
import type { DenseSegment } from '../numerics/ode/types.ts';
import { findSegment } from '../numerics/ode/integrate.ts';

export interface Piece {
  readonly t0: number;
  readonly t1: number;
  /** States (with quadrature states appended) at t0, after the actions at t0. */
  readonly y0: Float64Array;
  /** States at t1, before the actions at t1. */
  readonly y1: Float64Array;
  readonly segments: readonly DenseSegment[];
  /** Parameter values and constant infusion rates (per state) in force on this piece. */
  readonly params: Float64Array;
  readonly infusion: Float64Array;
}

export interface Trajectory {
  readonly t0: number;
  readonly t1: number;
  /** Number of values per point: states then quadrature states. */
  readonly width: number;
  /** The states before the actions at t0 (a dose at t0 is a jump from these). */
  readonly start: Float64Array;
  readonly pieces: readonly Piece[];
}

/** The index of the piece that holds t (the later one at a boundary); -1 outside the run. */
export function pieceAt(tr: Trajectory, t: number): number {
  const ps = tr.pieces;
  if (!(t >= tr.t0 && t <= tr.t1) || ps.length === 0) return -1;
  let lo = 0, hi = ps.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (ps[mid].t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Writes the trajectory at t into out; false outside the run. */
export function valueAt(tr: Trajectory, t: number, out: Float64Array): boolean {
  const i = pieceAt(tr, t);
  if (i < 0) return false;
  evalPiece(tr.pieces[i], t, out);
  return true;
}

/**
 * Writes the trajectory just before t into out (the left side of a jump: the value before the
 * actions at t; at the run's start, the states before the actions there); false outside the run.
 */
export function valueBefore(tr: Trajectory, t: number, out: Float64Array): boolean {
  let i = pieceAt(tr, t);
  if (i < 0) return false;
  while (i > 0 && tr.pieces[i].t0 >= t) i--;
  if (i === 0 && t <= tr.t0) out.set(tr.start);
  else evalPiece(tr.pieces[i], t, out);
  return true;
}

export function evalPiece(p: Piece, t: number, out: Float64Array): void {
  if (t <= p.t0) { out.set(p.y0); return; }
  if (t >= p.t1) { out.set(p.y1); return; }
  const s = findSegment(p.segments, t);
  if (s < 0) out.set(t < p.t0 ? p.y0 : p.y1);
  else p.segments[s].eval(t, out);
}

/** Step points of the whole run, with both sides of every jump: for plots and `--series`. */
export function stepPoints(tr: Trajectory): { t: number[]; y: Float64Array[] } {
  const t: number[] = [];
  const y: Float64Array[] = [];
  const out = new Float64Array(tr.width);
  for (const p of tr.pieces) {
    t.push(p.t0);
    y.push(Float64Array.from(p.y0));
    for (const s of p.segments) {
      if (s.t1 >= p.t1) break;
      s.eval(s.t1, out);
      t.push(s.t1);
      y.push(Float64Array.from(out));
    }
    t.push(p.t1);
    y.push(Float64Array.from(p.y1));
  }
  return { t, y };
}
