/**
 * The pieces every cell check is built from: `Checker` collects one cell's field problems with
 * their full paths and words them the same way everywhere ("is missing", "must be text", ...).
 */
import { ID_PATTERN, NAME_PATTERN } from './types.ts';
import { shortJson } from './limits.ts';
import type { Problem } from './validate.ts';

/** An own field: never one inherited from Object.prototype (a find named "valueOf"). */
export function own(o: Record<string, unknown>, key: string): boolean {
  return Object.prototype.hasOwnProperty.call(o, key) && o[key] !== undefined;
}

export function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Collects field problems of one cell, with full paths. */
export class Checker {
  readonly problems: Problem[] = [];
  constructor(readonly at: string) {}

  add(path: string, message: string): void {
    this.problems.push({ path, message });
  }

  private where(field: string, within?: string): string {
    return within ? `${this.at}.${within}.${field}` : `${this.at}.${field}`;
  }

  object(v: unknown, within: string): v is Record<string, unknown> {
    if (isObject(v)) return true;
    this.add(`${this.at}.${within}`, v === undefined ? 'is missing' : 'must be an object');
    return false;
  }

  list(o: Record<string, unknown>, field: string): boolean {
    if (Array.isArray(o[field])) return true;
    this.add(this.where(field), o[field] === undefined ? 'is missing' : 'must be a list');
    return false;
  }

  text(o: Record<string, unknown>, field: string, within?: string): boolean {
    if (typeof o[field] === 'string') return true;
    this.add(this.where(field, within), o[field] === undefined ? 'is missing' : 'must be text');
    return false;
  }

  optionalText(o: Record<string, unknown>, field: string, within?: string): void {
    if (o[field] !== undefined) this.text(o, field, within);
  }

  /** An optional yes/no field: true or false, nothing else. */
  optionalFlag(o: Record<string, unknown>, field: string, within?: string): void {
    if (o[field] !== undefined && typeof o[field] !== 'boolean') this.add(this.where(field, within), 'must be true or false');
  }

  /** An expression field: its text is checked later, by the parser, on the same path. */
  expr(o: Record<string, unknown>, field: string, within?: string): boolean {
    if (typeof o[field] === 'string') return true;
    const v = o[field];
    this.add(this.where(field, within), v === undefined ? 'is missing'
      : typeof v === 'number' ? `must be an expression written as text, with its unit, such as "${v} h"` : 'must be an expression written as text');
    return false;
  }

  name(o: Record<string, unknown>, field: string, within?: string): boolean {
    if (!this.text(o, field, within)) return false;
    if (NAME_PATTERN.test(o[field] as string)) return true;
    this.add(this.where(field, within), `"${o[field]}" is not a valid name: use letters, digits and "_", starting with a letter`);
    return false;
  }

  id(o: Record<string, unknown>, field: string): void {
    if (this.text(o, field) && !ID_PATTERN.test(o[field] as string)) this.add(this.where(field), `"${o[field]}" is not a cell id`);
  }

  ids(o: Record<string, unknown>, field: string): void {
    const v = o[field];
    if (!Array.isArray(v) || v.length === 0 || v.some((x) => typeof x !== 'string')) {
      this.add(this.where(field), v === undefined ? 'is missing' : 'must be a list of one or more cell ids');
    }
  }

  integer(o: Record<string, unknown>, field: string, within: string, min: number, max: number): void {
    const v = o[field];
    if (!Number.isInteger(v) || (v as number) < min || (v as number) > max) {
      this.add(this.where(field, within), `must be a whole number from ${min} to ${max}`);
    }
  }

  /** A plain number written as a number or as an expression (checked later, by the parser). */
  numberOrExpr(o: Record<string, unknown>, field: string, within: string, optional: boolean): void {
    const v = o[field];
    if (v === undefined && optional) return;
    if (typeof v === 'string') return;
    if (typeof v !== 'number' || !Number.isFinite(v)) this.add(this.where(field, within), v === undefined ? 'is missing' : 'must be a number, or an expression written as text');
  }

  oneOf(o: Record<string, unknown>, field: string, allowed: readonly string[], optional: boolean, within?: string): void {
    const v = o[field];
    if (v === undefined && optional) return;
    if (typeof v !== 'string' || !allowed.includes(v)) {
      this.add(this.where(field, within), `must be one of ${allowed.join(', ')}${v === undefined ? '' : `, not ${shortJson(v)}`}`);
    }
  }
}
