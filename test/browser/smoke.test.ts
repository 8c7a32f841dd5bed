// Checks that the browser test setup really runs our dependencies in Chromium.
import { expect } from 'chai';
import fc from 'fast-check';
import { LitElement, html } from 'lit';
import { del, get, set } from 'idb-keyval';
import { evaluate, parse } from 'mathjs';

class SmokeGreeting extends LitElement {
  static override properties = { name: { type: String } };

  // A plain field initializer: with the wrong class-field transform this
  // would shadow Lit's reactive accessor and the update below would not render.
  name = 'world';

  override render() {
    return html`<p>Hello, ${this.name}!</p>`;
  }
}
customElements.define('smoke-greeting', SmokeGreeting);

describe('browser smoke test', () => {
  it('runs in a real browser document', () => {
    expect(navigator.userAgent).to.match(/Chrom(e|ium)/);
    expect(document.body).to.be.instanceOf(HTMLElement);
  });

  it('parses and evaluates unit expressions with mathjs', () => {
    expect(parse('2 h').toString()).to.equal('2 h');
    // In mathjs expressions `min` is the min() function, so minutes are `minute`.
    expect(evaluate('2 h to minute').toString()).to.equal('120 minute');
  });

  it('renders a Lit element and re-renders on a property change', async () => {
    const el = document.createElement('smoke-greeting') as SmokeGreeting;
    document.body.append(el);
    try {
      await el.updateComplete;
      expect(el.shadowRoot?.textContent?.trim()).to.equal('Hello, world!');
      el.name = 'Ratebook';
      await el.updateComplete;
      expect(el.shadowRoot?.textContent?.trim()).to.equal('Hello, Ratebook!');
    } finally {
      el.remove();
    }
  });

  it('stores and reads back a value in IndexedDB through idb-keyval', async () => {
    const key = `smoke-${Date.now()}-${Math.random()}`;
    await set(key, { k: 0.35, unit: '1/h' });
    try {
      expect(await get(key)).to.deep.equal({ k: 0.35, unit: '1/h' });
    } finally {
      await del(key);
    }
    expect(await get(key)).to.equal(undefined);
  });

  it('runs fast-check properties', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1000 }), (minutes) => {
        return evaluate(`${minutes} minute to s`).toNumber('s') === minutes * 60;
      }),
    );
  });
});
