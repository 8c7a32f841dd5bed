// The engine client against a fake worker: batching while busy, cancelling a long run when
// newer edits wait, and never letting a cancelled run's answer through; the progress and late
// reports of work after an answer (a Monte Carlo) let through only while no newer edit is sent.
import { expect } from 'chai';
import { EngineClient, CANCEL_AFTER_MS, type EngineAnswer } from '../../components/engine-client.ts';
import type { ToWorker, FromWorker } from '../../src/engine/worker-protocol.ts';
import type { Report, Study } from '../../src/index.ts';

class FakeWorker {
  received: ToWorker[] = [];
  terminated = false;
  onmessage: ((e: MessageEvent<FromWorker>) => void) | null = null;
  onerror: ((e: ErrorEvent) => void) | null = null;
  postMessage(m: ToWorker) { this.received.push(m); }
  terminate() { this.terminated = true; }
  answer(seq: number, title: string, more: object = {}) {
    const report = { title, ok: true, warnings: [], cautions: [], cells: [] } as Report;
    this.onmessage?.({ data: { type: 'report', seq, report, rerun: [], changed: [], ms: 1, ...more } } as unknown as MessageEvent<FromWorker>);
  }
  progress(seq: number, done: number) {
    this.onmessage?.({ data: { type: 'progress', seq, progress: { cell: 'mc', done, total: 100, unit: 'samples' } } } as unknown as MessageEvent<FromWorker>);
  }
}

const study = (title: string): Study => ({ format: 'ratebook-study', version: 1, title, cells: [] });

function client() {
  const workers: FakeWorker[] = [];
  const answers: EngineAnswer[] = [];
  const busy: boolean[] = [];
  const progress: number[] = [];
  const c = new EngineClient({ answer: (a) => answers.push(a), refused: () => {}, busy: (b) => busy.push(b), progress: (p) => progress.push(p.done) },
    () => { const w = new FakeWorker(); workers.push(w); return w as unknown as Worker; });
  return { c, workers, answers, busy, progress };
}

describe('engine client', () => {
  it('sends edits at once when idle and batches them while busy', () => {
    const { c, workers, answers } = client();
    c.open(study('a'));
    const w = workers[0];
    w.answer(1, 'a');
    c.edit({ type: 'retitle', title: 'b' }, study('b'));
    c.edit({ type: 'retitle', title: 'c' }, study('c'));
    c.edit({ type: 'retitle', title: 'd' }, study('d'));
    expect(w.received.map((m) => m.type)).to.deep.equal(['open', 'edits']);
    w.answer(2, 'b');
    expect(answers.map((a) => a.report.title)).to.deep.equal(['a', 'b']);
    const batch = w.received[2];
    expect(batch.type).to.equal('edits');
    expect((batch as Extract<ToWorker, { type: 'edits' }>).edits.length).to.equal(2);
    c.dispose();
  });

  it('cancels a long run when newer edits wait, and drops its late answer', async () => {
    const { c, workers, answers } = client();
    c.open(study('a'));
    workers[0].answer(1, 'a');
    c.edit({ type: 'retitle', title: 'slow' }, study('slow'));
    c.edit({ type: 'retitle', title: 'newest' }, study('newest'));
    await new Promise((r) => setTimeout(r, CANCEL_AFTER_MS + 60));
    expect(workers[0].terminated).to.equal(true);
    expect(workers.length).to.equal(2);
    const reopened = workers[1].received[0] as Extract<ToWorker, { type: 'open' }>;
    expect(reopened.type).to.equal('open');
    expect((reopened.doc as Study).title).to.equal('newest');
    workers[0].answer(2, 'slow'); // the cancelled run answers late
    workers[1].answer(reopened.seq, 'newest');
    expect(answers.map((a) => a.report.title)).to.deep.equal(['a', 'newest']);
    c.dispose();
  });

  it('lets the progress and late report of the newest edit through, with the cells still pending', () => {
    const { c, workers, answers, progress } = client();
    c.open(study('a'));
    const w = workers[0];
    w.answer(1, 'a', { pending: ['mc'] });
    expect(answers[0].pending).to.deep.equal(['mc']);
    w.progress(1, 40);
    w.answer(1, 'a, with its Monte Carlo', { late: true, pending: [] });
    expect(progress).to.deep.equal([40]);
    expect(answers.map((a) => [a.report.title, a.late])).to.deep.equal([['a', undefined], ['a, with its Monte Carlo', true]]);
    c.dispose();
  });

  it('drops the progress and late report of an older edit once a newer edit is sent, answered or not', () => {
    const { c, workers, answers, progress } = client();
    c.open(study('a'));
    const w = workers[0];
    w.answer(1, 'a', { pending: ['mc'] });
    c.edit({ type: 'retitle', title: 'b' }, study('b'));
    // the worker finished the old values' Monte Carlo before it read the edit
    w.progress(1, 90);
    w.answer(1, 'old values', { late: true });
    expect(answers.map((a) => a.report.title)).to.deep.equal(['a']);
    w.answer(2, 'b', { pending: ['mc'] });
    w.answer(1, 'old values, later still', { late: true });
    w.progress(1, 95);
    expect(answers.map((a) => a.report.title)).to.deep.equal(['a', 'b']);
    expect(progress).to.deep.equal([]);
    w.progress(2, 10);
    w.answer(2, 'b, with its Monte Carlo', { late: true });
    expect(answers.map((a) => a.report.title)).to.deep.equal(['a', 'b', 'b, with its Monte Carlo']);
    expect(progress).to.deep.equal([10]);
    c.dispose();
  });
});
