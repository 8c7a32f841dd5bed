/**
 * Times as loggers write them: clock times (`10:00`, `10:00:30`, `2:05 PM`) and dates with
 * times (`2026-05-01 10:00`, `2026-05-01T10:00:00`, with an optional zone `Z` or `+02:00`),
 * read as seconds, and a column of them turned into time elapsed since its first row.
 */

/** How a time is written; one column holds one of them. */
export type TimeFormat = 'clock' | 'date-time' | 'date-time-zone';

/** A time read from its text: seconds since midnight (clock) or since 1970-01-01 00:00. */
export interface TimeReading {
  readonly format: TimeFormat;
  readonly seconds: number;
  readonly text: string;
}

const DAY = 86400;
/** A clock time earlier than the row before is read as the next day when it is at most this much later. */
const MAX_ROLLOVER_GAP = DAY / 2;

const CLOCK = /^(\d{1,2}):(\d{2})(?::(\d{2}(?:[.,]\d+)?))?(?:\s*([AaPp])\.?[Mm]\.?)?$/;
const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ]\s*(\d{1,2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?)\s*(Z|[+-]\d{2}:?\d{2})?$/;
const OTHER_DATE = /^\d{1,2}[./]\d{1,2}[./]\d{2,4}\b/;

/** Words for a format, for messages. */
export function formatWords(f: TimeFormat): string {
  return f === 'clock' ? 'a clock time' : f === 'date-time' ? 'a date and time' : 'a date and time with a time zone';
}

/**
 * Reads `text` as a time. Undefined when it does not look like one (a number, a word); a
 * problem when it looks like one but is not valid (`25:00`, `2026-02-30 10:00`) or its date is
 * written day and month first (`01/05/2026`), which could be read two ways.
 */
export function readTime(text: string): TimeReading | { problem: string } | undefined {
  const s = text.trim();
  const clock = CLOCK.exec(s);
  if (clock) {
    const seconds = clockSeconds(clock);
    return seconds === undefined ? { problem: `"${s}" is not a clock time (hours 0 to 23, minutes and seconds 0 to 59)` } : { format: 'clock', seconds, text: s };
  }
  const dt = DATE_TIME.exec(s);
  if (dt) {
    const [, y, mo, d, time, zone] = dt;
    const day = Date.UTC(Number(y), Number(mo) - 1, Number(d));
    const check = new Date(day);
    const seconds = clockSeconds(CLOCK.exec(time)!);
    if (check.getUTCMonth() !== Number(mo) - 1 || check.getUTCDate() !== Number(d) || seconds === undefined) return { problem: `"${s}" is not a valid date and time` };
    return { format: zone ? 'date-time-zone' : 'date-time', seconds: day / 1000 + seconds - zoneSeconds(zone), text: s };
  }
  if (OTHER_DATE.test(s)) return { problem: `"${s}": write dates year first (such as 2026-05-01 10:00); day and month first could be read two ways` };
  return undefined;
}

function clockSeconds(m: RegExpExecArray): number | undefined {
  let h = Number(m[1]);
  const min = Number(m[2]);
  const sec = m[3] ? Number(m[3].replace(',', '.')) : 0;
  if (m[4]) {
    if (h < 1 || h > 12) return undefined;
    h = (h % 12) + (m[4].toLowerCase() === 'p' ? 12 : 0);
  }
  if (h > 23 || min > 59 || !(sec < 60)) return undefined;
  return h * 3600 + min * 60 + sec;
}

function zoneSeconds(zone: string | undefined): number {
  if (!zone || zone === 'Z') return 0;
  const sign = zone[0] === '-' ? -1 : 1;
  const digits = zone.slice(1).replace(':', '');
  return sign * (Number(digits.slice(0, 2)) * 3600 + Number(digits.slice(2)) * 60);
}

/**
 * A time column, row by row: each reading as seconds since the first. Clock times that fall
 * back (23:50 then 00:10) are read as the next day when the step forward is at most 12 hours;
 * a larger fall, a date and time earlier than the row before, or a change of format is refused.
 */
export class ElapsedTimes {
  private days = 0;
  private last: TimeReading;

  constructor(readonly first: TimeReading) {
    this.last = first;
  }

  /** Seconds since the first row, with `rolled` when the clock passed midnight; or why not. */
  next(r: TimeReading): { ok: true; seconds: number; rolled: boolean } | { ok: false; message: string } {
    if (r.format !== this.first.format) {
      return { ok: false, message: `"${r.text}" is ${formatWords(r.format)}; the first row's time "${this.first.text}" is ${formatWords(this.first.format)}: give the times in one format` };
    }
    const before = this.last.seconds + (this.first.format === 'clock' ? this.days * DAY : 0);
    let at = r.seconds + (this.first.format === 'clock' ? this.days * DAY : 0);
    let rolled = false;
    if (at < before) {
      if (this.first.format !== 'clock' || at + DAY - before > MAX_ROLLOVER_GAP) {
        return { ok: false, message: `the time "${r.text}" comes before "${this.last.text}" on the row above${this.first.format === 'clock' ? '; if a day passed between them, give dates with the times (such as 2026-05-01 10:00)' : ''}` };
      }
      this.days += 1;
      at += DAY;
      rolled = true;
    }
    this.last = r;
    return { ok: true, seconds: at - this.first.seconds, rolled };
  }
}
