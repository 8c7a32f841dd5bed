/**
 * Parts of the page that an expression field's pop-ups (the completion list, the name's value)
 * must leave clear, so that they stay usable while a list is open: the study's Add bar. A
 * pop-up that would reach a kept-clear part below its field opens above the field instead, or
 * shortens, whichever leaves it more room (CodeMirror's tooltip placement within the room given).
 */
import { tooltips, type EditorView, type Rect } from '@codemirror/view';

const kept = new Set<Element>();

/** Keeps `el` clear of the fields' pop-ups until the returned function is called. */
export function keepClear(el: Element): () => void {
  kept.add(el);
  return () => { kept.delete(el); };
}

/** Space between a pop-up and a kept-clear part, CSS pixels. */
const GAP = 4;

/**
 * The room the field's pop-ups may use: the window, its bottom raised to the top of the first
 * kept-clear part below the field and its top lowered to the bottom of the last one above it.
 * The completion list sits a margin below the text (the field's padding; see theme.ts), which
 * CodeMirror does not count, so that margin is taken off the room below. Cost: one rectangle
 * per kept part.
 */
export function tooltipRoom(view: EditorView): Rect {
  const field = view.dom.getBoundingClientRect();
  const room = { left: 0, top: 0, right: window.innerWidth, bottom: window.innerHeight };
  const margin = parseFloat(getComputedStyle(document.documentElement).fontSize) || 16;
  for (const el of kept) {
    if (!el.isConnected) continue;
    const r = el.getBoundingClientRect();
    if (r.top >= field.bottom - 1) room.bottom = Math.min(room.bottom, r.top - margin - GAP);
    else if (r.bottom <= field.top + 1) room.top = Math.max(room.top, r.bottom + GAP);
  }
  return room;
}

/** The editor extension: tooltips placed within {@link tooltipRoom}. */
export const keepClearOfParts = tooltips({ tooltipSpace: tooltipRoom });
