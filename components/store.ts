/**
 * Where studies live, for the app: everything the pages ask of storage goes through this
 * module. Its functions are the operations of the app's store (database "ratebook", object
 * store "studies", `study-store.ts`, the one module that touches IndexedDB), each change
 * announced to the other tabs (`save-news.ts`); it also exports the store's contract
 * (`store-contract.ts`), the study file (`study-file.ts`), the autosaver and a series as CSV.
 *
 * Errors: a file that is not a study is a result (`importStudy`); a study that does not exist,
 * a document that the engine refuses, or a storage failure (quota, a browser without
 * IndexedDB) rejects with a {@link StoreError} whose message can be shown to the user.
 */
import type { Study } from '../src/index.ts';
import type { DamagedStudy } from './store-records.ts';
import { announced, type SaveNews } from './save-news.ts';
import { createStudyStore } from './study-store.ts';
import type { ImportResult, StoredStudy, StudyInfo, StudyStore, StudySummary, TrashedStudy } from './store-contract.ts';

export type { DamagedStudy } from './store-records.ts';
export * from './store-contract.ts';
export { createStudyStore } from './study-store.ts';
export { exportStudy, studyFileName } from './study-file.ts';
export { createAutosaver, AutosaveStates, type Autosaver, type AutosaveState } from './autosaver.ts';
export { exportSeriesCsv, type SeriesColumn, type SeriesData } from './series-csv.ts';

let appStore: StudyStore | undefined;
/** The news of a change that gives a revision (see `save-news.ts`: the app's store announces each change it makes). */
const info = (i: StudyInfo): SaveNews => ({ id: i.id, revision: i.revision });
/** The app's store (database "ratebook", object store "studies"), opened on first use. */
function app(): StudyStore {
  return (appStore ??= createStudyStore());
}

/** {@link StudyStore.listStudies} on the app's store. */
export function listStudies(): Promise<StudySummary[]> { return app().listStudies(); }
/** {@link StudyStore.loadStudy} on the app's store. */
export function loadStudy(id: string): Promise<StoredStudy | undefined> { return app().loadStudy(id); }
/** {@link StudyStore.saveStudy} on the app's store. */
export function saveStudy(id: string, doc: Study, expectedRevision?: number): Promise<StudyInfo> { return announced(app().saveStudy(id, doc, expectedRevision), info); }
/** {@link StudyStore.createStudy} on the app's store. */
export function createStudy(doc?: Study): Promise<StudyInfo> { return announced(app().createStudy(doc), info); }
/** {@link StudyStore.renameStudy} on the app's store. */
export function renameStudy(id: string, title: string): Promise<StudyInfo> { return announced(app().renameStudy(id, title), info); }
/** {@link StudyStore.duplicateStudy} on the app's store. */
export function duplicateStudy(id: string): Promise<StudyInfo> { return announced(app().duplicateStudy(id), info); }
/** {@link StudyStore.deleteStudy} on the app's store. */
export function deleteStudy(id: string): Promise<TrashedStudy> { return announced(app().deleteStudy(id), () => ({ id })); }
/** {@link StudyStore.restoreStudy} on the app's store. */
export function restoreStudy(id: string): Promise<StudyInfo> { return announced(app().restoreStudy(id), info); }
/** {@link StudyStore.listTrash} on the app's store. */
export function listTrash(): Promise<TrashedStudy[]> { return app().listTrash(); }
/** {@link StudyStore.purgeTrash} on the app's store. */
export function purgeTrash(olderThanMs: number): Promise<string[]> { return announced(app().purgeTrash(olderThanMs), (ids) => ids.map((id) => ({ id }))); }
/** {@link StudyStore.listDamaged} on the app's store. */
export function listDamaged(): Promise<DamagedStudy[]> { return app().listDamaged(); }
/** {@link StudyStore.removeStudy} on the app's store. */
export function removeStudy(id: string): Promise<void> { return announced(app().removeStudy(id), () => ({ id })); }
/** {@link StudyStore.importStudy} on the app's store. */
export function importStudy(text: string): Promise<ImportResult> { return announced(app().importStudy(text), (r) => (r.ok ? { id: r.id } : undefined)); }
