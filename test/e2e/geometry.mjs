// The page's geometry for narrow.e2e.mjs, measured in the browser: `page.evaluate(pageGeometry)`.
// Self-contained (Playwright sends its source to the page). Walks every shadow root.

/**
 * Returns `{ results, controls, overflow, hiddenResults, overlaps, cutTitles }`: the counts of
 * computed values and controls seen, and lists of problems, each a line naming the element.
 */
export function pageGeometry() {
  const W = document.documentElement.clientWidth;
  const SLACK = 0.5; // sub-pixel rounding of borders
  const all = [];
  const walk = (root) => {
    for (const el of root.querySelectorAll('*')) {
      all.push(el);
      if (el.shadowRoot) walk(el.shadowRoot);
    }
  };
  walk(document);

  // shown: has a box and is painted (not hidden, nor inside a closed <details> or other
  // content the browser skips: checkVisibility)
  const shown = (el) => {
    const r = el.getBoundingClientRect();
    if (r.width === 0 && r.height === 0) return false;
    if (el.checkVisibility && !el.checkVisibility({ contentVisibilityAuto: true, visibilityProperty: true, opacityProperty: true })) return false;
    const s = getComputedStyle(el);
    return s.visibility !== 'hidden' && s.display !== 'none' && Number(s.opacity) !== 0;
  };
  /** The element's parent, across a shadow root's boundary. */
  const up = (el) => el.parentElement ?? el.getRootNode().host ?? null;
  const name = (el) => {
    const label = el.getAttribute('aria-label') ?? el.getAttribute('label') ?? el.closest?.('[label]')?.getAttribute('label');
    const text = (label ?? el.value ?? el.textContent ?? '').trim().replace(/\s+/g, ' ').slice(0, 50);
    let host = el.getRootNode().host;
    while (host && !/-cell$/.test(host.localName)) host = host.getRootNode().host;
    return `<${el.localName}${el.className && typeof el.className === 'string' ? `.${el.className.trim().split(/\s+/).join('.')}` : ''}> "${text}"${host ? ` in ${host.localName}` : ''}`;
  };
  /** Inside a visually-hidden box (the `.sr` pattern: 1 px, clipped), which is meant to be off-screen. */
  const srOnly = (el) => {
    for (let x = el; x; x = up(x)) {
      const s = getComputedStyle(x);
      if (s.clip !== 'auto' && s.position === 'absolute') return true;
    }
    return false;
  };

  const overflow = [];
  if (document.scrollingElement.scrollWidth > W + SLACK) overflow.push(`the page scrolls sideways: ${document.scrollingElement.scrollWidth} px wide in a ${W} px viewport`);
  for (const el of all) {
    if (!shown(el) || srOnly(el)) continue;
    const r = el.getBoundingClientRect();
    if (r.left < -SLACK || r.right > W + SLACK) overflow.push(`${name(el)} spans ${Math.round(r.left)}…${Math.round(r.right)} px`);
  }

  // Nothing scrolls sideways inside a box either (a table wider than its cell, cut at its edge).
  for (const el of all) {
    if (!shown(el) || srOnly(el) || !['auto', 'scroll', 'hidden'].includes(getComputedStyle(el).overflowX)) continue;
    if (el.scrollWidth > el.clientWidth + 1 && !el.closest('.cm-editor')) overflow.push(`${name(el)} holds ${el.scrollWidth} px of content in ${el.clientWidth} px`);
  }

  // A computed value is shown whole: inside the viewport, not cut by its own box (ellipsis)
  // nor by a box around it that hides or scrolls what overflows.
  const hiddenResults = [];
  let results = 0;
  for (const el of all) {
    if (!el.classList.contains('result') || !(el.textContent ?? '').trim()) continue;
    results++;
    if (!shown(el)) { hiddenResults.push(`${name(el)} is not displayed`); continue; }
    const r = el.getBoundingClientRect();
    if (r.left < -SLACK || r.right > W + SLACK) hiddenResults.push(`${name(el)} spans ${Math.round(r.left)}…${Math.round(r.right)} px`);
    if (el.scrollWidth > el.clientWidth + 1) hiddenResults.push(`${name(el)} is cut: ${el.scrollWidth} px of text in ${el.clientWidth} px`);
    for (let x = up(el); x && x !== document.documentElement; x = up(x)) {
      if (getComputedStyle(x).overflowX === 'visible') continue;
      const b = x.getBoundingClientRect();
      if (r.left < b.left - SLACK || r.right > b.right + SLACK) { hiddenResults.push(`${name(el)} is cut by ${name(x)}`); break; }
    }
  }
  // Every parameter shows its computed value.
  for (const el of all) {
    if (el.localName !== 'parameters-cell') continue;
    for (const row of el.shadowRoot.querySelectorAll('.item')) {
      const value = row.querySelector('.result');
      if (!value || !value.textContent.trim()) hiddenResults.push(`parameter ${row.querySelector('input.name')?.value} shows no computed value`);
    }
  }

  // Controls: what a person presses or types in. An expression field counts as one (its editor box).
  const isControl = (el) => {
    if (['button', 'select', 'textarea', 'summary'].includes(el.localName)) return true;
    if (el.localName === 'input') return el.type !== 'hidden';
    if (el.localName === 'a') return el.hasAttribute('href');
    return el.localName === 'div' && el.classList.contains('box') && el.getRootNode().host?.localName === 'expr-field';
  };
  const controls = all.filter((el) => isControl(el) && shown(el) && !srOnly(el));
  const rects = controls.map((el) => el.getBoundingClientRect());
  const overlaps = [];
  for (let i = 0; i < controls.length; i++) {
    for (let j = i + 1; j < controls.length; j++) {
      const a = rects[i];
      const b = rects[j];
      const w = Math.min(a.right, b.right) - Math.max(a.left, b.left);
      const h = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
      if (w > 1 && h > 1) overlaps.push(`${name(controls[i])} and ${name(controls[j])} overlap by ${Math.round(w)} × ${Math.round(h)} px`);
    }
  }

  // Titles wrap rather than being cut.
  const cutTitles = [];
  for (const el of all) {
    const label = el.getAttribute('aria-label') ?? '';
    if (!(label === 'Study title' || label.startsWith('Title of cell')) || !shown(el)) continue;
    if (el.scrollWidth > el.clientWidth + 1 || el.scrollHeight > el.clientHeight + 1) cutTitles.push(`${name(el)}: ${el.scrollWidth} × ${el.scrollHeight} px of text in ${el.clientWidth} × ${el.clientHeight} px`);
  }
  return { results, controls: controls.length, overflow, hiddenResults, overlaps, cutTitles };
}
