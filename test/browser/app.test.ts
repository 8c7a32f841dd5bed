// The app shell renders an engine report: each cell with its values and its problems.
import { expect } from 'chai';
import '../../components/app.ts';
import type { ReportView } from '../../components/report-view.ts';
import { runStudy } from '../../src/index.ts';

describe('report-view', () => {
  it('shows each cell with its values in the units of the study', async () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 'x', cells: [
      { id: 'p', kind: 'parameters', items: [{ name: 'k', value: '0.35 / h' }] },
    ] });
    const el = document.createElement('report-view') as ReportView;
    el.report = r.ok ? r.report : undefined;
    document.body.append(el);
    await el.updateComplete;
    const cells = [...el.shadowRoot!.querySelectorAll('td')].map((td) => td.textContent!.trim());
    expect(cells).to.deep.equal(['k', '0.35', '1 / h']);
    el.remove();
  });

  it('shows an engine error on its cell with the path', async () => {
    const r = runStudy({ format: 'ratebook-study', version: 1, title: 'x', cells: [
      { id: 'ok', kind: 'parameters', items: [{ name: 'k', value: '1 / h' }] },
      { id: 'bad', kind: 'parameters', items: [{ name: 'x', value: 'kk * 2' }] },
    ] });
    const el = document.createElement('report-view') as ReportView;
    el.report = r.ok ? r.report : undefined;
    document.body.append(el);
    await el.updateComplete;
    const sections = el.shadowRoot!.querySelectorAll('section');
    expect(sections.length).to.equal(2);
    expect(sections[0].classList.contains('failed')).to.equal(false);
    expect(sections[1].classList.contains('failed')).to.equal(true);
    expect(sections[1].querySelector('.error')!.textContent).to.contain('cells[1].items[0].value: unknown name "kk" (did you mean "k"?)');
    el.remove();
  });
});

describe('ratebook-app', () => {
  it('opens an example and shows its report', async () => {
    const app = document.createElement('ratebook-app');
    document.body.append(app);
    await app.updateComplete;
    const select = app.shadowRoot!.querySelector('select')!;
    expect(select.options.length).to.be.greaterThan(1);
    select.selectedIndex = 1;
    select.dispatchEvent(new Event('change'));
    await app.updateComplete;
    const view = app.shadowRoot!.querySelector('report-view')!;
    await view.updateComplete;
    expect(view.shadowRoot!.querySelectorAll('section').length).to.be.greaterThan(0);
    app.remove();
  });
});
