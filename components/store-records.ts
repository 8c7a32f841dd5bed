/**
 * Checking the records the store reads back: a metadata record or a document can be damaged
 * (written by an older or broken version, edited by hand in the browser's tools). Pure: the
 * store (`study-store.ts`) reads the records and asks these functions what is wrong with them.
 */

/** A study whose stored records are damaged: what is wrong, what could be read, and the raw records. */
export interface DamagedStudy {
  readonly id: string;
  /** What is wrong, in words. */
  readonly problem: string;
  /** The title, when one could be read (from the metadata or the document). */
  readonly title?: string;
  /** The number of cells, when the document has a list of them. */
  readonly cells?: number;
  /** The stored records as they are, as JSON text, for a download. */
  readonly raw: string;
}

/** What is wrong with a metadata record, or undefined when it is sound. */
export function metaProblem(m: unknown, id: unknown): string | undefined {
  if (m === null || typeof m !== 'object' || Array.isArray(m)) return `its metadata record is ${m === null ? 'null' : `not a record (${typeof m})`}`;
  const r = m as Record<string, unknown>;
  if (r.id !== id) return 'its metadata record names another study';
  if (typeof r.title !== 'string') return 'the title in its metadata is not text';
  for (const k of ['created', 'updated', 'revision', 'cells'] as const) {
    if (typeof r[k] !== 'number' || !Number.isFinite(r[k])) return `the ${k === 'cells' ? 'cell count' : k === 'revision' ? 'revision' : `${k} time`} in its metadata is not a number`;
  }
  if (r.deleted !== undefined && typeof r.deleted !== 'number') return 'the trash time in its metadata is not a number';
  return undefined;
}

/** What is wrong with a stored document (its shape only: `readStudy` checked it when stored), or undefined. */
export function docProblem(d: unknown): string | undefined {
  if (d === null || typeof d !== 'object' || Array.isArray(d)) return `its document is ${d === null ? 'null' : `not a study (${typeof d})`}`;
  const r = d as Record<string, unknown>;
  if (r.format !== 'ratebook-study') return 'its document is not a Ratebook study (no "format": "ratebook-study")';
  if (typeof r.title !== 'string') return 'the title in its document is not text';
  if (!Array.isArray(r.cells)) return 'its document has no list of cells';
  return undefined;
}

export function damaged(id: string, problem: string, meta: unknown, doc: unknown): DamagedStudy {
  const pick = (x: unknown, k: string) => (x !== null && typeof x === 'object' ? (x as Record<string, unknown>)[k] : undefined);
  const t = [pick(meta, 'title'), pick(doc, 'title')].find((x): x is string => typeof x === 'string' && x.trim() !== '');
  const cells = pick(doc, 'cells');
  let raw: string;
  try {
    raw = `${JSON.stringify({ id, meta: meta ?? null, doc: doc ?? null }, null, 2)}\n`;
  } catch (err) {
    raw = `${JSON.stringify({ id, problem: `the records could not be written as JSON (${String(err)})`, meta: String(meta), doc: String(doc) }, null, 2)}\n`;
  }
  return { id, problem, raw, ...(t !== undefined ? { title: t.trim() } : {}), ...(Array.isArray(cells) ? { cells: cells.length } : {}) };
}

export function keyId(k: IDBValidKey): unknown {
  return Array.isArray(k) ? k[1] : undefined;
}

