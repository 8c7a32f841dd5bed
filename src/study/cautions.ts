/**
 * Cautions a study must carry, decided from what it models: doses (a schedule that adds to or
 * infuses into a state, a non-compartmental analysis, a fit of a drug's levels, or a name
 * about dosing), and
 * temperature limits (a temperature state checked against a level): the food code's when the
 * study speaks of food, the applicable rules' otherwise. The wording
 * defers to licensed practice and local codes; it never gives advice of its own.
 */
import type { Cell } from './types.ts';

export interface Caution {
  readonly kind: 'dosing' | 'temperature-limits' | 'temperature-practice';
  readonly text: string;
}

export const DOSING_CAUTION = 'This study models doses. It is an analysis aid, not a dosing instruction: every dose must be chosen and checked by a licensed professional against local protocols and the product information.';
export const TEMPERATURE_CAUTION = 'Limits for cooling and holding food differ between codes and places: check each limit against the food code that applies where you work.';

export const PRACTICE_CAUTION = 'Temperature limits and handling rules come from codes, standards and the makers of the equipment, and differ between places: check each limit against the rules that apply to your work.';

/** Words that say a temperature study is about food. */
const FOOD_WORDS = /\b(food|cook|cooked|chill|chiller|walk-in|refrigerat|fridge|freezer|rice|stock pot|soup|stew|chili|sauce|meat|poultry|kitchen|hot[- ]holding|cold[- ]holding)/i;
const DOSING_WORDS = /dose|dosing|bolus|infus|regimen|mg\s*\/\s*kg/i;
const TEMPERATURE_UNITS = /\b(degC|degF|K|degR)\b/;
/** A concentration by mass or amount per volume, as drug levels are measured (mg/L, ug/mL, umol/L). */
const LEVEL_UNITS = /\b(g|mg|ug|mcg|µg|ng|mol|mmol|umol|nmol)\s*\/\s*(L|dL|mL|uL)\b/;
const DRUG_WORDS = /\b(drug|plasma|serum|patient|trough|antibiotic|medicine|medication)s?\b/i;

/** What a cell's text speaks of, as the cautions read it: dosing, food, drugs. */
export interface CellWords {
  readonly dosing: boolean;
  readonly food: boolean;
  readonly drug: boolean;
}

/**
 * The words of one cell, from its JSON. The study's words are those of its cells: the study's
 * text (its cells' JSON, one after the other with a comma between) holds a match of these
 * words only within a cell's own text, as none of them can take in the `},{` between two.
 */
export function cellWords(cell: Cell): CellWords {
  const text = JSON.stringify(cell);
  return { dosing: DOSING_WORDS.test(text), food: FOOD_WORDS.test(text), drug: DRUG_WORDS.test(text) };
}

/**
 * A fit of a drug's levels: a fit observing a state measured as a concentration by mass or
 * amount per volume, that is Bayesian (an individual estimate from population priors) or
 * sits in a study that speaks of drugs, plasma, serum or patients.
 */
function fitsDrugLevels(cells: readonly Cell[], words: readonly CellWords[]): boolean {
  const levelStates = new Set(cells.filter((c) => c.kind === 'rate' && typeof c.unit === 'string' && LEVEL_UNITS.test(c.unit)).map((c) => (c as { state: string }).state));
  return cells.some((c) => c.kind === 'fit' && c.observe !== null && typeof c.observe === 'object'
    && Object.keys(c.observe).some((s) => levelStates.has(s))
    && ((Array.isArray(c.estimate) && c.estimate.some((e) => e?.prior !== undefined)) || words.some((w) => w.drug)));
}

/**
 * The cautions of a study. `wordsOf` gives a cell's words (`cellWords`); the session passes
 * one that keeps them for each cell object it holds, so that a study's text is not written
 * and searched again at every edit (a 10,000-row table took a third of an edit's time).
 */
export function cautionsFor(cells: readonly Cell[], wordsOf: (cell: Cell) => CellWords = cellWords): Caution[] {
  const out: Caution[] = [];
  const words = cells.map(wordsOf);
  const dosing = cells.some((c) => c.kind === 'nca'
    || (c.kind === 'simulate' && Array.isArray(c.events) && c.events.some((e) => e && (e.add !== undefined || e.infuse !== undefined))))
    || words.some((w) => w.dosing) || fitsDrugLevels(cells, words);
  if (dosing) out.push({ kind: 'dosing', text: DOSING_CAUTION });
  const temperatureStates = new Set(cells.filter((c) => c.kind === 'rate' && typeof c.unit === 'string' && TEMPERATURE_UNITS.test(c.unit)).map((c) => (c as { state: string }).state));
  const checked = cells.some((c) => c.kind === 'simulate' && Array.isArray(c.find)
    && c.find.some((f) => f && typeof f.level === 'string' && [f.crossing, f.timeAbove, f.timeBelow].some((s) => typeof s === 'string' && temperatureStates.has(s))));
  // food temperatures get the food-code caution whether or not a limit is checked (a fitted
  // cooling curve predicts times to limits); other temperature checks (parts, tanks) a general one
  if (temperatureStates.size > 0 && words.some((w) => w.food)) out.push({ kind: 'temperature-limits', text: TEMPERATURE_CAUTION });
  else if (checked) out.push({ kind: 'temperature-practice', text: PRACTICE_CAUTION });
  return out;
}
