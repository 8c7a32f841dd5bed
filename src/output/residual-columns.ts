/**
 * A fit's residuals as columns: typed arrays of numbers and a table of the few texts, instead
 * of one object per measured value. The app's engine worker sends a fit's residuals to the
 * page this way (its buffers transferred, not copied): receiving 10,000 residuals as objects
 * (50,000 objects with their quantities) held the page's thread for about 30 ms, a few typed
 * arrays take well under one. The page reads the columns for its plot and turns them back into
 * the report's `residuals`, exactly, only when something asks for them (`lazyResiduals`).
 */
import type { FitResidual } from '../engine/report.ts';

export interface ResidualColumns {
  /** The texts the residuals use (states and units), each once. */
  readonly texts: readonly string[];
  /** Per residual: its data row (1-based). */
  readonly row: Float64Array;
  /** Per residual: indices into `texts` of its state, its time's unit and its value's unit. */
  readonly state: Uint32Array;
  readonly timeUnit: Uint32Array;
  readonly unit: Uint32Array;
  /** Per residual: its time and value as shown (`value`) and in SI (`si`). */
  readonly time: Float64Array;
  readonly timeSi: Float64Array;
  readonly value: Float64Array;
  readonly valueSi: Float64Array;
}

/** The residuals as columns. Cost: linear in the residuals, a few allocations. */
export function residualColumns(residuals: readonly FitResidual[]): ResidualColumns {
  const n = residuals.length;
  const texts: string[] = [];
  const index = new Map<string, number>();
  const textAt = (s: string): number => {
    let i = index.get(s);
    if (i === undefined) {
      i = texts.length;
      texts.push(s);
      index.set(s, i);
    }
    return i;
  };
  const c = {
    texts, row: new Float64Array(n), state: new Uint32Array(n), timeUnit: new Uint32Array(n), unit: new Uint32Array(n),
    time: new Float64Array(n), timeSi: new Float64Array(n), value: new Float64Array(n), valueSi: new Float64Array(n),
  };
  residuals.forEach((r, k) => {
    c.row[k] = r.row;
    c.state[k] = textAt(r.state);
    c.timeUnit[k] = textAt(r.time.unit);
    c.unit[k] = textAt(r.residual.unit);
    c.time[k] = r.time.value;
    c.timeSi[k] = r.time.si;
    c.value[k] = r.residual.value;
    c.valueSi[k] = r.residual.si;
  });
  return c;
}

/** The residuals back as the report writes them: the same numbers and texts, bit for bit. */
export function residualsFromColumns(c: ResidualColumns): FitResidual[] {
  const out: FitResidual[] = new Array(c.row.length);
  for (let k = 0; k < c.row.length; k++) {
    out[k] = {
      row: c.row[k], state: c.texts[c.state[k]],
      time: { value: c.time[k], unit: c.texts[c.timeUnit[k]], si: c.timeSi[k] },
      residual: { value: c.value[k], unit: c.texts[c.unit[k]], si: c.valueSi[k] },
    };
  }
  return out;
}

/** The buffers of the columns, to transfer with a message. */
export function residualBuffers(c: ResidualColumns): ArrayBuffer[] {
  return [c.row, c.state, c.timeUnit, c.unit, c.time, c.timeSi, c.value, c.valueSi].map((a) => a.buffer as ArrayBuffer);
}

/**
 * Gives `target` a `residuals` property that is made from `c` the first time it is read (and
 * kept): a report received with its residuals as columns reads as one with them as objects.
 */
export function lazyResiduals(target: object, c: ResidualColumns): void {
  let made: FitResidual[] | undefined;
  Object.defineProperty(target, 'residuals', {
    get: () => (made ??= residualsFromColumns(c)), enumerable: true, configurable: true,
  });
}
