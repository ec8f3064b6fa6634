/**
 * Dates and date-times in result files. Read:
 * - ISO 8601: 2026-01-05, 2026-01-05 08:30, 2026-01-05T08:30:15;
 * - day first with dots (the dotted form is day-first wherever it is written): 5.1.2026,
 *   05.01.2026 08:30;
 * - with slashes, day or month first: 25/01/2026 can only be day first, 01/25/2026 only month
 *   first; 03/04/2026 is either, and is decided by the file's other slash dates (the same rule as
 *   ambiguous numbers) or is an error naming both readings. A time may follow, with AM/PM.
 * Years have four digits; the day must exist in its month. The result is ISO 8601 without a time
 * zone (the file's own clock), which sorts as text in time order.
 */

export type DateOrder = 'dmy' | 'mdy';

export type DateReading =
  | { readonly kind: 'date'; readonly iso: string; readonly order: DateOrder | null }
  | { readonly kind: 'ambiguous'; readonly dmy: string; readonly mdy: string }
  | { readonly kind: 'none' };

const NONE: DateReading = { kind: 'none' };
const ISO = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ](.+))?$/;
const DOTS = /^(\d{1,2})\.(\d{1,2})\.(\d{4})(?:\s+(.+))?$/;
const SLASHES = /^(\d{1,2})\/(\d{1,2})\/(\d{4})(?:\s+(.+))?$/;
const TIME = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(?:\s*([AaPp])\.?[Mm]\.?)?$/;

function pad(n: number, w = 2): string {
  return String(n).padStart(w, '0');
}

function daysIn(y: number, m: number): number {
  return m === 2 ? (y % 4 === 0 && (y % 100 !== 0 || y % 400 === 0) ? 29 : 28) : [4, 6, 9, 11].includes(m) ? 30 : 31;
}

function day(y: number, m: number, d: number): string | null {
  if (y < 1000 || m < 1 || m > 12 || d < 1 || d > daysIn(y, m)) return null;
  return `${pad(y, 4)}-${pad(m)}-${pad(d)}`;
}

/** "08:30", "8:30:15", "8:30 PM" → "T08:30" style suffix; '' for none; null when not a time. */
function time(t: string | undefined, ampmAllowed: boolean): string | null {
  if (t === undefined) return '';
  const m = TIME.exec(t.trim());
  if (!m) return null;
  let h = Number(m[1]);
  const min = Number(m[2]);
  const s = m[3] === undefined ? null : Number(m[3]);
  if (m[5] !== undefined) {
    if (!ampmAllowed || h < 1 || h > 12) return null;
    const pm = m[5].toLowerCase() === 'p';
    h = (h % 12) + (pm ? 12 : 0);
  }
  if (h > 23 || min > 59 || (s !== null && s > 59)) return null;
  return `T${pad(h)}:${pad(min)}${s === null ? '' : `:${pad(s)}${m[4] ? '.' + m[4] : ''}`}`;
}

/** A date or date-time cell, read without context. */
export function readDateText(text: string): DateReading {
  const t = text.trim();
  let m = ISO.exec(t);
  if (m) {
    const d = day(Number(m[1]), Number(m[2]), Number(m[3]));
    const tm = time(m[4], false);
    return d && tm !== null ? { kind: 'date', iso: d + tm, order: null } : NONE;
  }
  m = DOTS.exec(t);
  if (m) {
    const d = day(Number(m[3]), Number(m[2]), Number(m[1]));
    const tm = time(m[4], false);
    return d && tm !== null ? { kind: 'date', iso: d + tm, order: null } : NONE;
  }
  m = SLASHES.exec(t);
  if (m) {
    const a = Number(m[1]);
    const b = Number(m[2]);
    const y = Number(m[3]);
    const tm = time(m[4], true);
    if (tm === null) return NONE;
    const dmy = day(y, b, a);
    const mdy = day(y, a, b);
    if (dmy && mdy) return dmy === mdy ? { kind: 'date', iso: dmy + tm, order: null } : { kind: 'ambiguous', dmy: dmy + tm, mdy: mdy + tm };
    if (dmy) return { kind: 'date', iso: dmy + tm, order: 'dmy' };
    if (mdy) return { kind: 'date', iso: mdy + tm, order: 'mdy' };
  }
  return NONE;
}

/** The order of the file's slash dates: decided when its unambiguous ones show one order only. */
export function decideDateOrder(dmyCount: number, mdyCount: number): DateOrder | null {
  if (dmyCount > 0 && mdyCount === 0) return 'dmy';
  if (mdyCount > 0 && dmyCount === 0) return 'mdy';
  return null;
}
