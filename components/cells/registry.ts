/**
 * Cell kinds in the app: how each is shown and what a new one starts as. Adding a kind is one
 * element and one entry here.
 */
import { html, type TemplateResult } from 'lit';
import type { Cell, CellReport, Report } from '../../src/index.ts';
import { NEW_DATA_COLUMNS, NEW_DATA_ROWS } from '../../src/index.ts';
import './parameters-cell.ts';
import './rate-cell.ts';
import './simulate-cell.ts';
import './phase-cell.ts';
import './note-cell.ts';
import './data-cell.ts';
import './nca-cell.ts';
import './fit-cell.ts';
import './solve-cell.ts';
import './uncertainty-cell.ts';
import './sensitivity-cell.ts';
import './compare-cell.ts';

export interface KindInfo {
  /** Shown on the "add" buttons and the cell's tag. */
  readonly label: string;
  /** Fields of a new cell of this kind (the id is added by the caller). */
  readonly blank: (study: { cells: readonly Cell[] }) => Record<string, unknown>;
  /** `doc` is the study's document, for messages in words. */
  readonly render: (cell: Cell, report: CellReport | undefined, study: Report | undefined, doc?: { readonly cells: readonly Cell[] }) => TemplateResult;
}

const firstRate = (study: { cells: readonly Cell[] }) => study.cells.find((c) => c.kind === 'rate');
const firstData = (study: { cells: readonly Cell[] }) => study.cells.find((c) => c.kind === 'data') as Extract<Cell, { kind: 'data' }> | undefined;

export const KINDS: Record<Cell['kind'], KindInfo> = {
  parameters: {
    label: 'Parameters',
    blank: () => ({ items: [{ name: 'k', value: '0.5 / h' }] }),
    render: (c, r, s, d) => html`<parameters-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></parameters-cell>`,
  },
  rate: {
    label: 'Rate law',
    blank: () => ({ state: 'y', unit: 'mg / L', rate: '-y / (2 h)', initial: '10 mg / L' }),
    render: (c, r, s, d) => html`<rate-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></rate-cell>`,
  },
  phase: {
    label: 'Where it settles',
    // a range in the law's own unit (a temperature law's 0 to 20 degC, not 0 to 20 mg / L)
    blank: (study) => {
      const rate = firstRate(study) as Extract<Cell, { kind: 'rate' }> | undefined;
      const unit = typeof rate?.unit === 'string' && rate.unit.trim() !== '' && rate.unit.trim() !== '1' ? ` ${rate.unit.trim()}` : rate ? '' : ' mg / L';
      return { rate: rate?.id ?? '', from: `0${unit}`, to: `20${unit}` };
    },
    render: (c, r, s, d) => html`<phase-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></phase-cell>`,
  },
  simulate: {
    label: 'Run',
    // every law of the study: a run of some of them is a choice the user makes by unticking
    blank: (study) => ({ rates: study.cells.filter((c) => c.kind === 'rate').map((c) => c.id), from: '0 h', to: '12 h', find: [] }),
    render: (c, r, s, d) => html`<simulate-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></simulate-cell>`,
  },
  note: {
    label: 'Note',
    blank: () => ({ text: '' }),
    render: (c) => html`<note-cell .cell=${c}></note-cell>`,
  },
  data: {
    label: 'Measurements',
    blank: () => ({ columns: NEW_DATA_COLUMNS.map((c) => ({ ...c })), rows: NEW_DATA_ROWS.map((r) => [...r]) }),
    render: (c, r, s, d) => html`<data-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></data-cell>`,
  },
  fit: {
    label: 'Fit',
    blank: (study) => {
      const rate = firstRate(study) as Extract<Cell, { kind: 'rate' }> | undefined;
      const data = firstData(study);
      return {
        rates: rate ? [rate.id] : [], data: data?.id ?? '', time: data?.columns[0]?.name ?? 't',
        observe: rate && data?.columns[1] ? { [rate.state]: data.columns[1].name } : {},
        estimate: rate ? [{ parameter: rate.state, as: `${rate.state}0_fit`, guess: rate.initial }] : [],
      };
    },
    render: (c, r, s, d) => html`<fit-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></fit-cell>`,
  },
  nca: {
    label: 'Profile summary',
    blank: (study) => {
      const data = firstData(study);
      return { data: data?.id ?? '', time: data?.columns[0]?.name ?? 't', concentration: data?.columns[1]?.name ?? 'C', dose: '100 mg', route: 'iv-bolus' };
    },
    render: (c, r, s, d) => html`<nca-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></nca-cell>`,
  },
  solve: {
    label: 'Solve for',
    // the study's first parameter, over half to twice its value, and its first answer as the target
    blank: (study) => {
      const p = study.cells.find((c) => c.kind === 'parameters') as Extract<Cell, { kind: 'parameters' }> | undefined;
      const name = p?.items?.[0]?.name ?? 'x';
      const run = study.cells.find((c) => c.kind === 'simulate' && (c.find ?? []).length) as Extract<Cell, { kind: 'simulate' }> | undefined;
      return { vary: { parameter: name, as: `${name}_solved`, min: `${name} / 2`, max: `${name} * 2` }, target: { value: run?.find?.[0]?.name ?? '', equals: '' } };
    },
    render: (c, r, s, d) => html`<solve-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></solve-cell>`,
  },
  uncertainty: {
    label: 'How sure',
    // the study's first answer of a run, else its first parameter
    blank: (study) => {
      const run = study.cells.find((c) => c.kind === 'simulate' && (c.find ?? []).length) as Extract<Cell, { kind: 'simulate' }> | undefined;
      const p = study.cells.find((c) => c.kind === 'parameters') as Extract<Cell, { kind: 'parameters' }> | undefined;
      const name = run?.find?.[0]?.name ?? p?.items?.[0]?.name;
      return { of: name ? [name] : [], method: 'monte-carlo', samples: 2000, seed: 1 };
    },
    render: (c, r, s, d) => html`<uncertainty-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></uncertainty-cell>`,
  },
  sensitivity: {
    label: 'What matters most',
    // the first run's answers against the study's parameters (at most five), as a start
    blank: (study) => {
      const run = study.cells.find((c) => c.kind === 'simulate' && (c.find ?? []).length) as Extract<Cell, { kind: 'simulate' }> | undefined;
      const items = study.cells.flatMap((c) => (c.kind === 'parameters' ? c.items.map((i) => i.name) : []));
      return { of: run?.find?.slice(0, 1).map((f) => f.name) ?? [''], parameters: items.length ? items.slice(0, 5) : [''] };
    },
    render: (c, r, s, d) => html`<sensitivity-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></sensitivity-cell>`,
  },
  compare: {
    label: 'Scenarios',
    // the study's first run, as it stands: scenarios are added one by one
    blank: (study) => ({ run: study.cells.find((c) => c.kind === 'simulate')?.id ?? '', scenarios: [{ name: 'as_is', set: {} }] }),
    render: (c, r, s, d) => html`<compare-cell .cell=${c} .report=${r} .study=${s} .doc=${d}></compare-cell>`,
  },
};

/** The kinds offered on the "add a cell" bar, in order. */
export const ADDABLE: ReadonlyArray<Cell['kind']> = ['parameters', 'rate', 'simulate', 'phase', 'data', 'fit', 'nca', 'solve', 'sensitivity', 'compare', 'uncertainty', 'note'];
