// Typing over a selection in an expression field, under a content security policy that
// refuses style attributes, as the built app's does (csp/policy.ts). Chromium's editing engine,
// replacing a selection that starts in coloured text, would wrap the typed text in a
// `style="color: ..."` span, which the policy refuses and reports; the field inserts the text
// itself instead. The policy is set in this test file's page only (each file has its own page).
import { expect } from 'chai';
import { sendKeys } from '@web/test-runner-commands';
import { completionStatus } from '@codemirror/autocomplete';
import { NAMES, field, record, until, viewOf } from './expr-field-helpers.ts';

const violations: string[] = [];

before(() => {
  const meta = document.createElement('meta');
  meta.httpEquiv = 'Content-Security-Policy';
  meta.content = "style-src-attr 'none'";
  document.head.append(meta);
  document.addEventListener('securitypolicyviolation', (e) => violations.push(`${e.effectiveDirective}: ${e.sample || e.blockedURI}`));
});

afterEach(() => {
  for (const el of document.querySelectorAll('expr-field')) el.remove();
  violations.length = 0;
});

/** Violations are reported a moment after they happen. */
const reported = () => new Promise((r) => setTimeout(r, 100));

describe('typing over a selection', () => {
  for (const before of ['74 degC', '0.35 / h', 'k * (T - Ta)']) {
    it(`replaces all of "${before}" with the typed text, and nothing is refused`, async () => {
      const el = await field({ value: before, names: NAMES });
      const view = viewOf(el);
      const inputs = record(el, 'expr-input');
      view.focus();
      await sendKeys({ press: 'Control+A' });
      await sendKeys({ type: '-2 degC' });
      await reported();
      expect(view.state.doc.toString()).to.equal('-2 degC');
      expect(inputs.at(-1)).to.equal('-2 degC');
      expect(violations).to.deep.equal([]);
      // the field's own undo takes the typing back
      await sendKeys({ press: 'Control+Z' });
      expect(view.state.doc.toString()).to.equal(before);
    });
  }

  it('replaces a selected number by a name, and the completion opens on it', async () => {
    const el = await field({ value: '0.35 * x', names: NAMES });
    const view = viewOf(el);
    view.focus();
    view.dispatch({ selection: { anchor: 0, head: 4 } });
    await sendKeys({ type: 'T' });
    await reported();
    expect(view.state.doc.toString()).to.equal('T * x');
    await until(() => completionStatus(view.state) === 'active', 'the completion list after typing T over 0.35');
    expect(violations).to.deep.equal([]);
  });
});
