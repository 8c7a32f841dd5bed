/**
 * The templates a new study can start from: the study files in examples/, bundled with the
 * app. Title and description come from each file.
 */
import type { Study } from '../src/index.ts';

/** Headings of the library, in order, with the templates under each (by file name). */
export const GROUPS: Readonly<Record<string, readonly string[]>> = {
  'Heating and cooling': ['cooling-stock-pot', 'two-stage-cooling-check', 'heating-constant-power', 'convection-radiation-cooling', 'lumped-capacitance-check', 'cooling-data-fit', 'mixed-units-prep', 'cooling-design', 'cooling-fail-probability'],
  'Drug levels, one compartment': ['iv-bolus-repeated', 'intermittent-iv-infusion', 'oral-first-order-absorption', 'loading-dose-maintenance', 'saturable-elimination-infusion', 'plasma-levels', 'dose-for-target-trough', 'bayesian-two-levels', 'two-level-infusion-dosing', 'trough-in-range-probability'],
  'Mixing, flushing and draining': ['mixing-tank-flush', 'tank-changing-volume', 'lake-first-order-decay', 'tank-draining-orifice', 'flush-design', 'flush-pump-settings'],
  'Growth, decay and motion': ['harvested-stock-fold', 'radiometric-age', 'falling-body-drag'],
};
const OTHER = 'Other';
const GROUP_ORDER = [...Object.keys(GROUPS), OTHER];

const files = import.meta.glob('../examples/*.ratebook.json', { eager: true, import: 'default' }) as Record<string, Study>;

export interface Template {
  readonly key: string;
  /** The trade's heading it is listed under. */
  readonly group: string;
  readonly title: string;
  readonly description: string;
  readonly doc: Study;
}

export const TEMPLATES: readonly Template[] = Object.entries(files)
  .map(([path, doc]) => {
    const key = path.split('/').pop()!.replace('.ratebook.json', '');
    return { key, group: groupOf(key), title: doc.title, description: firstSentence(doc.description ?? ''), doc };
  })
  .sort((a, b) => GROUP_ORDER.indexOf(a.group) - GROUP_ORDER.indexOf(b.group) || a.title.localeCompare(b.title));

function groupOf(key: string): string {
  return Object.entries(GROUPS).find(([, keys]) => keys.includes(key))?.[0] ?? OTHER;
}

function firstSentence(text: string): string {
  const m = /^(.*?[.!?])(\s|$)/.exec(text.replace(/^Demo scenario with invented numbers[.:]?\s*/i, ''));
  const first = m ? m[1] : text;
  return first.charAt(0).toUpperCase() + first.slice(1);
}
