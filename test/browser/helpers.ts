/** Small helpers shared by the browser tests. */

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
