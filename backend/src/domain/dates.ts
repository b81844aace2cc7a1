// Calendar dates as the sheet and rulebooks write them: "YYYY-MM-DD", compared as text (which
// orders ISO dates correctly). Pure: "today" is always passed in, never read from a clock here.

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** True for a real calendar date written YYYY-MM-DD (2023-02-30 is not one). */
export function isIsoDate(text: unknown): text is string {
  if (typeof text !== 'string') return false;
  const m = ISO_DATE.exec(text);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (y < 1900 || mo < 1 || mo > 12 || d < 1) return false;
  const days = new Date(Date.UTC(y, mo, 0)).getUTCDate();
  return d <= days;
}

/** The UTC calendar date of an instant, YYYY-MM-DD. */
export function isoDateOf(instant: Date): string {
  return instant.toISOString().slice(0, 10);
}

/** Adds whole days to a YYYY-MM-DD date. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number);
  return isoDateOf(new Date(Date.UTC(y, m - 1, d + days)));
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "1995-01-01" → "1 Jan 1995": unambiguous for readers on either side of the Atlantic. */
export function formatIsoDate(date: string): string {
  if (!isIsoDate(date)) return date;
  const [y, m, d] = date.split('-').map(Number);
  return `${d} ${MONTHS[m - 1]} ${y}`;
}

/**
 * The calendar date of an instant in an IANA time zone ("Europe/London"), YYYY-MM-DD: the club's
 * "today", and the one date every screen, mail and PDF gives for a record's expiry or a check's day.
 * Intl does the zone arithmetic (summer time included); an unknown zone throws RangeError.
 */
export function calendarDateIn(instant: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(instant);
  const part = (type: string) => parts.find((p) => p.type === type)?.value ?? '';
  return `${part('year')}-${part('month')}-${part('day')}`;
}

/** The wall-clock time of an instant in an IANA time zone, "HH:MM" (24-hour). */
export function clockTimeIn(instant: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(instant);
  const part = (type: string) => parts.find((p) => p.type === type)?.value ?? '';
  return `${part('hour')}:${part('minute')}`;
}

/** True for a time zone name Intl knows ("UTC", "Europe/London", "America/Chicago"). */
export function isTimeZone(name: unknown): name is string {
  if (typeof name !== 'string' || name.length === 0 || name.length > 64) return false;
  try {
    new Intl.DateTimeFormat('en-CA', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}
