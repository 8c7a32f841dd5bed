/**
 * The report as a readable table for a terminal: the title and cautions, the results at a glance
 * (report-text-glance.ts), then one block per cell, quantities aligned. The
 * study-format contract fixes the JSON report (`--json`), not this table; its rows follow the
 * report's fields (a fit's `digits`, a Ratebook addition, in words beside its number), each figure
 * to 6 significant digits (a run's error against the exact solution to 2, a solve's answer to
 * the digits it is good to), counts whole; a run's exact solution stretch by stretch a row per
 * stretch.
 */
import type { CellReport, Report } from '../engine/report.ts';
import { formatNumber } from '../units/quantity.ts';
import { unitAfterNumber } from '../units/units.ts';
import { scenarioRows } from './report-text-scenarios.ts';
import { uncertaintyRows } from './report-text-uncertainty.ts';
import { glanceLines } from './report-text-glance.ts';

interface Q { value: number; unit: string; si: number }

const HIDDEN = new Set(['id', 'kind', 'title', 'ok', 'error', 'errors', 'waitsOn', 'series', 'plot', 'intervals', 'summary', 'residuals', 'questions', 'tex']);

export function formatReport(report: Report): string {
  const lines: string[] = [report.title, '='.repeat(Math.min(72, Math.max(8, report.title.length))), ''];
  for (const c of report.cautions ?? []) lines.push(`CAUTION: ${c.text}`, '');
  const glance = glanceLines(report);
  if (glance.length) lines.push(...glance, '');
  for (const cell of report.cells) lines.push(...formatCell(cell), '');
  const failed = report.cells.filter((c) => !c.ok).length;
  if (report.warnings.length) {
    lines.push('Warnings:');
    for (const w of report.warnings) lines.push(`  - ${w}`);
    lines.push('');
  }
  lines.push(failed === 0 ? `All ${report.cells.length} cells are ok.` : `${failed} of ${report.cells.length} cells have errors.`);
  return `${lines.join('\n')}\n`;
}

function formatCell(cell: CellReport): string[] {
  const status = cell.ok ? (cell.computed === false ? 'not computed' : 'ok') : 'ERROR';
  const head = `[${status}] ${cell.id} (${cell.kind})${cell.title ? ` - ${cell.title}` : ''}`;
  const out = [head];
  if (!cell.ok && cell.error) {
    out.push(`    ${cell.error.path}: ${cell.error.message}`);
    for (const e of (cell.errors ?? []).slice(1)) out.push(`    ${e.path}: ${e.message}`);
  }
  const special = scenarioRows(cell) ?? uncertaintyRows(cell);
  const rows: Array<[string, string]> = special ?? [];
  for (const [key, value] of special ? [] : Object.entries(cell)) {
    if (HIDDEN.has(key) || key === 'computed') continue;
    if (key === 'equilibria' && Array.isArray(value)) {
      for (const e of value as Array<Q & { stability: string; slope: Q }>) rows.push(['equilibrium', `${showQuantity(e)}  ${e.stability} (slope ${showQuantity(e.slope)})`]);
      if (value.length === 0) rows.push(['equilibria', 'none in the range']);
    } else if (key === 'sweep' && value && typeof value === 'object') {
      const sw = value as { parameter: string; summary?: string; folds: Array<{ parameter: Q; value: Q }> };
      for (const f of sw.folds) rows.push(['fold', `${sw.parameter} = ${showQuantity(f.parameter)} at ${showQuantity(f.value)}`]);
      if (sw.summary) rows.push(['sweep', sw.summary]);
    } else if (key === 'correlation' && value && typeof value === 'object') {
      const cor = value as { names: string[]; matrix: number[][] };
      cor.names.forEach((a, i) => cor.names.forEach((b, j) => { if (j > i) rows.push([`corr(${a}, ${b})`, formatNumber(cor.matrix[i][j], 3)]); }));
    } else if (key === 'csv' && value && typeof value === 'object') {
      const csv = value as { notes?: string[]; problems?: Array<{ row: number; line: number; text: string; message: string }> };
      for (const n of csv.notes ?? []) rows.push(['csv', n]);
      for (const p of csv.problems ?? []) rows.push([`row ${p.row}`, `line ${p.line} "${p.text}": ${p.message}`]);
    } else if (key === 'digits' && typeof value === 'number') {
      // a fit's or a solve's digits (a Ratebook addition to the report): said in words, the number first
      rows.push(['digits', cell.kind === 'solve' ? `${value} (significant digits of the solution its accuracy supports)` : `${value} (significant digits of every estimate the fit vouches for)`]);
    } else if (cell.kind === 'solve' && (key === 'solution' || key === 'solutions') && typeof cell.digits === 'number') {
      // a solve's answer to the digits it is good to, as the solve cell shows it
      const qs = (Array.isArray(value) ? value : [value]).filter(isQuantity);
      rows.push([key, qs.map((q) => showQuantity(q, cell.digits as number)).join(', ')]);
    } else if (key === 'notes' && Array.isArray(value)) {
      for (const n of value) rows.push(['note', String(n)]);
    } else {
      collect(key, value, rows);
    }
  }
  const width = Math.min(24, Math.max(0, ...rows.map(([k]) => k.length)));
  for (const [k, v] of rows) out.push(`    ${k.padEnd(width)}  ${v}`);
  if (typeof cell.summary === 'string') out.push(`    ${cell.summary}`);
  return out;
}

/** Significant digits of the table's figures: a run's error against the exact solution says its size (as the simulate cell shows it), every other figure as the quantities. */
const QUANTITY_DIGITS = 6;
const ERROR_DIGITS = 2;
const digitsFor = (key: string): number => (/(^|\.)maxError(InTolerances)?$/.test(key) ? ERROR_DIGITS : QUANTITY_DIGITS);

/** A plain number of the report: a count (a whole number) as it is, any other figure to its significant digits. */
function showNumber(key: string, x: number): string {
  return Number.isInteger(x) ? String(x) : formatNumber(x, digitsFor(key));
}

function collect(key: string, value: unknown, rows: Array<[string, string]>): void {
  if (/\.stretches$/.test(key) && Array.isArray(value)) {
    // a run's exact solution stretch by stretch: a row each, its figures in order
    value.forEach((s: Record<string, unknown>, i) => {
      const figures = Object.entries(s).filter(([k]) => k !== 'from' && k !== 'to')
        .map(([k, v]) => `${k} ${isQuantity(v) ? showQuantity(v) : String(v)}`);
      rows.push([`${key}[${i}]`, `from ${showQuantity(s.from as Q)} to ${showQuantity(s.to as Q)}: ${figures.join(', ')}`]);
    });
  } else if (isQuantity(value)) {
    rows.push([key, showQuantity(value, digitsFor(key))]);
  } else if (typeof value === 'number') {
    rows.push([key, showNumber(key, value)]);
  } else if (Array.isArray(value)) {
    if (value.every(isQuantity)) rows.push([key, value.map((q) => showQuantity(q)).join(/range$/.test(key) ? ' to ' : ', ')]);
    else value.forEach((v, i) => collect(`${key}[${i}]`, v, rows));
  } else if (value && typeof value === 'object') {
    const entries = Object.entries(value);
    const flat = key === 'values' || key === 'results' || key === 'estimates';
    if (flat && entries.every(([, v]) => isQuantity(v) || (v && typeof v === 'object' && isQuantity((v as Record<string, unknown>).value)))) {
      for (const [k, v] of entries) collect(k, isQuantity(v) ? v : v, rows);
    } else {
      for (const [k, v] of entries) collect(flat ? k : `${key}.${k}`, v, rows);
    }
  } else if (value !== undefined) {
    rows.push([key, String(value)]);
  }
}

function isQuantity(v: unknown): v is Q {
  return !!v && typeof v === 'object' && typeof (v as Q).value === 'number' && typeof (v as Q).unit === 'string' && typeof (v as Q).si === 'number';
}

function showQuantity(q: Q, digits = QUANTITY_DIGITS): string {
  // a parameter that is a condition (a verdict): yes or no
  if (typeof (q as { truth?: unknown }).truth === 'boolean') return (q as { truth?: boolean }).truth ? 'yes' : 'no';
  const v = formatNumber(q.value, digits);
  const spread = (q as { spread?: { text?: string } }).spread?.text;
  return `${q.unit ? `${v} ${unitAfterNumber(q.unit)}` : v}${spread ? `  (spread ${spread})` : ''}`;
}
