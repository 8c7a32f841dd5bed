/**
 * The fit cell's controls for a Bayesian (MAP) estimate: each estimate's prior (median and
 * omega) under its row, the fit's error model (additive and proportional SD), and the words
 * beside an estimate on its prior and how far the data moved it. Renders and edits only: every
 * number shown comes from the engine's report.
 */
import { html, nothing } from 'lit';
import type { EstimateReport, FitPrior, FitErrorModel } from '../../src/index.ts';
import { type ErrorClaims, footError, showQ } from './common.ts';
import '../expr-field.ts';
import type { StudyName } from '../expr-field.ts';

type Input = CustomEvent<{ value: string }>;

/**
 * What a typed plain number is stored as: a number when the text is one (`0.3`), the text
 * itself otherwise (an expression such as `sqrt(0.09)`, or text the engine will refuse on its
 * field, so that nothing typed is lost); undefined when blank.
 */
export function plainNumberOf(text: string): number | string | undefined {
  const t = text.trim();
  if (t === '') return undefined;
  return /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t) ? Number(t) : t;
}

/** What the fit cell gives these controls. */
export interface PriorHost {
  readonly claims: ErrorClaims;
  readonly names: readonly StudyName[];
  setPrior(i: number, prior: Partial<FitPrior> | undefined, key: string): void;
  setError(error: FitErrorModel | undefined, key: string): void;
}

/** The row under estimate i: its prior, behind a disclosure open when a prior is set. */
export function priorRow(h: PriorHost, i: number, prior: Partial<FitPrior> | undefined, colspan: number) {
  const p = `.estimate[${i}].prior`;
  const omega = prior?.omega;
  const set = (patch: Partial<FitPrior>, key: string) => {
    const next: Record<string, unknown> = { ...(prior ?? {}), ...patch };
    for (const k of Object.keys(next)) if (next[k] === undefined) delete next[k];
    h.setPrior(i, Object.keys(next).length ? next as Partial<FitPrior> : undefined, key);
  };
  return html`<tr class="more"><td class="wide" colspan=${colspan}><details ?open=${prior !== undefined}><summary>Prior (makes the fit a Bayesian estimate)</summary>
    <div class="row">
      <span class="lbl">Median</span>
      <expr-field class="w9" data-field="estimate[${i}].prior.median" label="Estimate ${i + 1} prior median (blank: no prior)" .value=${prior?.median ?? ''} .names=${h.names}
        .error=${h.claims.take(`${p}.median`)} @expr-input=${(e: Input) => set({ median: e.detail.value.trim() === '' ? undefined : e.detail.value }, `pmed${i}`)}></expr-field>
      <label>omega <input type="text" inputmode="decimal" class="count" data-field="estimate[${i}].prior.omega"
        aria-label="Estimate ${i + 1} prior omega, the SD of its logarithm (0.3 is about 30%)" .value=${omega === undefined ? '' : String(omega)}
        @input=${(e: Event) => set({ omega: plainNumberOf((e.target as HTMLInputElement).value) }, `pom${i}`)} /></label>
      <span class="muted">log-normal: log of the parameter ~ N(log median, omega²)</span>
      ${footError(h.claims.take(`${p}.omega`) ?? h.claims.take(p))}
    </div></details></td></tr>`;
}

/** Beside an estimate's value: its prior median and how far the data moved it. */
export function movedWords(res: EstimateReport | undefined) {
  const pr = res?.prior;
  if (!pr) return nothing;
  const shift = `${pr.shift >= 0 ? '+' : '−'}${Math.abs(pr.shift).toFixed(2)}`;
  return html`<div class="muted moved">prior median ${showQ(pr.median)}; the data moved it ×${pr.ratio.toPrecision(3)} (${shift} omega)</div>`;
}

/** The fit's error model, behind a disclosure open when it or a prior is set. */
export function errorModelRow(h: PriorHost, error: FitErrorModel | undefined, open: boolean) {
  const set = (patch: Partial<FitErrorModel>, key: string) => {
    const next: Record<string, unknown> = { ...(error ?? {}), ...patch };
    for (const k of Object.keys(next)) if (next[k] === undefined) delete next[k];
    h.setError(Object.keys(next).length ? next as FitErrorModel : undefined, key);
  };
  return html`<details class="error-model" ?open=${open || error !== undefined}><summary>Measurement error (needed for a prior)</summary>
    <div class="row">
      <span class="lbl">Additive SD</span>
      <expr-field class="w9" data-field="error.additive" label="Additive SD of a measurement, in the measured unit" .value=${error?.additive ?? ''} .names=${h.names}
        .error=${h.claims.take('.error.additive')} @expr-input=${(e: Input) => set({ additive: e.detail.value.trim() === '' ? undefined : e.detail.value }, 'eadd')}></expr-field>
      <label>Proportional SD <input type="text" inputmode="decimal" class="count" data-field="error.proportional"
        aria-label="Proportional SD of a measurement, a fraction of the predicted value (0.1 is 10%)" .value=${error?.proportional === undefined ? '' : String(error.proportional)}
        @input=${(e: Event) => set({ proportional: plainNumberOf((e.target as HTMLInputElement).value) }, 'eprop')} /></label>
      <span class="muted">SD² = additive² + (proportional × predicted)²</span>
      ${footError(h.claims.take('.error.proportional') ?? h.claims.take('.error'))}
    </div></details>`;
}
