/**
 * Schema migrations. Each entry lifts a document from version n to n + 1; a document is
 * lifted step by step to the current version, so an older study is never refused.
 * Version 1 is the first, so the table is empty; a migration is added here, with a test,
 * whenever the version is raised.
 */
import { CURRENT_VERSION } from './types.ts';

export type Migration = (doc: Record<string, unknown>) => Record<string, unknown>;

export const MIGRATIONS: Readonly<Record<number, Migration>> = Object.freeze({});

/**
 * Lifts doc to `target`, returning the new document and a note per step taken.
 * Throws only when a step is missing from the table, which is a programming error.
 */
export function migrate(
  doc: Record<string, unknown>,
  from: number,
  target: number = CURRENT_VERSION,
  table: Readonly<Record<number, Migration>> = MIGRATIONS,
): { doc: Record<string, unknown>; notes: string[] } {
  const notes: string[] = [];
  let current = doc;
  for (let v = from; v < target; v++) {
    const step = table[v];
    if (!step) throw new Error(`no migration from study version ${v} to ${v + 1}`);
    current = { ...step(current), version: v + 1 };
    notes.push(`migrated from study format version ${v} to ${v + 1}`);
  }
  return { doc: current, notes };
}
