/**
 * The one place that creates the mathjs instance. Only the parser and the unit table are
 * taken: Ratebook never evaluates with mathjs, so nothing a study writes can reach mathjs's
 * evaluate, import or createUnit.
 *
 * mathjs builds each part of an instance (a typed function, a node class, the unit class) on
 * its first use, and the first use of `math.Unit` or `math.parse` builds some sixty parts at
 * once: tens of milliseconds of one task on a page. Nothing here uses the instance at load;
 * `prepareMathjs` builds the parts a few at a time, for a page that wants no long task.
 */
import { create, parseDependencies, unitDependencies } from 'mathjs';

const FACTORIES = { parseDependencies, unitDependencies };

// marked pure so that a bundle that never reads `math` leaves mathjs out
export const math = /* @__PURE__ */ create(FACTORIES, { number: 'number' });

/** A mathjs factory: the name of the part it makes on the instance. */
interface Factory { readonly isFactory: true; readonly fn: string }

/**
 * The instance's parts, named in the order mathjs's dependency lists give them (each part
 * after those it is made from, so building them in this order builds one at a time). Only
 * names the instance builds on first use are kept.
 */
const PARTS: readonly string[] = /* @__PURE__ */ (() => {
  const out: string[] = [];
  const walk = (o: object): void => {
    for (const v of Object.values(o)) {
      if (typeof v === 'function' && (v as Partial<Factory>).isFactory) {
        const name = (v as Factory).fn;
        if (!out.includes(name) && Object.getOwnPropertyDescriptor(math, name)?.get) out.push(name);
      } else if (v && typeof v === 'object') walk(v);
    }
  };
  walk(FACTORIES);
  return out;
})();

let built = 0;

/**
 * Builds the parts of the instance that are not built yet, one after another, until
 * `budgetMs` has passed (at least one part per call); true once every part is built, after
 * which the parser and the unit table answer at once. Parts already built by a use are
 * passed over at no cost. Cost: a part takes from well under a millisecond to a few.
 */
export function prepareMathjs(budgetMs: number): boolean {
  const started = performance.now();
  while (built < PARTS.length) {
    void (math as unknown as Record<string, unknown>)[PARTS[built++]];
    if (performance.now() - started >= budgetMs) break;
  }
  return built >= PARTS.length;
}
