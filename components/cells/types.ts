/** Document and report types the cell elements read (from the engine's public surface). */
export type { CellReport, Report, Study } from '../../src/index.ts';
import type { Cell } from '../../src/index.ts';

export type ParametersCellDoc = Extract<Cell, { kind: 'parameters' }>;
export type RateCellDoc = Extract<Cell, { kind: 'rate' }>;
export type SimulateCellDoc = Extract<Cell, { kind: 'simulate' }>;
export type PhaseCellDoc = Extract<Cell, { kind: 'phase' }>;
export type NoteCellDoc = Extract<Cell, { kind: 'note' }>;
