/** Small helpers shared by the engine tests. */
import assert from 'node:assert/strict';
import { parseExpression, evaluateExpression, runStudy, openStudy, type Value, type Report, type CellReport, type StudySession } from '../../src/index.ts';
import type { Quantity } from '../../src/units/quantity.ts';

/** Asserts |actual - expected| <= tol * max(1, |expected|). */
export function near(actual: number, expected: number, tol = 1e-12, what = ''): void {
  const scale = Math.max(Math.abs(expected), Number.MIN_VALUE);
  assert.ok(Math.abs(actual - expected) <= tol * Math.max(scale, tol > 0 ? scale : 1),
    `${what} expected ${expected}, got ${actual} (relative error ${Math.abs(actual - expected) / scale})`);
}

/** Evaluates an expression with the given names; fails the test on any error. */
export function value(text: string, names: Record<string, Quantity> = {}): Value {
  const p = parseExpression(text);
  assert.ok(p.ok, `parse of ${text}: ${p.ok ? '' : p.error.message}`);
  const r = evaluateExpression(p.expr, (n) => names[n]);
  assert.ok(r.ok, `evaluation of ${text}: ${r.ok ? '' : r.error.message}`);
  return r.value;
}

export function quantity(text: string, names: Record<string, Quantity> = {}): Quantity {
  const v = value(text, names);
  assert.equal(typeof v, 'object', `${text} should give a quantity`);
  return v as Quantity;
}

/** The error message of an expression that must fail (in parsing or checking). */
export function failure(text: string, names: Record<string, Quantity> = {}): string {
  const p = parseExpression(text);
  if (!p.ok) return p.error.message;
  const r = evaluateExpression(p.expr, (n) => names[n]);
  assert.ok(!r.ok, `${text} should fail, but gave a value`);
  return r.error.message;
}

/** The report of a study document; fails the test when the document is refused. */
export function reportOf(doc: unknown): Report {
  const r = runStudy(doc);
  assert.ok(r.ok, r.ok ? '' : r.error.message);
  return r.report;
}

/** The report of cell `id`; fails the test when there is none. */
export function cell(report: Report, id: string): CellReport {
  const c = report.cells.find((x) => x.id === id);
  assert.ok(c, `no cell ${id}`);
  return c;
}

/** A session on a study document, deferring its long cells as the app's worker does when `defer`; fails the test when the document is refused. */
export function openSession(doc: unknown, defer: boolean): StudySession {
  const o = openStudy(doc, { defer });
  assert.ok(o.ok, o.ok ? '' : o.error.message);
  return o.session;
}

/** A report as JSON, what the app's worker sends: two reports compared digit for digit. */
export const reportJson = (r: Report): string => JSON.stringify(r);
