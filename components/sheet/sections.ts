/**
 * Each cell of a study as a static section of the printed sheet: tables, typeset laws, the
 * phase line and charts, from the document and the engine's report. Nothing here computes a
 * result; it lays out what the report holds.
 */
import { html, nothing, type TemplateResult } from 'lit';
import { isKind, KIND_LABELS, cellWords, closedFormWords, shownSolution, runBand, type RunBand, fieldWords, inspectorNotes, problemWords, residualSdReason, waitedOn, waitWords, type Cell, type CellReport, type Report, type ReportOf, type SimulationPlot, type SweepReport } from '../../src/index.ts';
import { showQ, showValue, nameBreaks } from '../cells/common.ts';
import { lineChart, type ChartLine, type ChartPoints } from './svg-chart.ts';
import { phaseLine } from './phase-line.ts';
import { STABLE, UNSTABLE } from '../plots/palette.ts';
import { axisNameOf, leftOffLog } from '../plots/time-plot-parts.ts';
import { runsOf, SWEEP_KEY } from '../plots/sweep-runs.ts';
import { math } from './math.ts';
import { fitPriorPart } from './fit-prior-sheet.ts';
import { sensitivitySheet, compareSheet } from './scenario-sheet.ts';
import { uncertaintySheet } from './uncertainty-sheet.ts';
import { hasFigures, pendingMark, type SheetPending } from './pending-sheet.ts';
import { glanceValue, glancePending } from '../glance-values.ts';

const NONE_PENDING: SheetPending = { pending: [] };

type Of<K extends Cell['kind']> = Extract<Cell, { kind: K }>;

/** Definitions longer than this (characters of source) are typeset on a row of their own. */
const LONG_DEFINITION = 32;

/** Each kind as the app names it, so that a place in words (`Run "Six doses"`) is found by its heading. */
const KIND_NAMES: Record<Cell['kind'], string> = { ...KIND_LABELS, nca: `${KIND_LABELS.nca} (non-compartmental)` };

/**
 * Results at a glance, for the top of the sheet: the engine's `glance` list as it stands (it
 * chooses and orders them), each with the cell it comes from, and how sure where an
 * uncertainty cell follows it (`glance-values.ts`, as the study view shows it).
 */
export function glance(report: Report, study: { readonly cells: readonly Cell[] }, work: SheetPending = NONE_PENDING): TemplateResult | typeof nothing {
  const list = report.glance ?? [];
  if (!list.length) return nothing;
  const fromOf = (id: string) => { const c = report.cells.find((x) => x.id === id); return c?.title || id; };
  return html`<section class="cell glance"><h2>Results at a glance</h2>
    <table><thead><tr><th>Result</th><th>Value</th><th>From</th></tr></thead>
    <tbody>${list.map((g) => html`<tr class=${g.sure ? 'with-sure' : ''}><td class="name">${nameBreaks(g.name)}</td><td class="num">${glanceValue(g, study, work)}${glancePending(g, work)}</td><td class="from">${fromOf(g.cell)}</td></tr>`)}</tbody></table></section>`;
}

/**
 * One cell as a section: its body, or its problems in words (places as a person sees them, a
 * wait said once with its reason); then the notes an inspector needs (`inspectorNotes`).
 */
export function section(cell: Cell, r: CellReport | undefined, doc: { readonly cells: readonly Cell[] }, report: Report, work: SheetPending = NONE_PENDING): TemplateResult {
  // a cell computing for the first time has no figures yet: its mark says so, and there is no body
  const firstRun = work.pending.includes(cell.id) && !hasFigures(r);
  const body = firstRun ? nothing : !r ? html`<p class="muted">Not computed.</p>` : !r.ok ? problems(cell, r, doc, report) : bodyOf(cell, r, doc.cells, report, work);
  return html`<section class="cell ${cell.kind} ${work.pending.includes(cell.id) ? 'pending' : ''}">
    <h2>${cell.title || KIND_NAMES[cell.kind]} <span class="kind">${KIND_NAMES[cell.kind]} · ${cell.id}</span></h2>
    ${pendingMark(cell.id, r, work, (id) => cellWords(doc, id))}
    ${body}
    ${r ? inspectorNotes(r).map((n) => html`<p class="check note">Note: ${n}</p>`) : nothing}
  </section>`;
}

function problems(cell: Cell, r: CellReport, doc: { readonly cells: readonly Cell[] }, report: Report): TemplateResult {
  const errors = r.errors ?? (r.error ? [r.error] : []);
  const waits = waitedOn(errors).filter((id) => id !== cell.id).map((id) => waitWords(doc, report, id, errors));
  const own = errors.filter((e) => e.kind !== 'waits');
  return html`${waits.map((w) => html`<p class="error">Not computed: it ${w}.</p>`)}
    ${own.map((e) => html`<p class="error">Error in ${fieldWords(doc, e.path, false)}: ${problemWords(doc, report, e)}</p>`)}
    ${!waits.length && !own.length ? html`<p class="error">Not computed.</p>` : nothing}`;
}

function bodyOf(cell: Cell, r: CellReport, cells: readonly Cell[], report: Report, work: SheetPending): TemplateResult {
  if (cell.kind === 'note') return html`<p class="note-text">${typeof cell.text === 'string' ? cell.text : ''}</p>`;
  if (cell.kind === 'parameters' && isKind(r, 'parameters')) return parameters(cell, r);
  if (cell.kind === 'rate' && isKind(r, 'rate')) return rate(cell, r);
  if (cell.kind === 'phase' && isKind(r, 'phase')) return phase(cell, r, (cells.find((c) => c.id === cell.rate) as Of<'rate'> | undefined)?.state ?? '');
  if (cell.kind === 'simulate' && isKind(r, 'simulate')) return simulate(cell, r, cell.band === true ? runBand({ cells }, report, cell.id) : undefined, cells, work);
  if (cell.kind === 'data' && isKind(r, 'data')) return data(cell, r);
  if (cell.kind === 'fit' && isKind(r, 'fit')) return fit(cell, r, cells);
  if (cell.kind === 'nca' && isKind(r, 'nca')) return nca(cell, r);
  if (cell.kind === 'solve' && isKind(r, 'solve')) return solve(cell, r);
  if (cell.kind === 'sensitivity' && isKind(r, 'sensitivity')) return sensitivitySheet(cell, r);
  if (cell.kind === 'uncertainty' && isKind(r, 'uncertainty')) return uncertaintySheet(cell, r);
  if (cell.kind === 'compare' && isKind(r, 'compare')) return compareSheet(cell, r, (plot, summary) => timeChart(plot, summary), cells.find((c) => c.id === cell.run)?.title);
  return html`<p class="muted">Not computed.</p>`;
}

function parameters(cell: Of<'parameters'>, r: ReportOf<'parameters'>): TemplateResult {
  const values = r.values ?? {};
  const tex = r.tex ?? {};
  const items = Array.isArray(cell.items) ? cell.items : [];
  // A long definition gets a row of its own under its name, across the table.
  return html`<table class="parameters">
    <colgroup><col class="narrow" /><col class="wide" /><col class="narrow" /><col class="wide" /></colgroup>
    <thead><tr><th>Name</th><th>Defined as</th><th>Value</th><th>Note</th></tr></thead>
    <tbody>${items.map((it) => {
      const t = tex[it.name]?.value;
      const shown = t ? math(`\\displaystyle ${t}`) : html`<code>${it.value}</code>`;
      const long = typeof it.value === 'string' && it.value.length > LONG_DEFINITION;
      return html`<tr class=${long ? 'has-formula' : ''}><td class="name">${nameBreaks(it.name)}</td><td>${long ? html`<span class="muted">below</span>` : shown}</td>
        <td class="num">${showValue(values[it.name])}${values[it.name]?.spread ? html`<br /><span class="muted spread">spread: ${values[it.name]!.spread!.text}</span>` : nothing}</td><td>${it.note ?? ''}${it.range ? html` <span class="muted">(range ${it.range[0]} to ${it.range[1]})</span>` : nothing}${values[it.name]?.spread?.note ? html`<br /><span class="check">${values[it.name]!.spread!.note}</span>` : nothing}</td></tr>
        ${long ? html`<tr class="formula"><td colspan="4">${t ? math(`\\displaystyle ${tex[it.name].name} = ${t}`) : html`<code>${it.name} = ${it.value}</code>`}</td></tr>` : nothing}`;
    })}</tbody></table>`;
}

function rate(cell: Of<'rate'>, r: ReportOf<'rate'>): TemplateResult {
  const t = r.tex;
  return html`<div class="equation">${t ? math(t, true) : html`<code>d${cell.state}/dt = ${cell.rate}</code>`}</div>
    <p>State <strong>${cell.state}</strong>, shown in ${cell.unit}; starts at <code>${cell.initial}</code> = ${showQ(r.initial)};
    at the start it changes by ${showQ(r.rateAtStart)}.</p>`;
}

function phase(cell: Of<'phase'>, r: ReportOf<'phase'>, state: string): TemplateResult {
  const eqs = r.equilibria ?? [];
  const plot = r.plot;
  const ys = (plot?.y ?? []).filter((v): v is number => v !== null);
  const sweep = r.sweep;
  return html`
    ${ys.length > 1 ? html`<figure class="lead">${phaseLine({ label: summaryOr(r.summary, `phase line of ${state}`), state, from: ys[0], to: ys[ys.length - 1], unit: plot!.stateUnit, equilibria: eqs, intervals: r.intervals ?? [] })}</figure>` : nothing}
    ${eqs.length ? html`<table><thead><tr><th>Equilibrium</th><th>Stability</th><th>Slope of the rate there</th></tr></thead>
      <tbody>${eqs.map((e) => html`<tr><td class="num">${showQ(e)}</td><td>${e.stability}</td><td class="num">${showQ(e.slope)}</td></tr>`)}</tbody></table>`
      : html`<p>No equilibrium in the range ${cell.from} to ${cell.to}.</p>`}
    <div class="keep">${plot && ys.length > 1 ? html`<figure>${lineChart({ label: summaryOr(r.summary, `rate of ${state} against ${state}`), xLabel: `state (${plot.stateUnit})`, yLabels: [`rate (${plot.rateUnit})`], zeroLine: true, height: 200,
      lines: [{ label: 'rate', x: plot.y.map((v) => v ?? NaN), y: plot.f }] })}</figure>` : nothing}
    ${typeof r.summary === 'string' ? html`<p class="summary">${r.summary}</p>` : nothing}</div>
    ${sweep ? sweepPart(cell, sweep, state) : nothing}`;
}

function sweepPart(cell: Of<'phase'>, sweep: SweepReport, state: string): TemplateResult {
  const first = sweep.branches.find((b) => b.length)?.[0];
  // each branch in runs of one stability, stable solid, unstable dashed, one legend entry each; the folds marked, not drawn as lines
  const lines: ChartLine[] = [];
  const listed = new Set<boolean>();
  // stable runs first, so that the legend reads as the app's key does
  const runs = runsOf({ parameter: sweep.parameter, branches: sweep.branches, folds: sweep.folds }).sort((a, b) => Number(b.stable) - Number(a.stable));
  for (const run of runs) {
    lines.push({ label: run.stable ? SWEEP_KEY.stable : SWEEP_KEY.unstable, x: run.x, y: run.y,
      colour: run.stable ? STABLE : UNSTABLE, dashed: !run.stable, unlisted: listed.has(run.stable) });
    listed.add(run.stable);
  }
  const folds = { key: SWEEP_KEY.fold, at: sweep.folds.map((f) => ({ x: f.parameter.value, y: f.value.value, label: `fold: ${cell.sweep?.name} = ${showQ(f.parameter)}` })) };
  return html`<h3>As ${cell.sweep?.name} runs from ${cell.sweep?.from} to ${cell.sweep?.to}</h3>
    ${first ? html`<figure>${lineChart({ label: summaryOr(sweep.summary, `equilibria of ${state} against ${cell.sweep?.name}`), xLabel: `${cell.sweep?.name} (${first.parameter.unit})`, yLabels: [`equilibrium (${first.value.unit})`], lines, folds, xRange: sweptRange(sweep, first.parameter.unit), height: 220 })}</figure>` : nothing}
    ${sweep.folds.length ? html`<table class="follows"><thead><tr><th>Fold at ${cell.sweep?.name}</th><th>Equilibrium there</th></tr></thead>
      <tbody>${sweep.folds.map((f) => html`<tr><td class="num">${showQ(f.parameter)}</td><td class="num">${showQ(f.value)}</td></tr>`)}</tbody></table>`
      : html`<p class="follows">No fold: no two equilibria meet in this range.</p>`}`;
}

/** The swept range in the unit of the branches' points (the app's sweep plot spans it too), if the report gives it in that unit. */
function sweptRange(sweep: SweepReport, unit: string): [number, number] | undefined {
  const [a, b] = sweep.range ?? [];
  return a && b && a.unit === unit && b.unit === unit ? [a.value, b.value] : undefined;
}

/** A run: its span, schedule, chart (with the band from an uncertainty cell's samples when it shows one, and its note) and answers. */
function simulate(cell: Of<'simulate'>, r: ReportOf<'simulate'>, band: RunBand | undefined, cells: readonly Cell[], work: SheetPending): TemplateResult {
  // a band drawn by a cell still computing is from the previous inputs
  const staleBand = band && 'band' in band && work.pending.includes(band.cell) ? ` This band is from the previous inputs: ${cellWords({ cells }, band.cell)} was still computing when printed.` : '';
  const results = r.results ?? {};
  const answer = (name: string) => {
    const x = results[name];
    return !x ? 'not found' : 'notReached' in x ? x.message : showQ(x);
  };
  const finds = Array.isArray(cell.find) ? cell.find : [];
  const events = Array.isArray(cell.events) ? cell.events : [];
  const plot = r.plot;
  const questions = r.questions ?? {};
  const schedule = r.schedule ?? [];
  const closed = r.closedForm ?? {};
  return html`
    <p class="lead">From ${cell.from} to ${cell.to}; laws ${(cell.rates ?? []).join(', ')}; method ${r.method} (${r.steps} steps, ${r.evaluations} evaluations of the rates).</p>
    ${events.length ? html`<table class="events lead"><thead><tr><th>At</th><th>Repeats</th><th>Action</th></tr></thead><tbody>${events.map((e, i) => html`<tr>
      <td>${e.at}</td><td>${schedule[i]?.repeats ?? ''}</td>
      <td>${e.add ? `add ${Object.entries(e.add).map(([k, v]) => `${v} to ${k}`).join(', ')}` : e.set ? `set ${Object.entries(e.set).map(([k, v]) => `${k} = ${v}`).join(', ')}` : e.infuse ? `infuse ${Object.entries(e.infuse).map(([k, v]) => `${v} into ${k}`).join(', ')} for ${e.for}` : ''}</td></tr>`)}</tbody></table>` : nothing}
    <div class="keep">${plot ? timeChart(plot, r.summary, cell.plotScale === 'log', band && 'band' in band ? band.band : undefined) : nothing}
    ${band ? html`<p class="check band-note">${'band' in band ? `${band.band.note} The samples are those of ${cellWords({ cells }, band.cell)}.` : `No band: ${band.reason}`}${staleBand ? html`<strong class="pending-mark">${staleBand}</strong>` : nothing}</p>` : nothing}
    ${typeof r.summary === 'string' ? html`<p class="summary">${r.summary}</p>` : nothing}</div>
    ${finds.length ? html`<table class="results follows"><thead><tr><th>Found</th><th>Question</th><th>Answer</th></tr></thead><tbody>${finds.map((f) => html`<tr>
      <td class="name">${nameBreaks(f.name)}</td><td>${questions[f.name] ?? ''}</td><td class="num answer">${answer(f.name)}</td></tr>`)}</tbody></table>` : nothing}
    ${Object.entries(closed).map(([state, c]) => html`<p class="check closed-form follows">Check: ${closedFormWords(state, c)}</p>`)}`;
}

/** A chart's text alternative: the engine's summary, or words naming what it shows when there is none. */
function summaryOr(summary: unknown, fallback: string): string {
  return typeof summary === 'string' && summary ? summary : fallback;
}

/** A run's chart; with `log`, on log axes, with a note of each state's values that cannot be drawn there. */
function timeChart(plot: SimulationPlot, summary: unknown, log = false, band?: Extract<RunBand, { band: unknown }>['band']): TemplateResult {
  const units = [...new Set(plot.states.map((s) => s.unit))].slice(0, 2);
  const axisOf = (state: string) => (units.indexOf(plot.states.find((s) => s.name === state)?.unit ?? '') === 1 ? 1 : 0);
  const shown = plot.states.filter((s) => units.includes(s.unit));
  // a compare cell's curves are named by scenario; its axes name the states they show (axisNameOf)
  const points: ChartPoints[] = (plot.points ?? []).map((p) => ({ label: `${p.state} measured`, x: p.t, y: p.values, axis: axisOf(p.state), colourOf: shown.findIndex((s) => s.name === p.state) }));
  return html`<figure>${lineChart({
    logY: log,
    label: summaryOr(summary, `${shown.map((s) => s.name).join(', ')} against time`),
    xLabel: `time (${plot.timeUnit})`,
    yLabels: units.map((u) => `${[...new Set(shown.filter((s) => s.unit === u).map((s) => axisNameOf(plot, plot.states.indexOf(s))))].join(', ')}${u ? ` (${u})` : ''}`),
    lines: shown.map((s) => ({ label: s.name, x: plot.t, y: s.values, axis: units.indexOf(s.unit) === 1 ? 1 : 0 })),
    points,
    bands: (band?.states ?? []).filter((b) => shown.some((s) => s.name === b.name)).map((b) => ({
      label: `${b.name}: 2.5–97.5 percentile band`, x: band!.t, lo: b.p025, hi: b.p975, axis: axisOf(b.name), colourOf: shown.findIndex((s) => s.name === b.name),
    })),
    levels: plot.levels.map((l) => ({ y: l.value, label: l.label, axis: axisOf(l.state) })),
    events: plot.events.map((e) => ({ x: e.time, label: e.label })),
    marks: plot.marks.map((m) => ({ x: m.time, y: m.value, label: m.name, axis: axisOf(m.state) })),
  })}${log ? html`<figcaption>States on a logarithmic axis.${leftOffLog(plot, plot.points ?? []).map((t) => html` ${t}`)}</figcaption>` : nothing}</figure>`;
}

function data(cell: Of<'data'>, r: ReportOf<'data'>): TemplateResult {
  const columns = (Array.isArray(cell.columns) ? cell.columns : []) as Array<{ name: string; unit?: string }>;
  const rows = Array.isArray(cell.rows) ? cell.rows : null;
  return html`<p class="lead">${r.rowCount} rows${rows ? '' : ' (given as CSV)'}.</p>
    ${rows ? html`<table class="data"><thead><tr>${columns.map((c) => html`<th>${c.name}${c.unit ? ` (${c.unit})` : ''}</th>`)}</tr></thead>
      <tbody>${rows.map((row) => html`<tr>${(row as unknown[]).map((v) => html`<td class="num">${v === null ? '' : String(v)}</td>`)}</tr>`)}</tbody></table>`
    : html`<pre>${typeof cell.csv === 'string' ? cell.csv : ''}</pre>`}`;
}

function fit(cell: Of<'fit'>, r: ReportOf<'fit'>, cells: readonly Cell[]): TemplateResult {
  const est = r.estimates ?? {};
  const plot = r.plot;
  return html`${cell.run !== undefined ? html`<p class="lead">Fitted through ${cellWords({ cells }, cell.run)}: its start, laws and every event of its schedule; the data's times are on its clock.</p>` : nothing}
    <table class="results"><thead><tr><th>Estimate</th><th>Value</th><th>Standard error</th><th>95% interval</th></tr></thead>
    <tbody>${Object.entries(est).map(([name, e]) => html`<tr><td class="name">${nameBreaks(name)}</td><td class="num answer">${showQ(e.value)}</td>
      <td class="num">${e.standardError ? showQ(e.standardError) : 'not available'}</td><td class="num">${e.ci95 ? `${showQ(e.ci95[0])} to ${showQ(e.ci95[1])}` : ''}</td></tr>`)}</tbody></table>
    ${fitPriorPart(r)}
    <p class="check follows">Fit diagnostics: ${r.n} points, ${r.dof} degrees of freedom, ${r.errorModel ? 'SDs from the error model' : html`residual SD ${r.residualSD ? showQ(r.residualSD) : residualSdReason(r)}, weighting ${cell.weighting ?? 'none'}`}; ${r.converged ? 'converged' : 'did not converge'} after ${r.iterations} iterations (${r.message})${r.digits !== undefined ? `; estimates computed to ${r.digits} significant digits` : ''}.</p>
    <div class="keep follows">${plot ? timeChart(plot, r.summary, cell.plotScale === 'log') : nothing}
    ${typeof r.summary === 'string' ? html`<p class="summary">${r.summary}</p>` : nothing}</div>`;
}

function nca(cell: Of<'nca'>, r: ReportOf<'nca'>): TemplateResult {
  const values = r.values ?? {};
  const used = r.pointsUsed;
  return html`<p class="lead">Route ${cell.route}; areas by the ${cell.auc} rule; dose <code>${cell.dose}</code>.</p>
    <table class="results"><thead><tr><th>Result</th><th>Value</th></tr></thead>
    <tbody>${Object.entries(values).map(([name, q]) => html`<tr><td class="name">${nameBreaks(name)}</td><td class="num answer">${q ? showQ(q) : 'not available'}</td></tr>`)}</tbody></table>
    ${used ? html`<p class="check">Terminal phase fitted on ${used.count} points, at ${used.times.map((t) => showQ(t)).join(', ')}.</p>` : nothing}`;
}

/** A solve cell: its target, the value found, its rounded value, what each gives (tables of their own: `table.results` holds found results by name). */
function solve(cell: Of<'solve'>, r: ReportOf<'solve'>): TemplateResult {
  const v = cell.vary;
  const where = Array.isArray(v.choices) ? html`among the choices <code>${v.choices.join(', ')}</code>` : html`from <code>${v.min}</code> to <code>${v.max}</code>`;
  return html`<p class="lead">Target: <code>${cell.target.value}</code> = <code>${cell.target.equals}</code>, varying <strong>${v.parameter}</strong> ${where}; the answer is named <strong>${v.as}</strong>.</p>
    <table class="solved"><thead><tr><th>${v.parameter}</th><th>${cell.target.value}</th></tr></thead>
    <tbody><tr><td class="num answer">${r.solution ? shownSolution(r.solution, r) : ''}${r.digits !== undefined ? html`<br /><span class="muted">to its ${r.digits} significant digits</span>` : nothing}</td><td class="num">${r.achieved ? showQ(r.achieved) : ''}</td></tr>
    ${r.rounded ? html`<tr><td class="num answer">${showQ(r.rounded)} (rounded to a multiple of <code>${v.roundTo}</code>)</td><td class="num">${r.achievedRounded ? showQ(r.achievedRounded) : 'no value'}</td></tr>` : nothing}
    </tbody></table>
    ${r.choices ? html`<table class="solved"><thead><tr><th>Choice of ${v.parameter}</th><th>${cell.target.value}</th></tr></thead>
      <tbody>${r.choices.map((x) => html`<tr><td class="num ${x.chosen ? 'answer' : ''}">${showQ(x.value)}${x.chosen ? ' (nearest)' : ''}</td><td class="num">${x.achieved ? showQ(x.achieved) : x.reason ?? ''}</td></tr>`)}</tbody></table>` : nothing}
    ${r.solutions && r.solutions.length > 1 ? html`<p class="check">${r.solutions.length} values meet the target: ${r.solutions.map((q) => showQ(q)).join(', ')}; ${v.guess ? 'the one nearest the guess' : 'the smallest'} is used.</p>` : nothing}
    <p class="check">${r.message ? html`In short: ${r.message}; ` : nothing}${r.evaluations} runs.</p>`;
}
