// Tabs learning of each other's saves: the page's own end of the BroadcastChannel
// `ratebook-saves` and a second end opened by the test in the same page stand for two tabs.
// Expected behaviour is the project's own contract for saving (components/save-news.ts,
// components/app.ts): news of a newer revision of the open study is said, and nothing the user
// sees is replaced until they choose.
import { expect } from 'chai';
import '../../components/app.ts';
import * as store from '../../components/store.ts';
import { SAVES_CHANNEL, listen, type SaveNews } from '../../components/save-news.ts';
import type { StudyView } from '../../components/study-view.ts';
import type { Study } from '../../src/index.ts';
import { until } from './helpers.ts';

const study = (title: string): Study => ({ format: 'ratebook-study', version: 1, title, cells: [] });

let other: BroadcastChannel;
beforeEach(() => { other = new BroadcastChannel(SAVES_CHANNEL); });
afterEach(() => {
  other.close();
  document.querySelectorAll('ratebook-app').forEach((a) => a.remove());
  location.hash = '';
});

/** Opens the app on a study and waits for its view. */
async function openApp(id: string) {
  location.hash = `#/study/${encodeURIComponent(id)}`;
  const app = document.createElement('ratebook-app');
  document.body.append(app);
  const view = await until(() => app.shadowRoot!.querySelector('study-view') as StudyView | null, 'the study view', 8000);
  await until(() => view.controller.study !== undefined, 'the open study', 8000);
  return { app, view, root: app.shadowRoot! };
}

describe('save news between tabs', () => {
  it('announces each save of the app store with the study and its new revision, to other ends only', async () => {
    const heard: SaveNews[] = [];
    other.onmessage = (e) => heard.push(e.data as SaveNews);
    const ownEnd: SaveNews[] = [];
    const stop = listen((n) => ownEnd.push(n));
    const { id } = await store.createStudy(study('announced'));
    const saved = await store.saveStudy(id, study('announced, saved'), 1);
    await until(() => heard.length >= 2, 'two announcements');
    expect(heard).to.deep.equal([{ id, revision: 1 }, { id, revision: saved.revision }]);
    expect(saved.revision).to.equal(2);
    expect(ownEnd, 'the page that saved does not hear itself').to.deep.equal([]);
    // what another end says is heard; anything that is not news is ignored
    other.postMessage({ id: 'x', revision: 'many' });
    other.postMessage('hello');
    other.postMessage({ id: 'y', revision: 7 });
    await until(() => ownEnd.length >= 1, 'the news from the other end');
    await new Promise((r) => setTimeout(r, 50));
    stop();
    expect(ownEnd).to.deep.equal([{ id: 'y', revision: 7 }]);
  });

  it('with no unsaved changes: says the study changed elsewhere, keeps what is shown, opens the newer one on request', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root, view } = await openApp(id);
    // another tab saves revision 2 and says so
    await store.saveStudy(id, study('Saved in the other tab'), 1);
    other.postMessage({ id, revision: 2 });
    const box = await until(() => root.querySelector('.elsewhere'), 'the news of the other save');
    expect(box.textContent).to.contain('changed in another tab (revision 2 is stored; this page shows revision 1)');
    expect(view.controller.study?.title, 'nothing replaced without a choice').to.equal('Opened here');
    // news of another study, or of an older revision, says nothing new
    (box.querySelector('button[data-choice="stay"]') as HTMLButtonElement).click();
    other.postMessage({ id: 'another-study', revision: 9 });
    other.postMessage({ id, revision: 1 });
    await new Promise((r) => setTimeout(r, 100));
    expect(root.querySelector('.elsewhere')).to.equal(null);
    other.postMessage({ id, revision: 2 });
    const again = await until(() => root.querySelector('.elsewhere'), 'the news again');
    (again.querySelector('button[data-choice="newer"]') as HTMLButtonElement).click();
    await until(() => (root.querySelector('study-view') as StudyView | null)?.controller.study?.title === 'Saved in the other tab', 'the newer version');
    expect(root.querySelector('.elsewhere')).to.equal(null);
  });

  it('with unsaved changes: offers the two choices at once, and the stale save overwrites nothing', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root, view } = await openApp(id);
    view.controller.edit({ type: 'retitle', title: 'Typed here, not yet saved' });
    expect(view.controller.saveState).to.not.equal('saved');
    await store.saveStudy(id, study('Saved in the other tab'), 1);
    other.postMessage({ id, revision: 2 });
    const box = await until(() => root.querySelector('.conflict:not(.elsewhere)'), 'the two choices');
    // the news usually comes first; on a slow machine this page's own save can run between the
    // other tab's save and its news, and is then refused by the store: the same two choices
    expect(box.textContent).to.match(/saved in another tab \(revision 2\) while this page has changes not yet saved|saved elsewhere \(another tab or window\)/);
    expect(box.textContent).to.contain('Nothing was overwritten.');
    expect(box.querySelector('button[data-choice="newer"]')).to.not.equal(null);
    expect(box.querySelector('button[data-choice="copy"]')).to.not.equal(null);
    expect(view.controller.study?.title).to.equal('Typed here, not yet saved');
    await until(() => view.controller.saveState === 'error', 'the refused save', 8000);
    expect((await store.loadStudy(id))?.doc.title).to.equal('Saved in the other tab');
  });
});

/** Waits until `check` (which reads the store) holds. */
async function untilStored(check: () => Promise<boolean>, what: string, ms = 5000): Promise<void> {
  const end = performance.now() + ms;
  while (!(await check())) {
    if (performance.now() > end) throw new Error(`gave up waiting: ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe('a study moved to the trash or removed in another tab', () => {
  afterEach(() => { for (const k of Object.keys(localStorage)) if (k.startsWith('ratebook-journal:')) localStorage.removeItem(k); });

  it('says so, changes nothing, and restores it from the trash on request', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root, view } = await openApp(id);
    // another tab moves it to the trash and says so (news without a revision)
    await store.deleteStudy(id);
    other.postMessage({ id });
    const box = await until(() => root.querySelector('.gone'), 'the news of the trash');
    expect(box.textContent).to.contain('moved to the trash in another tab');
    expect(box.textContent).to.contain('saves nothing into the trash until you choose');
    expect(view.controller.study?.title, 'nothing replaced').to.equal('Opened here');
    expect((await store.loadStudy(id))?.deleted, 'nothing restored without a choice').to.be.a('number');
    (box.querySelector('button[data-choice="restore"]') as HTMLButtonElement).click();
    await untilStored(async () => (await store.loadStudy(id))?.deleted === undefined, 'the study out of the trash');
    await until(() => root.querySelector('.gone') === null, 'the notice gone');
    expect(root.querySelector('.notice')?.textContent).to.contain('restored from the trash');
    expect((root.querySelector('study-view') as StudyView).controller.study?.title).to.equal('Opened here');
  });

  it('keeps an edit typed meanwhile, saves none of it into the trash, and saves it once restored', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { app, root, view } = await openApp(id);
    await store.deleteStudy(id);
    other.postMessage({ id });
    const box = await until(() => root.querySelector('.gone'), 'the news of the trash');
    view.controller.edit({ type: 'retitle', title: 'Typed after the news' });
    await until(() => view.controller.saveState === 'error', 'the save refused by the store', 8000);
    const binned = await store.loadStudy(id);
    expect(binned?.doc.title, 'nothing saved into the trash').to.equal('Opened here');
    expect(binned?.revision).to.equal(1);
    expect(JSON.parse(localStorage.getItem(`ratebook-journal:${id}`) ?? '{}').doc?.title, 'the edit is in the journal').to.equal('Typed after the news');
    expect(view.controller.study?.title).to.equal('Typed after the news');
    expect(root.querySelector('.save-error'), 'no second, contradicting message').to.equal(null);
    (box.querySelector('button[data-choice="restore"]') as HTMLButtonElement).click();
    await until(() => view.controller.saveState === 'saved', 'the save after restoring', 8000).catch((e) => {
      const a = app as unknown as Record<string, unknown>;
      throw new Error(`${(e as Error).message} (state ${view.controller.saveState}: ${view.controller.saveError}; gone ${String(a.gone)}; problem ${String(a.problem)}; notice ${String(a.notice)}; conflict ${String(a.conflict)})`);
    });
    const now = await store.loadStudy(id);
    expect(now?.deleted).to.equal(undefined);
    expect(now?.doc.title).to.equal('Typed after the news');
    expect(localStorage.getItem(`ratebook-journal:${id}`), 'the journal emptied once stored').to.equal(null);
    await until(() => root.querySelector('.notice')?.textContent?.includes('restored from the trash; editing and saving go on as before. The changes typed meanwhile are saved.'), 'both said');
  });

  it('says so from the refused save alone when the news is missed', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root, view } = await openApp(id);
    await store.deleteStudy(id); // no news: this page's own channel end does not hear itself
    view.controller.edit({ type: 'retitle', title: 'Typed, the news missed' });
    const box = await until(() => root.querySelector('.gone'), 'the refused save said', 8000);
    expect(box.textContent).to.contain('moved to the trash in another tab');
    expect((await store.loadStudy(id))?.doc.title).to.equal('Opened here');
  });

  it('keeps this page\'s version as a new study, leaving the one in the trash as it was', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root, view } = await openApp(id);
    await store.deleteStudy(id);
    other.postMessage({ id });
    const box = await until(() => root.querySelector('.gone'), 'the news of the trash');
    view.controller.edit({ type: 'retitle', title: 'Mine' });
    (box.querySelector('button[data-choice="copy"]') as HTMLButtonElement).click();
    await until(() => location.hash !== `#/study/${encodeURIComponent(id)}` && location.hash.startsWith('#/study/'), 'the new study opened');
    const opened = await until(() => { const v = root.querySelector('study-view') as StudyView | null; return v?.controller.study?.title === 'Mine (copy)' ? v : null; }, 'the copy shown');
    const copyId = opened.controller.id!;
    expect((await store.loadStudy(copyId))?.doc.title).to.equal('Mine (copy)');
    const binned = await store.loadStudy(id);
    expect(binned?.doc.title).to.equal('Opened here');
    expect(binned?.deleted).to.be.a('number');
    expect(root.querySelector('.notice')?.textContent).to.contain('The study in the trash is unchanged.');
    expect(localStorage.getItem(`ratebook-journal:${id}`), 'the old journal entry dropped').to.equal(null);
  });

  it('deleted for good (the trash emptied): offers only the new study, and keeps what was typed', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root, view } = await openApp(id);
    await store.deleteStudy(id);
    await store.purgeTrash(0);
    other.postMessage({ id });
    const box = await until(() => root.querySelector('.gone'), 'the news of the removal');
    expect(box.textContent).to.contain('deleted for good in another tab');
    expect(box.querySelector('button[data-choice="restore"]')).to.equal(null);
    view.controller.edit({ type: 'retitle', title: 'Still here' });
    await until(() => view.controller.saveState === 'error', 'the refused save', 8000);
    expect(await store.loadStudy(id), 'nothing recreated under the old id').to.equal(undefined);
    (box.querySelector('button[data-choice="copy"]') as HTMLButtonElement).click();
    await until(() => (root.querySelector('study-view') as StudyView | null)?.controller.study?.title === 'Still here (copy)', 'the copy shown');
  });

  it('goes back to normal when the other tab restores it first', async () => {
    const { id } = await store.createStudy(study('Opened here'));
    const { root } = await openApp(id);
    await store.deleteStudy(id);
    other.postMessage({ id });
    await until(() => root.querySelector('.gone'), 'the news of the trash');
    const restored = await store.restoreStudy(id);
    other.postMessage({ id, revision: restored.revision });
    await until(() => root.querySelector('.gone') === null, 'the notice gone');
  });
});

describe('the library', () => {
  it('reads its list again when a study is saved in another tab', async () => {
    const { id } = await store.createStudy(study('Listed before'));
    location.hash = '#/';
    const app = document.createElement('ratebook-app');
    document.body.append(app);
    const library = await until(() => app.shadowRoot!.querySelector('study-library'), 'the library', 8000);
    await until(() => library.shadowRoot?.textContent?.includes('Listed before'), 'the first listing', 8000);
    // another tab renames the study (its own store object on the app's database, which says nothing here)
    await store.createStudyStore().renameStudy(id, 'Renamed in the other tab');
    await new Promise((r) => setTimeout(r, 100));
    expect(library.shadowRoot?.textContent, 'no news, no new listing').to.contain('Listed before');
    other.postMessage({ id, revision: 2 });
    await until(() => library.shadowRoot?.textContent?.includes('Renamed in the other tab'), 'the list read again', 8000);
  });
});
