// The club's calendar date: an instant read in the club's IANA time zone (domain/dates.ts). Editions
// take effect at midnight there, so the date must turn over at local midnight, summer time included.
// Offsets are the zones' published rules as the tz database has them (from memory: London GMT/BST,
// Auckland NZDT UTC+13 in January, Chicago CST UTC−6 in winter).
import { describe, expect, it } from 'vitest';
import { calendarDateIn, isTimeZone } from '@backend/domain/dates';

describe('calendarDateIn', () => {
  it.each([
    ['2026-12-31T23:59:59Z', 'Europe/London', '2026-12-31'],
    ['2027-01-01T00:00:00Z', 'Europe/London', '2027-01-01'],
    ['2026-12-31T11:00:00Z', 'Pacific/Auckland', '2027-01-01'],
    ['2026-12-31T10:59:59Z', 'Pacific/Auckland', '2026-12-31'],
    ['2027-01-01T05:59:59Z', 'America/Chicago', '2026-12-31'],
    ['2027-01-01T06:00:00Z', 'America/Chicago', '2027-01-01'],
    // British Summer Time: 23:30 UTC on 30 June is already 1 July in London.
    ['2027-06-30T23:30:00Z', 'Europe/London', '2027-07-01'],
    ['2027-06-30T23:30:00Z', 'UTC', '2027-06-30'],
  ])('%s in %s is %s', (instant, zone, date) => {
    expect(calendarDateIn(new Date(instant), zone)).toBe(date);
  });
});

describe('isTimeZone', () => {
  it.each([
    ['UTC', true],
    ['Europe/London', true],
    ['America/Argentina/Buenos_Aires', true],
    ['Mars/Olympus_Mons', false],
    ['', false],
    ['x'.repeat(65), false],
    [42, false],
  ])('%j → %s', (name, ok) => {
    expect(isTimeZone(name)).toBe(ok);
  });
});
