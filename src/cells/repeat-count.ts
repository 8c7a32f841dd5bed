/**
 * An event's `count` written as an expression (`n_doses`, `round(72 h / tau)`): its value
 * must be a plain whole number, 1 or more. Pure; throws FieldError on the count's path.
 */
import { type Quantity, describe } from '../units/quantity.ts';
import { isDimensionless } from '../units/dimension.ts';
import { fail } from './fields.ts';

/** The most repeats a count may ask for (as the written number's check in study/validate.ts). */
export const MAX_COUNT = 100_000;
/** How far from a whole number a computed count may be and still be that number (`0.3 / 0.1`). */
const WHOLE_SLACK = 1e-9;

/** The whole number a count's value stands for, or a FieldError on `path` saying why it is none. */
export function repeatCount(q: Quantity, path: string): number {
  if (!isDimensionless(q.dim)) fail(path, `the number of times must be a plain number (such as 6), not ${describe(q)}`, 'unit');
  const n = Math.round(q.si);
  if (!Number.isFinite(q.si) || Math.abs(q.si - n) > WHOLE_SLACK * Math.max(1, Math.abs(q.si))) {
    fail(path, `the number of times must be a whole number; it is ${describe(q)} (round(...) rounds it)`);
  }
  if (n < 1 || n > MAX_COUNT) fail(path, `the number of times must be from 1 to ${MAX_COUNT}; it is ${n}`);
  return n;
}
