// The engine client against a fake worker: batching while busy, cancelling a long run when
// newer edits wait, and never letting a cancelled run's answer through.
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
  answer(seq: number, title: string) {
    const report = { title, ok: true, warnings: [], cautions: [], cells: [] } as Report;
    this.onmessage?.({ data: { type: 'report', seq, report, rerun: [], changed: [], ms: 1 } } as unknown as MessageEvent<FromWorker>);
  }
}

const study = (title: string): Study => ({ format: 'ratebook-study', version: 1, title, cells: [] });

function client() {
  const workers: FakeWorker[] = [];
  const answers: EngineAnswer[] = [];
  const busy: boolean[] = [];
  const c = new EngineClient({ answer: (a) => answers.push(a), refused: () => {}, busy: (b) => busy.push(b) },
    () => { const w = new FakeWorker(); workers.push(w); return w as unknown as Worker; });
  return { c, workers, answers, busy };
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
});
