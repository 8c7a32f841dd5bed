/**
 * Styles every plot element shares: uPlot's own sheet (adopted into the shadow root), the
 * labels and markers laid over the plotting area, the summary, and the print rules.
 */
import { css, unsafeCSS } from 'lit';
import uplotCss from 'uplot/dist/uPlot.min.css?inline';

export const chartStyles = [
  unsafeCSS(uplotCss),
  css`
    :host { display: block; color: #1d2630; font: 13px/1.4 system-ui, -apple-system, "Segoe UI", sans-serif; }
    figure { margin: 0; }
    .chart { position: relative; width: 100%; }
    .controls { display: flex; gap: 0.8rem; align-items: center; justify-content: flex-end; font-size: 12px; color: #5c6773; margin-bottom: 0.2rem; }
    .controls select { font: inherit; color: #1d2630; }
    .summary { margin: 0.4rem 0 0; font-size: 0.9rem; color: #26313c; max-width: 70ch; }
    .notes { margin: 0.2rem 0 0; font-size: 0.85rem; color: #6b4d00; }
    .key { display: flex; flex-wrap: wrap; gap: 0.3rem 1rem; font-size: 12px; color: #3b4652; margin: 0.2rem 0 0; padding: 0; list-style: none; }
    .key svg { vertical-align: middle; margin-right: 0.3rem; }
    .uplot { font-family: inherit; }
    canvas.strip { display: block; }
    .u-legend { font-size: 12px; }
    .plot-labels { position: absolute; inset: 0; pointer-events: none; }
    .leaders { position: absolute; inset: 0; width: 100%; height: 100%; overflow: visible; }
    .leaders line { stroke: #5c6773; stroke-width: 1; }
    .lbl { position: absolute; white-space: nowrap; font-size: 12px; line-height: 16px; padding: 0 3px;
      background: rgba(255, 255, 255, 0.88); border-radius: 3px; color: #1d2630; }
    .lbl.level { color: #3b4652; font-style: italic; }
    .lbl.fold { font-weight: 600; }
    .event { position: absolute; top: 0; bottom: 0; width: 12px; margin-left: -6px; padding: 0; border: 0;
      background: transparent; cursor: help; pointer-events: auto; }
    .event:focus { outline: none; }
    .event:focus-visible { outline: 2px solid #7b5ea7; outline-offset: 1px; }
    .event .tip { display: none; position: absolute; top: 2px; left: 10px; white-space: nowrap; font-size: 12px;
      line-height: 16px; padding: 2px 6px; background: #2b2140; color: #fff; border-radius: 3px; z-index: 2; }
    .event.flip .tip { left: auto; right: 10px; }
    .event:hover .tip, .event:focus .tip { display: block; }
    @media print {
      :host { color: #000; }
      .controls { display: none; }
      figure { break-inside: avoid; }
      .event .tip { display: none !important; }
      .lbl { background: #fff; }
      .u-legend .u-value { display: none; }
    }
  `,
];
