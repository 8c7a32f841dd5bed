/** A study as a file to download, and the file's name. Pure; touches no storage. */
import type { Study } from '../src/index.ts';
import type { StudyFile } from './store-contract.ts';

/**
 * A study as a downloadable file: indented JSON of the document (what `importStudy` reads
 * back) and a file name made from its title. Pure; touches no storage.
 */
export function exportStudy(doc: Study): StudyFile {
  const text = `${JSON.stringify(doc, null, 2)}\n`;
  return { blob: new Blob([text], { type: 'application/json' }), fileName: studyFileName(doc.title) };
}

/**
 * `<slug>.ratebook.json`: the title in lower-case ASCII letters and digits joined by "-"
 * (accents dropped, at most 60 characters), or `study.ratebook.json` when nothing is left.
 */
export function studyFileName(title: string | undefined): string {
  const slug = (title ?? '')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+/, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return `${slug || 'study'}.ratebook.json`;
}
