/** Small helpers shared by the browser tests. */
import { runStudy } from '../../src/index.ts';

/** Polls `get` every 20 ms until it gives a truthy value; fails with `what` after `ms`. */
export async function until<T>(get: () => T | undefined | null | false, what: string, ms = 3000): Promise<T> {
  const end = performance.now() + ms;
  for (;;) {
    const v = get();
    if (v) return v;
    if (performance.now() > end) throw new Error(`gave up waiting: ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** Every element matching `selector` under `root`, looking inside shadow roots too. */
export function deep(root: ParentNode, selector: string): Element[] {
  const out: Element[] = [];
  const walk = (n: ParentNode) => {
    out.push(...n.querySelectorAll(selector));
    for (const el of n.querySelectorAll('*')) if (el.shadowRoot) walk(el.shadowRoot);
  };
  walk(root);
  return out;
}

/** Resolves after the next animation frame has been drawn. */
export const frame = () => new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));

/** Puts `el` in a box `width` pixels wide, of class `boxClass` (for the tests' cleanup), and waits until it has drawn. */
export async function mountInBox<T extends HTMLElement & { updateComplete: Promise<boolean> }>(el: T, width: number, boxClass: string): Promise<T> {
  const box = document.createElement('div');
  box.className = boxClass;
  box.style.width = `${width}px`;
  box.append(el);
  document.body.append(box);
  await el.updateComplete;
  await frame();
  return el;
}

/** The report of cell `id` of `study`, computed in the page; fails when the study or the cell does. */
export function reportedCell(study: unknown, id: string): any {
  const r = runStudy(study);
  if (!r.ok) throw new Error(r.error.message);
  const cell = r.report.cells.find((c) => c.id === id);
  if (!cell?.ok) throw new Error(`cell ${id} failed`);
  return cell;
}
