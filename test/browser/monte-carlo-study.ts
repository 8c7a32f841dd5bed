// The study the Monte Carlo browser tests share: the trough template (invented numbers) with
// more samples and a slider on CL, mounted in a study view with the real engine worker, every
// answer recorded; and the same study evaluated at once in the page (the reference).
import { StudyView } from '../../components/study-view.ts';
import '../../components/cells/registry.ts';
import type { EngineAnswer } from '../../components/engine-client.ts';
import { runStudy, type Cell, type CellReport, type Study } from '../../src/index.ts';
import trough from '../../examples/trough-in-range-probability.ratebook.json';
import { until } from './helpers.ts';

export const MC = 'between-patients';
/** About 0.5 s of samples on a quiet machine: long enough to watch, short enough under load. */
export const SAMPLES = 1500;

/** The template with SAMPLES samples and a slider on CL from 2 to 8 L/h. */
export function study(): Study {
  const doc = structuredClone(trough) as unknown as Study;
  doc.cells = doc.cells.map((c) => {
    if (c.kind === 'uncertainty') return { ...c, samples: SAMPLES };
    if (c.id !== 'regimen') return c;
    const p = c as Extract<Cell, { kind: 'parameters' }>;
    return { ...p, items: p.items.map((it) => (it.name === 'CL' ? { ...it, range: ['2 L / h', '8 L / h'] } : it)) };
  });
  return doc;
}

/** The uncertainty cell's report of `doc` evaluated at once, without slices. */
export function atOnce(doc: Study): CellReport {
  const r = runStudy(doc);
  if (!r.ok) throw new Error(r.error.message);
  return r.report.cells.find((c) => c.id === MC)!;
}

/** The run's trough in a report (mg/L). */
/**
 * A half-life from a clearance and a volume, k with a spread of its own that hides theirs from
 * what reads k (invented numbers).
 */
export function hiddenSpreadStudy(): Study {
  return {
    format: 'ratebook-study', version: 1, title: 'half-life (invented numbers)', cells: [
      { id: 'pk', kind: 'parameters', items: [
        { name: 'CL', value: '5 L / h', spread: { distribution: 'lognormal', cv: 0.3 } },
        { name: 'V', value: '50 L', spread: { distribution: 'lognormal', cv: 0.2 } },
        { name: 'k', value: 'CL / V', spread: { distribution: 'lognormal', cv: 0.1 } },
        { name: 't_half', value: 'log(2) / k' },
      ] },
      { id: 'how', kind: 'uncertainty', of: ['t_half'], samples: 200, seed: 3 },
    ],
  } as Study;
}

export const runTrough = (r: { cells: readonly CellReport[] } | undefined) => (r?.cells.find((c) => c.id === 'run') as { results?: { trough?: { value: number } } } | undefined)?.results?.trough?.value;

export interface Live {
  readonly view: StudyView;
  /** Every answer of the engine, in order. */
  readonly answers: EngineAnswer[];
  article(id: string): HTMLElement;
  mcReport(): CellReport | undefined;
  /** The Monte Carlo cell is still computing. */
  pending(): boolean;
}

/** A study view on `doc`, once the engine's first answer has rendered. */
export async function mount(doc: Study): Promise<Live> {
  const view = StudyView.create();
  document.body.append(view);
  const answers: EngineAnswer[] = [];
  view.controller.onAnswer((a) => answers.push(a));
  view.controller.open('live', doc);
  await until(() => answers.length > 0, 'the first answer', 20_000);
  await view.updateComplete;
  return {
    view, answers,
    article: (id) => view.shadowRoot!.querySelector(`article[data-cell="${id}"]`) as HTMLElement,
    mcReport: () => view.controller.report?.cells.find((c) => c.id === MC),
    pending: () => view.controller.pending.includes(MC),
  };
}
