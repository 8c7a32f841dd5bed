/**
 * A long study rendered in chunks, so that no one task renders hundreds of cells. A study of
 * at most `LARGE` cells renders at once (every template, and the tests). In a larger one the
 * first `first` cells render at once (a screenful), the rest are added in later tasks, each
 * sized to take about `budgetMs`: the time of a chunk is measured from its start to the next
 * task, so the cells' own elements and fields, which render in microtasks after the view's
 * update, are counted, and the next chunk grows at most twofold. When a new report
 * arrives, cells past the first screenful keep what they were given last (their previous
 * report) until their chunk comes round again. Each cell always gets its current document,
 * so an edit is always made on what the page shows: only results can lag, by a few tasks.
 */
import type { ReactiveControllerHost } from 'lit';

/** Studies with more cells than this are rendered in chunks, their fields' editors made when needed. */
export const LARGE = 40;
/** The most cells one chunk adds, however cheap the last chunk was (notes cost little, runs much). */
const MOST_PER_CHUNK = 16;

export class Progressive<G> {
  private shown: number;
  /** Cells before this index are given the newest results. */
  private fresh = Infinity;
  private readonly given = new Map<string, G>();
  private version: unknown;
  private step = 2;
  private timer: ReturnType<typeof setTimeout> | undefined;

  constructor(private readonly host: ReactiveControllerHost, private readonly first = 6, private readonly budgetMs = 40) {
    this.shown = first;
  }

  /**
   * The cells to render now, each with its index and what it is given: `give(cell)` for those
   * due the newest results (`version` says when they are new), what it got last otherwise.
   * Call once per render; schedules the next chunk while some cells are missing or behind.
   */
  pick<C extends { readonly id: string }>(cells: readonly C[], version: unknown, give: (cell: C) => G): Array<[C, number, G]> {
    if (cells.length <= LARGE) {
      this.shown = this.fresh = Infinity;
      return cells.map((cell, i) => [cell, i, give(cell)]);
    }
    if (version !== this.version) {
      this.version = version;
      this.fresh = Math.min(this.fresh, this.first);
    }
    const n = Math.min(cells.length, this.shown);
    const out: Array<[C, number, G]> = [];
    for (let i = 0; i < n; i++) {
      const cell = cells[i];
      let g = i < this.fresh ? undefined : this.given.get(cell.id);
      if (g === undefined) {
        g = give(cell);
        this.given.set(cell.id, g);
      }
      out.push([cell, i, g]);
    }
    if (n < cells.length || this.fresh < cells.length) this.schedule();
    else this.shown = this.fresh = Infinity;
    return out;
  }

  /** Every cell, with the newest results, from the next render on (a cell added at the end must show at once). */
  showAll(): void {
    this.shown = this.fresh = Infinity;
  }

  /** Stops the chunks (the host left the page). */
  stop(): void {
    clearTimeout(this.timer);
    this.timer = undefined;
  }

  private schedule(): void {
    if (this.timer !== undefined) return;
    this.timer = setTimeout(() => {
      this.timer = undefined;
      const started = performance.now();
      this.shown += this.step;
      this.fresh += this.step;
      const step = this.step;
      this.host.requestUpdate();
      // a message is a task of its own, after every microtask of this one: the whole chunk is measured
      afterThisTask(() => {
        const ms = Math.max(1, performance.now() - started);
        this.step = Math.max(2, Math.min(2 * step, MOST_PER_CHUNK, Math.floor((step * this.budgetMs) / ms)));
      });
    }, 0);
  }
}

/** Calls `then` in the next task (a message to itself: no timer clamping). */
function afterThisTask(then: () => void): void {
  const ch = new MessageChannel();
  ch.port1.onmessage = () => { ch.port1.close(); then(); };
  ch.port2.postMessage(null);
}
