/**
 * Owns the uPlot charts of a plot element: makes each one once its container is in the
 * document, gives it new data with `setData` (uPlot batches the redraw into one per frame),
 * follows its container's width through a ResizeObserver, widens it to the printed width
 * around printing, and destroys it when the element leaves the document. A chart is made
 * again only when its key changes (other series or axes), never on a plain data update.
 * In a large study (`expr-editor/deferred.ts`) the charts are made once their element comes
 * near the viewport, as the expression editors are.
 */
import uPlot from 'uplot';
import type { ReactiveController, ReactiveControllerHost } from 'lit';
import { shouldWait, stopWatching, wakeWhenNear } from '../expr-editor/deferred.ts';

/** What one chart is, as the host describes it after each render. */
export interface ChartSpec {
  /** The element the chart lives in; rendered by the host. */
  readonly target: HTMLElement;
  /** Same key, same options: only the data change. A new key makes the chart again. */
  readonly key: string;
  /** Height of the plotting area with its axes, CSS pixels. */
  readonly height: number;
  /** Built only when the chart is made. Hooks should read the host's current data. */
  readonly options: () => Omit<uPlot.Options, 'width' | 'height'>;
  readonly data: uPlot.AlignedData;
  /** Put on the chart's canvas as its accessible name (role img). */
  readonly label: string;
}

/**
 * Width of a chart on paper, CSS pixels: 640 px is 169 mm at 96 px per inch, inside the
 * printable width of A4 and US Letter with the browser's default margins.
 */
export const PRINT_WIDTH = 640;
/** Width used while a container has no layout yet (hidden, or not measured). */
const FALLBACK_WIDTH = 600;

interface Live { readonly key: string; readonly target: HTMLElement; readonly height: number; readonly u: uPlot; data: uPlot.AlignedData }

export class ChartController implements ReactiveController {
  private live: Live[] = [];
  private printing = false;
  private observer?: ResizeObserver;
  /** The element whose coming near the viewport the charts wait for, in a large study. */
  private waitingOn?: HTMLElement;
  private near = false;

  /**
   * @param host the plot element
   * @param specs the charts it wants, read after every update (in a fixed order)
   */
  constructor(private readonly host: ReactiveControllerHost, private readonly specs: () => ChartSpec[]) {
    host.addController(this);
  }

  /** The charts as they are now, in the order of the specs. */
  get charts(): readonly uPlot[] {
    return this.live.map((c) => c.u);
  }

  hostConnected(): void {
    addEventListener('beforeprint', this.beforePrint);
    addEventListener('afterprint', this.afterPrint);
    this.observer = new ResizeObserver((entries) => this.resized(entries));
    // Coming back into a document: the charts were destroyed on the way out.
    if (!this.live.length) this.host.requestUpdate();
  }

  hostUpdated(): void {
    const specs = this.specs();
    if (!this.live.length && specs.length && !this.printing && !this.near && shouldWait()) {
      const target = specs[0].target;
      if (this.waitingOn !== target) {
        if (this.waitingOn) stopWatching(this.waitingOn);
        this.waitingOn = target;
        wakeWhenNear(target, () => {
          this.near = true;
          this.waitingOn = undefined;
          this.hostUpdated();
        });
      }
      return;
    }
    this.live.slice(specs.length).forEach((c) => this.drop(c));
    this.live.length = Math.min(this.live.length, specs.length);
    specs.forEach((spec, i) => {
      const old = this.live[i];
      if (old && old.key === spec.key && old.target === spec.target) {
        // New data: set them. Same data: something the hooks or axes read may have changed
        // (a label, the time unit), so redraw from the cached paths.
        if (old.data !== spec.data) old.u.setData(spec.data);
        else old.u.redraw(false, true);
        old.data = spec.data;
        labelCanvas(old.u, spec.label);
        return;
      }
      if (old) this.drop(old);
      this.live[i] = this.make(spec);
    });
  }

  hostDisconnected(): void {
    removeEventListener('beforeprint', this.beforePrint);
    removeEventListener('afterprint', this.afterPrint);
    this.live.forEach((c) => this.drop(c));
    this.live = [];
    this.observer?.disconnect();
    this.observer = undefined;
    if (this.waitingOn) stopWatching(this.waitingOn);
    this.waitingOn = undefined;
  }

  private make(spec: ChartSpec): Live {
    const width = this.printing ? PRINT_WIDTH : widthOf(spec.target);
    const u = new uPlot({ ...spec.options(), width, height: spec.height }, spec.data, spec.target);
    labelCanvas(u, spec.label);
    this.observer?.observe(spec.target);
    return { key: spec.key, target: spec.target, height: spec.height, u, data: spec.data };
  }

  private drop(c: Live): void {
    this.observer?.unobserve(c.target);
    c.u.destroy();
  }

  private resized(entries: ResizeObserverEntry[]): void {
    if (this.printing) return;
    for (const e of entries) {
      const c = this.live.find((l) => l.target === e.target);
      const width = widthOf(e.target as HTMLElement);
      if (c && Math.round(c.u.width) !== width) c.u.setSize({ width, height: c.height });
    }
  }

  private readonly beforePrint = (): void => {
    this.printing = true;
    // batch: draw now, before the page is laid out for paper, not in a later microtask.
    for (const c of this.live) c.u.batch(() => c.u.setSize({ width: PRINT_WIDTH, height: c.height }));
  };

  private readonly afterPrint = (): void => {
    this.printing = false;
    for (const c of this.live) c.u.setSize({ width: widthOf(c.target), height: c.height });
  };
}

function widthOf(el: HTMLElement): number {
  return Math.floor(el.clientWidth) || FALLBACK_WIDTH;
}

/** The chart's canvas is an image whose name is the plot's summary. */
function labelCanvas(u: uPlot, label: string): void {
  const canvas = u.root.querySelector('canvas');
  if (!canvas) return;
  canvas.setAttribute('role', 'img');
  canvas.setAttribute('aria-label', label);
}
