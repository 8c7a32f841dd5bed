// The app shell: the library lists the templates, a template becomes a stored study, and the
// address routes to it.
import { expect } from 'chai';
import '../../components/app.ts';
import * as store from '../../components/store.ts';
import { TEMPLATES, GROUPS } from '../../components/templates.ts';

async function until(check: () => boolean, what: string, ms = 8000) {
  const end = performance.now() + ms;
  while (!check()) {
    if (performance.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe('ratebook-app', () => {
  afterEach(() => { document.querySelectorAll('ratebook-app').forEach((a) => a.remove()); location.hash = ''; });

  it('offers every template and opens a new study made from one', async () => {
    location.hash = '#/';
    const app = document.createElement('ratebook-app');
    document.body.append(app);
    await app.updateComplete;
    // the library appears once the journal of unsaved edits has been replayed
    await until(() => app.shadowRoot!.querySelector('study-library') !== null, 'the library');
    const library = app.shadowRoot!.querySelector('study-library')!;
    await until(() => !!library.shadowRoot?.querySelector('button.template[data-template="cooling-stock-pot"]'), 'the templates');
    const before = (await store.listStudies()).length;
    (library.shadowRoot!.querySelector('button.template[data-template="cooling-stock-pot"]') as HTMLButtonElement).click();
    await until(() => location.hash.startsWith('#/study/'), 'the study route');
    const id = decodeURIComponent(location.hash.slice('#/study/'.length));
    const stored = await store.loadStudy(id);
    expect(stored?.doc.title).to.equal('Cooling a stock pot: bench, then walk-in');
    expect((await store.listStudies()).length).to.equal(before + 1);
    await until(() => !!app.shadowRoot!.querySelector('study-view'), 'the study view');
  });

  it('lists every template under the heading of its trade, and the search narrows the list', async () => {
    expect(TEMPLATES.filter((t) => !Object.values(GROUPS).some((keys) => keys.includes(t.key))).map((t) => t.key), 'templates without a heading').to.deep.equal([]);
    location.hash = '#/';
    const app = document.createElement('ratebook-app');
    document.body.append(app);
    await app.updateComplete;
    // the library appears once the journal of unsaved edits has been replayed
    await until(() => app.shadowRoot!.querySelector('study-library') !== null, 'the library');
    const library = app.shadowRoot!.querySelector('study-library')!;
    await until(() => !!library.shadowRoot?.querySelector('button.template[data-template]'), 'the templates');
    const root = library.shadowRoot!;
    expect([...root.querySelectorAll('h3')].map((h) => h.textContent)).to.deep.equal(Object.keys(GROUPS));
    expect(root.querySelectorAll('button.template[data-template]').length).to.equal(TEMPLATES.length);
    const search = root.querySelector('input.search') as HTMLInputElement;
    search.value = 'orifice';
    search.dispatchEvent(new Event('input'));
    await (library as unknown as { updateComplete: Promise<unknown> }).updateComplete;
    expect([...root.querySelectorAll('button.template[data-template]')].map((b) => b.getAttribute('data-template'))).to.deep.equal(['tank-draining-orifice']);
    search.value = 'nothing like this';
    search.dispatchEvent(new Event('input'));
    await (library as unknown as { updateComplete: Promise<unknown> }).updateComplete;
    expect(root.textContent).to.contain('No template matches');
  });

  it('opens one view of a study when the address changes again while it is opening', async () => {
    // Setting the address just before adding the app queues a `hashchange` that arrives while
    // the study is still opening (common practice in single-page apps: the event is async). A
    // second view made then would leave edits on a page nobody sees.
    const { id } = await store.createStudy({ format: 'ratebook-study', version: 1, title: 'Opened once', cells: [] });
    location.hash = `#/study/${encodeURIComponent(id)}`;
    const app = document.createElement('ratebook-app');
    const views = new Set<Element>();
    const seen = new MutationObserver(() => app.shadowRoot!.querySelectorAll('study-view').forEach((v) => views.add(v)));
    document.body.append(app);
    seen.observe(app.shadowRoot!, { childList: true, subtree: true });
    window.dispatchEvent(new HashChangeEvent('hashchange'));
    window.dispatchEvent(new HashChangeEvent('hashchange'));
    await until(() => views.size > 0, 'the study view');
    const first = [...views][0];
    await new Promise((r) => setTimeout(r, 500));
    seen.disconnect();
    expect(views.size, 'study views made').to.equal(1);
    expect(app.shadowRoot!.querySelector('study-view')).to.equal(first);
  });
});
