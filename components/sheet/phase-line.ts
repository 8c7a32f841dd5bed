/**
 * The phase line of a one-state law, drawn as SVG for the sheet: the state's range as an axis,
 * each equilibrium as a dot (filled: attractor; open: repeller; half-filled: semi-stable), and
 * an arrow on each interval pointing the way the state moves there.
 */
import { svg, type SVGTemplateResult } from 'lit';
import { formatNumber, type ReportQuantity } from '../../src/index.ts';
import { INK, STABLE, UNSTABLE } from '../plots/palette.ts';

/** A quantity as the report gives it; the line reads its value and unit. */
type Q = Readonly<Pick<ReportQuantity, 'value' | 'unit'>>;
export interface PhaseLineSpec {
  readonly state: string;
  readonly from: number;
  readonly to: number;
  readonly unit: string;
  readonly equilibria: ReadonlyArray<Q & { readonly stability: string }>;
  readonly intervals: ReadonlyArray<{ readonly from: Q | null; readonly to: Q | null; readonly sign: string }>;
}

export function phaseLine(p: PhaseLineSpec, width = 640): SVGTemplateResult {
  const left = 30;
  const right = 30;
  const y = 34;
  const span = p.to - p.from || 1;
  const X = (v: number) => left + ((v - p.from) / span) * (width - left - right);
  const label = (v: number) => `${formatNumber(v, 4)} ${p.unit}`.trim();
  return svg`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} 70" width=${width} height="70" font-family="sans-serif" font-size="11" role="img">
    <line x1=${left} x2=${width - right} y1=${y} y2=${y} stroke=${INK} stroke-width="1.2" />
    <text x=${left} y=${y + 26} text-anchor="start" fill=${INK}>${label(p.from)}</text>
    <text x=${width - right} y=${y + 26} text-anchor="end" fill=${INK}>${label(p.to)}</text>
    <text x=${width / 2} y="12" text-anchor="middle" fill=${INK}>${p.state}</text>
    ${p.intervals.map((iv) => {
      const a = X(iv.from?.value ?? p.from);
      const b = X(iv.to?.value ?? p.to);
      if (b - a < 14) return '';
      const mid = (a + b) / 2;
      const d = iv.sign === '+' ? 1 : -1;
      return svg`<path d="M${mid - 7 * d},${y - 6} L${mid + 7 * d},${y} L${mid - 7 * d},${y + 6}" fill="none" stroke=${INK} stroke-width="1.6" />`;
    })}
    ${p.equilibria.map((e) => {
      const x = X(e.value);
      const fill = e.stability === 'attractor' ? STABLE : '#fff';
      const stroke = e.stability === 'attractor' ? STABLE : UNSTABLE;
      return svg`<circle cx=${x} cy=${y} r="6" fill=${fill} stroke=${stroke} stroke-width="1.6" />
        ${e.stability === 'semi-stable' ? svg`<path d="M${x},${y - 6} A6,6 0 0 1 ${x},${y + 6} Z" fill=${UNSTABLE} />` : ''}
        <text x=${x} y=${y + 26} text-anchor="middle" fill=${INK}>${label(e.value)}</text>`;
    })}
  </svg>`;
}
