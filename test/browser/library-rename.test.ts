// Renaming a study in the library happens in place: the title becomes a text field (no prompt
// box), Enter keeps the new title, Escape the old one, and it all works from the keyboard.
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import '../../components/study-library.ts';
import * as store from '../../components/store.ts';
import type { StudyLibrary } from '../../components/study-library.ts';
import { until } from './helpers.ts';

async function mountWith(title: string): Promise<{ library: StudyLibrary; id: string }> {
  const doc = { ...store.blankStudy(), title };
  const { id } = await store.createStudy(doc);
  const library = document.createElement('study-library') as StudyLibrary;
  document.body.append(library);
  await until(() => library.shadowRoot?.querySelector(`button[data-rename="${id}"]`), 'the study in the list');
  return { library, id };
}

const renameButton = (library: StudyLibrary, id: string) => library.shadowRoot!.querySelector(`button[data-rename="${id}"]`) as HTMLButtonElement;
const field = (library: StudyLibrary) => library.shadowRoot!.querySelector('input.rename') as HTMLInputElement | null;
/** The title shown for the study (its link), or undefined while it is being renamed. */
const shown = (library: StudyLibrary, id: string) => renameButton(library, id)?.closest('li')?.querySelector('.t a')?.textContent ?? undefined;
const stored = async (id: string) => (await store.loadStudy(id))!.doc.title;

describe('renaming a study in the library', () => {
  const realPrompt = window.prompt;
  beforeEach(() => { window.prompt = () => { throw new Error('the prompt box was used'); }; });
  afterEach(async () => {
    window.prompt = realPrompt;
    document.querySelectorAll('study-library').forEach((l) => l.remove());
    for (const s of await store.listStudies()) await store.deleteStudy(s.id);
  });

  it('turns the title into a field with its text selected; Enter keeps the new title', async () => {
    const { library, id } = await mountWith('Walk-in check');
    renameButton(library, id).click();
    const input = await until(() => field(library), 'the title field');
    await until(() => library.shadowRoot!.activeElement === input, 'focus in the field');
    expect(input.value).to.equal('Walk-in check');
    expect([input.selectionStart, input.selectionEnd], 'the whole title is selected').to.deep.equal([0, 'Walk-in check'.length]);
    await sendKeys({ type: 'Chiller loop' });
    await sendKeys({ press: 'Enter' });
    await until(() => field(library) === null, 'the field closes');
    await until(() => shown(library, id) === 'Chiller loop', 'the list shows the new title');
    expect(await stored(id)).to.equal('Chiller loop');
    expect(library.shadowRoot!.activeElement, 'focus back on the Rename button').to.equal(renameButton(library, id));
  });

  it('Escape keeps the old title and stores nothing', async () => {
    const { library, id } = await mountWith('Tank flush');
    const before = (await store.loadStudy(id))!.revision;
    renameButton(library, id).click();
    await until(() => field(library) && library.shadowRoot!.activeElement === field(library), 'focus in the title field');
    await sendKeys({ type: 'Something else' });
    await sendKeys({ press: 'Escape' });
    await until(() => field(library) === null, 'the field closes');
    expect(shown(library, id)).to.equal('Tank flush');
    expect(await stored(id)).to.equal('Tank flush');
    expect((await store.loadStudy(id))!.revision, 'no new revision').to.equal(before);
  });

  it('is reached from the keyboard: Tab to Rename, Enter opens the field, Enter keeps the title', async () => {
    const { library, id } = await mountWith('Dose check');
    const link = renameButton(library, id).closest('li')!.querySelector('.t a') as HTMLAnchorElement;
    link.focus();
    await sendKeys({ press: 'Tab' });
    expect(library.shadowRoot!.activeElement, 'Tab after the title reaches Rename').to.equal(renameButton(library, id));
    await sendKeys({ press: 'Enter' });
    await until(() => field(library) && library.shadowRoot!.activeElement === field(library), 'focus in the title field');
    await sendKeys({ type: 'Dose check, adult' });
    await sendKeys({ press: 'Enter' });
    await until(() => shown(library, id) === 'Dose check, adult', 'the new title');
    expect(await stored(id)).to.equal('Dose check, adult');
  });

  it('leaving the field keeps what was typed', async () => {
    const { library, id } = await mountWith('Lake');
    renameButton(library, id).click();
    const input = await until(() => field(library), 'the title field');
    await until(() => library.shadowRoot!.activeElement === input, 'focus in the field');
    await sendKeys({ type: 'Lake, summer' });
    input.blur();
    await until(() => shown(library, id) === 'Lake, summer', 'the new title');
    expect(await stored(id)).to.equal('Lake, summer');
  });
});
