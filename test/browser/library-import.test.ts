// Importing a study file from the library: what became of it is said beside the file control
// the user just used, not only at the top of the page (a screen or more above it, with the
// templates between). A file with a duplicate cell id, which the study format refuses naming
// the path (docs/study-format.md, "Document"), and a cut-off file, are refused there
// with the place; a good file says it was imported and links to the new study.
import { expect } from 'chai';
import '../../components/study-library.ts';
import * as store from '../../components/store.ts';
import type { StudyLibrary } from '../../components/study-library.ts';
import { until } from './helpers.ts';

async function mount(): Promise<StudyLibrary> {
  const library = document.createElement('study-library') as StudyLibrary;
  document.body.append(library);
  await until(() => library.shadowRoot?.querySelector('input[type="file"]'), 'the import control');
  return library;
}

/** Chooses a file in the library's import control, as the file picker does. */
function choose(library: StudyLibrary, name: string, text: string): HTMLInputElement {
  const input = library.shadowRoot!.querySelector('input[type="file"]') as HTMLInputElement;
  const files = new DataTransfer();
  files.items.add(new File([text], name, { type: 'application/json' }));
  input.files = files.files;
  input.dispatchEvent(new Event('change'));
  return input;
}

/** The element the control's aria-describedby names, when it is shown. */
const described = (library: StudyLibrary, input: HTMLInputElement) => {
  const id = input.getAttribute('aria-describedby');
  return id ? library.shadowRoot!.getElementById(id) : null;
};

/** The message shown just under the control: within 3 lines below its bottom, not above it. */
function nextToControl(input: HTMLInputElement, message: Element): boolean {
  const a = input.getBoundingClientRect();
  const b = message.getBoundingClientRect();
  return b.top >= a.bottom - 1 && b.top - a.bottom < 60;
}

const duplicateIds = JSON.stringify({
  format: 'ratebook-study', version: 1, title: 'Broken',
  cells: [{ id: 'a', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] }, { id: 'a', kind: 'note', text: '' }],
});

describe('importing a study file in the library', () => {
  afterEach(async () => {
    document.querySelectorAll('study-library').forEach((l) => l.remove());
    for (const s of await store.listStudies()) await store.deleteStudy(s.id);
  });

  it('says beside the control why a file with a duplicate cell id is refused, and keeps the studies', async () => {
    const library = await mount();
    const before = (await store.listStudies()).length;
    const input = choose(library, 'broken.ratebook.json', duplicateIds);
    const message = await until(() => described(library, input), 'a message for the control');
    expect(message.getAttribute('role')).to.equal('alert');
    expect(message.textContent).to.match(/broken\.ratebook\.json was not imported \(at cells\[1\]\.id\).*Your studies are unchanged/);
    expect(nextToControl(input, message), 'the message is right under the control').to.equal(true);
    expect((await store.listStudies()).length).to.equal(before);
  });

  it('says beside the control that a cut-off file is not JSON', async () => {
    const library = await mount();
    const input = choose(library, 'cut.ratebook.json', duplicateIds.slice(0, 40));
    const message = await until(() => described(library, input), 'a message for the control');
    expect(message.textContent).to.match(/cut\.ratebook\.json was not imported: .*not valid JSON/);
    expect(nextToControl(input, message)).to.equal(true);
  });

  it('says beside the control that a good file was imported, with a link to the new study', async () => {
    const library = await mount();
    const good = JSON.stringify({ ...store.blankStudy(), title: 'Walk-in check' });
    const input = choose(library, 'good.ratebook.json', good);
    const message = await until(() => described(library, input)?.textContent?.includes('Imported') && described(library, input), 'the import said');
    expect(message.textContent).to.match(/Imported "Walk-in check" as a new study/);
    const [study] = await store.listStudies();
    expect(message.querySelector('a')?.getAttribute('href')).to.equal(`#/study/${study.id}`);
    expect(nextToControl(input, message)).to.equal(true);
  });
});
