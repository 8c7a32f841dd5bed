/**
 * A spread on a computed value (`k = CL / V` given a spread of its own, or a fit's estimate)
 * stands for all of that value's uncertainty: wherever the uncertainty cell draws it, the
 * value is replaced by its draw, so the spreads upstream of it (CL's, V's) do not reach
 * anything through it. Those upstream spreads are drawn only where they reach the cell's
 * names another way; one that reaches them only through such a value is not drawn at all.
 * This file finds which inputs reach the names under that rule and says what it hid.
 */
import type { RunContext } from '../engine/node.ts';
import type { Input } from './uncertainty-inputs.ts';

/** The inputs kept (in their order) and a warning per computed value that hides a spread upstream of it. */
export interface ShadowedInputs {
  readonly inputs: Input[];
  readonly warnings: string[];
}

const listed = (names: readonly string[]): string => (names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`);
const possessive = (names: readonly string[]): string => listed(names.map((n) => `${n}'s`));

/**
 * Keeps the inputs among `found` that can change a name in `of` with every other input
 * downstream of them held at its draw: a name in `of` itself, or one whose what-if (it, with
 * those downstream inputs replaced too) plans more nodes than the downstream inputs alone.
 * Cost: up to two what-if preparations per input.
 */
export function shadowedInputs(found: readonly Input[], of: readonly string[], ctx: Pick<RunContext, 'upstream' | 'whatIf'>): ShadowedInputs {
  const above = new Map(found.map((x) => [x.name, ctx.upstream(x.name)] as const));
  // the inputs downstream of x: those with x upstream of them
  const below = (x: Input) => found.filter((s) => s !== x && above.get(s.name)!.has(x.name)).map((s) => s.name);
  const plan = (replaced: readonly string[]): number | undefined => {
    const w = ctx.whatIf!(of, replaced);
    return w.ok ? w.plan.length : undefined;
  };
  const hidden = new Map<string, { dropped: string[]; kept: string[] }>();
  const inputs = found.filter((x) => {
    if (of.includes(x.name)) return true;
    const cut = below(x);
    const alone = plan([x.name]);
    if (!alone) return false;
    if (cut.length === 0) return true;
    const base = plan(cut) ?? 0;
    const reaches = (plan([x.name, ...cut]) ?? 0) > base;
    for (const s of cut) {
      const h = hidden.get(s) ?? { dropped: [], kept: [] };
      (reaches ? h.kept : h.dropped).push(x.name);
      hidden.set(s, h);
    }
    return reaches;
  });
  const warnings = [...hidden].map(([s, h]) => {
    const all = [...h.dropped, ...h.kept];
    const item = found.find((x) => x.name === s)!;
    const what = item.cell ? `${s} is an estimate of fit "${item.cell}" and is drawn from its standard error` : `${s} has a spread of its own`;
    const fix = item.cell ? '' : ` To carry ${possessive(all)} spread${all.length === 1 ? '' : 's'} through ${s} instead, remove ${s}'s spread.`;
    const others = of.filter((n) => n !== s);
    const their = h.dropped.length === 1 ? 'its spread is' : 'their spreads are';
    const dropped = !h.dropped.length ? ''
      : others.length ? ` ${listed(h.dropped)} reach${h.dropped.length === 1 ? 'es' : ''} ${listed(others)} only through ${s}, so ${their} not drawn at all.`
      : ` ${listed(h.dropped)}: ${their} not drawn at all.`;
    const kept = h.kept.length ? ` ${listed(h.kept)} ${h.kept.length === 1 ? 'is' : 'are'} still drawn where read other than through ${s}.` : '';
    return `${what}, which stands for all of its uncertainty: the spread${all.length === 1 ? '' : 's'} of ${listed(all)} upstream of it ${all.length === 1 ? 'is' : 'are'} not carried through ${s}.${dropped}${kept}${fix}`;
  });
  return { inputs, warnings };
}
