/**
 * A simulate cell's schedule as a table: each event's time, repeat interval, number of times
 * (an expression; blank repeats until the end of the run, said in words beside it), action,
 * every target with its amount, and an infusion's duration. Renders and sends edits only: what
 * an edit does to an event is the engine's rule (`src/study/event-rules.ts`).
 */
import { html, nothing } from 'lit';
import {
  EVENT_ACTIONS, eventActionOf, eventTargets, withTargetAt, withoutTargetAt, switchAction, withEventField, fieldReadsStates,
  type EventAction, type ScheduleEvent as EventDoc, type ReportOf,
} from '../../src/index.ts';
import type { ErrorClaims } from './common.ts';
import type { StudyName } from '../expr-field.ts';

type Input = CustomEvent<{ value: string }>;

/** What the table needs from its cell element. */
export interface EventsHost {
  readonly events: readonly EventDoc[];
  readonly report?: ReportOf<'simulate'>;
  readonly claims: ErrorClaims;
  readonly names: StudyName[];
  /** Replaces event i (merge key: edits with one key in a row are one undo step). */
  setEvent(i: number, ev: EventDoc, key?: string): void;
  setEvents(events: EventDoc[]): void;
  /** The state a new event adds to. */
  firstState(): string;
  /** Asks the cell to focus, once drawn, the element the selector finds: what was just added. */
  focus(selector: string): void;
}

const ACTION_LABELS: Record<EventAction, string> = { add: 'add (dose)', set: 'set a parameter', infuse: 'infuse (rate)' };

/** The number of times in words, beside its field: the engine's own words once it has run, else the rule. */
function repeatsWords(ev: EventDoc, engine: string | undefined): string {
  if (engine) return engine.startsWith('once') ? engine : `repeats ${engine}`;
  if (ev.every === undefined) return 'once';
  return ev.count === undefined ? 'repeats until the end of the run' : '';
}

/** A count as the document keeps it: blank removes it, a plain whole number stays a number, anything else is an expression. */
function countOf(text: string): number | string {
  const t = text.trim();
  return /^[1-9]\d{0,5}$/.test(t) ? Number(t) : t;
}

export function eventsTable(h: EventsHost) {
  const { events, claims, names } = h;
  return html`<div class="scroll"><table class="events stack">
    ${events.length ? html`<thead><tr><th>At</th><th>Every</th><th>Number of times</th><th>Action</th><th>On, amount</th><th>For</th><th><span class="sr">Remove</span></th></tr></thead>` : nothing}
    <tbody>${events.map((ev, i) => {
      const kind = eventActionOf(ev);
      const targets = eventTargets(ev);
      const p = `.events[${i}]`;
      const count = ev.count === undefined ? '' : String(ev.count);
      const words = repeatsWords(ev, h.report?.schedule?.[i]?.repeats);
      return html`<tr>
        <td data-label="At"><expr-field data-field="events[${i}].at" label="Event ${i + 1} time" .value=${ev.at ?? ''} .names=${names} .error=${claims.take(`${p}.at`)}
          @expr-input=${(e: Input) => h.setEvent(i, { ...ev, at: e.detail.value }, `at${i}`)}></expr-field></td>
        <td data-label="Every"><expr-field data-field="events[${i}].every" label="Event ${i + 1} repeats every" .value=${ev.every ?? ''} .names=${names} .error=${claims.take(`${p}.every`)}
          @expr-input=${(e: Input) => h.setEvent(i, withEventField(ev, 'every', e.detail.value), `every${i}`)}></expr-field></td>
        <td data-label="Number of times"><expr-field data-field="events[${i}].count" label="Event ${i + 1} number of times (blank: until the end of the run)" .value=${count} .names=${names}
          .error=${claims.take(`${p}.count`)} @expr-input=${(e: Input) => h.setEvent(i, withEventField(ev, 'count', countOf(e.detail.value)), `count${i}`)}></expr-field>
          ${words ? html`<div class="muted repeats">${words}</div>` : nothing}</td>
        <td data-label="Action"><select data-field="events[${i}].${kind}" aria-label="Event ${i + 1} action" @change=${(e: Event) => h.setEvent(i, switchAction(ev, (e.target as HTMLSelectElement).value as EventAction))}>
          ${EVENT_ACTIONS.map((k) => html`<option value=${k} ?selected=${k === kind}>${ACTION_LABELS[k]}</option>`)}</select></td>
        <td data-label="On, amount">${targets.map(([target, amount], t) => html`<div class="target">
          <input class="name" type="text" data-field="events[${i}].${kind}" aria-label="Event ${i + 1} target ${t + 1} name" .value=${target}
            @input=${(e: Event) => { const next = withTargetAt(ev, t, (e.target as HTMLInputElement).value, amount); if (next) h.setEvent(i, next, `target${i}.${t}`); }} />
          <expr-field data-field="events[${i}].${kind}" label="Event ${i + 1} ${t === 0 ? 'amount' : `amount ${t + 1}`}" .value=${amount} .names=${names}
            .readsStates=${fieldReadsStates('simulate', `${p}.${kind}.${target}`)} .error=${claims.take(`${p}.${kind}.${target}`) ?? (t === 0 ? claims.take(`${p}.${kind}`) : undefined)}
            @expr-input=${(e: Input) => { const next = withTargetAt(ev, t, target, e.detail.value); if (next) h.setEvent(i, next, `amount${i}.${t}`); }}></expr-field>
          ${targets.length > 1 ? html`<button class="quiet" aria-label="Remove target ${target || t + 1} of event ${i + 1}" @click=${() => h.setEvent(i, withoutTargetAt(ev, t))}>✕</button>` : nothing}
        </div>`)}
          <button class="quiet small" aria-label="Event ${i + 1}: add another target" @click=${() => { const next = withTargetAt(ev, targets.length, '', ''); if (next) { h.setEvent(i, next); h.focus(`input[aria-label="Event ${i + 1} target ${targets.length + 1} name"]`); } }}>+ target</button></td>
        <td data-label=${kind === 'infuse' || ev.for !== undefined ? 'For' : nothing}>${kind === 'infuse' || ev.for !== undefined ? html`<expr-field data-field="events[${i}].for" label="Event ${i + 1} infusion duration" .value=${ev.for ?? ''} .names=${names} .error=${claims.take(`${p}.for`)}
          @expr-input=${(e: Input) => h.setEvent(i, { ...ev, for: e.detail.value }, `for${i}`)}></expr-field>` : nothing}</td>
        <td class="remove"><button class="quiet" aria-label="Remove event ${i + 1}" @click=${() => h.setEvents(events.filter((_, j) => j !== i))}>✕</button></td>
      </tr>`;
    })}</tbody></table></div>
    <div class="row"><button @click=${() => { h.setEvents([...events, { at: '0 h', add: { [h.firstState()]: '1' } }]); h.focus(`expr-field[data-field="events[${events.length}].at"]`); }}>Add an event</button></div>`;
}
