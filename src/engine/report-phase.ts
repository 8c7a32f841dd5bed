/**
 * The report fields of a `phase` cell: equilibria, the sign of the rate between them, what the
 * phase plot draws and a sweep of a parameter. Part of `CellFields` in report.ts.
 */
import type { ReportQuantity } from '../units/quantity.ts';
import type { Stability } from '../numerics/phase/equilibria.ts';
import type { Side } from '../numerics/phase/approach.ts';

export interface PhaseEquilibrium extends ReportQuantity {
  stability: Stability;
  /** df/dy at the point, per the law's time unit. */
  slope: ReportQuantity;
  /** A semi-stable point's side: `below` when the rate is positive on both sides, `above` when negative. */
  attractsFrom?: Side;
}

export interface PhaseInterval {
  from: ReportQuantity | null;
  to: ReportQuantity | null;
  sign: '+' | '-' | '0' | 'none';
}

export interface QuantitySpan {
  from: ReportQuantity;
  to: ReportQuantity;
}

/** What the phase plot draws, in the study's units. */
export interface PhasePlotData {
  stateUnit: string;
  rateUnit: string;
  timeUnit: string;
  y: Array<number | null>;
  f: Array<number | null>;
  solutions: Array<{ start: number | null; t: number[]; y: Array<number | null> }>;
}

export interface SweepPoint {
  parameter: ReportQuantity;
  value: ReportQuantity;
  stability: Stability;
}

export interface SweepFold {
  parameter: ReportQuantity;
  value: ReportQuantity;
  pair: 'vanishes' | 'appears';
  located: 'newton' | 'bisection' | 'grid';
  converged: boolean;
}

export interface SweepReport {
  parameter: string;
  range: ReportQuantity[];
  branches: SweepPoint[][];
  folds: SweepFold[];
  evaluations: number;
  summary: string;
  warnings?: string[];
  incomplete?: string;
}

export interface PhaseFields {
  equilibria: PhaseEquilibrium[];
  intervals: PhaseInterval[];
  poles?: ReportQuantity[];
  jumps?: ReportQuantity[];
  gaps?: QuantitySpan[];
  zeroIntervals?: QuantitySpan[];
  evaluations: number;
  notes?: string[];
  plot: PhasePlotData;
  summary: string;
  sweep?: SweepReport;
}
