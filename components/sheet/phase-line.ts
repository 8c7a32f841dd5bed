/**
 * The phase line of a one-state law, drawn as SVG for the sheet: the state's range as an axis,
 * each equilibrium with the same mark as on screen (filled: attractor; open: repeller; filled
 * on the side it attracts from, as the engine reports it: semi-stable), and an arrow on each
 * interval where the state moves. Where the rate is zero on a whole stretch the state stays
 * still (a thick line, no arrow); where the rate is not defined, a dotted gap.
 */
import { svg, type SVGTemplateResult } from 'lit';
import { formatNumber, type ReportQuantity } from '../../src/index.ts';
import { INK, MUTED, STABLE } from '../plots/palette.ts';
import { equilibriumMark } from '../plots/equilibrium-dot.ts';

/** A quantity as the report gives it; the line reads its value and unit. */
type Q = Readonly<Pick<ReportQuantity, 'value' | 'unit'>>;
export interface PhaseLineSpec {
  /** The line's text alternative (the engine's summary of the phase cell): its name and its title. */
  readonly label: string;
  readonly state: string;
  readonly from: number;
  readonly to: number;
  readonly unit: string;
  readonly equilibria: ReadonlyArray<Q & { readonly stability: string; readonly attractsFrom?: string }>;
  readonly intervals: ReadonlyArray<{ readonly from: Q | null; readonly to: Q | null; readonly sign: string }>;
}

export function phaseLine(p: PhaseLineSpec, width = 640): SVGTemplateResult {
  const left = 30;
  const right = 30;
  const y = 34;
  const span = p.to - p.from || 1;
  const X = (v: number) => left + ((v - p.from) / span) * (width - left - right);
  const label = (v: number) => `${formatNumber(v, 4)} ${p.unit}`.trim();
  return svg`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} 70" width=${width} height="70" font-family="sans-serif" font-size="11" role="img" aria-label=${p.label}>
    <title>${p.label}</title>
    <line x1=${left} x2=${width - right} y1=${y} y2=${y} stroke=${INK} stroke-width="1.2" />
    <text x=${left} y=${y + 26} text-anchor="start" fill=${INK}>${label(p.from)}</text>
    <text x=${width - right} y=${y + 26} text-anchor="end" fill=${INK}>${label(p.to)}</text>
    <text x=${width / 2} y="12" text-anchor="middle" fill=${INK}>${p.state}</text>
    ${p.intervals.map((iv) => {
      const a = X(iv.from?.value ?? p.from);
      const b = X(iv.to?.value ?? p.to);
      if (iv.sign === '0') return svg`<line class="still" x1=${a} x2=${b} y1=${y} y2=${y} stroke=${STABLE} stroke-width="4" />`;
      if (iv.sign === 'none') {
        return svg`<line x1=${a} x2=${b} y1=${y} y2=${y} stroke="#fff" stroke-width="4" />
          <line class="undefined" x1=${a} x2=${b} y1=${y} y2=${y} stroke=${MUTED} stroke-width="1.2" stroke-dasharray="2 3" />`;
      }
      if ((iv.sign !== '+' && iv.sign !== '-') || b - a < 14) return '';
      const mid = (a + b) / 2;
      const d = iv.sign === '+' ? 1 : -1;
      return svg`<path class="arrow ${iv.sign === '+' ? 'rising' : 'falling'}" d="M${mid - 7 * d},${y - 6} L${mid + 7 * d},${y} L${mid - 7 * d},${y + 6}" fill="none" stroke=${INK} stroke-width="1.6" />`;
    })}
    ${p.equilibria.map((e) => {
      const x = X(e.value);
      return svg`${equilibriumMark(x, y, 6, e.stability, e.attractsFrom, 1.6)}
        <text x=${x} y=${y + 26} text-anchor="middle" fill=${INK}>${label(e.value)}</text>`;
    })}
  </svg>`;
}
