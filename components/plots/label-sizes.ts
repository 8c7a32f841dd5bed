/**
 * A chart label's size without laying the page out: its text measured with a canvas 2D
 * context in the label's font, plus its padding and border; its height from its line height.
 * Reading `offsetWidth` instead lays the whole page out at every draw (a slider drag draws the
 * chart at every position). The font, padding and line height of each kind of label are read
 * once per layer from the computed style (a style recalculation at most, never a layout) and
 * kept: the labels' CSS (`chart-styles.ts`) does not change with the page.
 */

/** What sets the size of one kind of label. */
interface LabelFont {
  readonly font: string;
  readonly letterSpacing: string;
  /** Padding and border, left and right together. */
  readonly extraW: number;
  /** The height: the line height plus padding and border, top and bottom. */
  readonly h: number;
}

let context: CanvasRenderingContext2D | null | undefined;
const fonts = new WeakMap<Element, Map<string, LabelFont>>();

const px = (v: string) => Number.parseFloat(v) || 0;

/** The font of labels of class `className` in `layer`, read from `sample`'s computed style (undefined while it has none: not in a document). */
function fontOf(layer: Element, className: string, sample: Element): LabelFont | undefined {
  let byClass = fonts.get(layer);
  if (!byClass) fonts.set(layer, (byClass = new Map()));
  const known = byClass.get(className);
  if (known) return known;
  const cs = getComputedStyle(sample);
  if (!cs.fontSize || !cs.fontFamily) return undefined;
  const font = `${cs.fontStyle} ${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
  const vertical = px(cs.paddingTop) + px(cs.paddingBottom) + px(cs.borderTopWidth) + px(cs.borderBottomWidth);
  let line = px(cs.lineHeight);
  if (!cs.lineHeight.endsWith('px')) {
    // 'normal' (or a bare number on an old engine): the font's own ascent and descent
    const ctx = measurer();
    if (!ctx) return undefined;
    ctx.font = font;
    const m = ctx.measureText('Hg');
    line = cs.lineHeight === 'normal' ? m.fontBoundingBoxAscent + m.fontBoundingBoxDescent : line * px(cs.fontSize);
  }
  const f: LabelFont = {
    font,
    letterSpacing: cs.letterSpacing === 'normal' ? '0px' : cs.letterSpacing,
    extraW: px(cs.paddingLeft) + px(cs.paddingRight) + px(cs.borderLeftWidth) + px(cs.borderRightWidth),
    h: Math.ceil(line + vertical),
  };
  byClass.set(className, f);
  return f;
}

function measurer(): CanvasRenderingContext2D | null {
  if (context === undefined) context = document.createElement('canvas').getContext('2d');
  return context;
}

/**
 * The width and height, in CSS pixels rounded up, of label element `el` (its class and text
 * as set) inside `layer`; read from the layout (`offsetWidth`) only when the canvas or the
 * computed style is unavailable.
 */
export function labelSize(layer: Element, el: HTMLElement): readonly [number, number] {
  const f = fontOf(layer, el.className, el);
  const ctx = f && measurer();
  if (!f || !ctx) return [el.offsetWidth, el.offsetHeight];
  ctx.font = f.font;
  if ('letterSpacing' in ctx) ctx.letterSpacing = f.letterSpacing;
  return [Math.ceil(ctx.measureText(el.textContent ?? '').width + f.extraW), f.h];
}
