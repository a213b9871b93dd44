/**
 * Calendar dates, the one way: YYYY-MM-DD text checked by zod's ISO date (a real day of a real
 * month, leap years included) and counted as whole days with no time of day and no time zone.
 *
 * "Today" is decided once: a field record, a photo or a weather reading is dated by the
 * device's own calendar (`localToday`), the day where the grower stands, and forms say so where
 * they fill it in. The server, which may sit in another time zone, accepts up to one day ahead of
 * its UTC date (`latestRecordDate`) and never picks a day itself when the device told it one.
 */
import { z } from 'zod';

export const DATE_HINT = 'Use a date like 2026-07-14.';

/** A calendar date field (zod 4's `z.iso.date()`), with the form's message. */
export const calendarDate = (message: string = DATE_HINT) => z.iso.date({ message });

/** The same test as `calendarDate()` (zod's own pattern), without building a parse result. */
export const isCalendarDate = (text: string): boolean => z.regexes.date.test(text);

const MS_PER_DAY = 86_400_000;

/** Day number (days since 1970-01-01) of a YYYY-MM-DD date; throws on anything else. */
export function dayNumber(date: string): number {
  if (!isCalendarDate(date)) throw new RangeError(`"${date}" is not a YYYY-MM-DD calendar date`);
  return Date.parse(`${date}T00:00:00Z`) / MS_PER_DAY;
}

export const dateOfDayNumber = (day: number): string =>
  new Date(day * MS_PER_DAY).toISOString().slice(0, 10);

/** Whole days from `from` to `to` (positive when `to` is later). */
export const daysBetween = (from: string, to: string): number => dayNumber(to) - dayNumber(from);

export const addDays = (date: string, days: number): string =>
  dateOfDayNumber(dayNumber(date) + days);

/** The Monday on or before a date (ISO 8601 weeks start on Monday). */
export function weekStartOf(date: string): string {
  const day = dayNumber(date);
  // 1970-01-01 was a Thursday: (day + 3) mod 7 counts from Monday.
  return dateOfDayNumber(day - ((((day + 3) % 7) + 7) % 7));
}

/**
 * YYYY-MM-DD of an instant as the calendar reads in UTC; takes a Date or a stored timestamp
 * (ISO 8601 text such as a sheet's `publishedAt`).
 */
export const utcDateOf = (instant: Date | string): string =>
  (typeof instant === 'string' ? new Date(instant) : instant).toISOString().slice(0, 10);

/** Today on this device's calendar (local time zone). */
export function localToday(now: Date = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

/**
 * The latest calendar day a record may carry: tomorrow in UTC, because a phone in the field
 * may be a time zone ahead of the server. Anything later is a typing slip.
 */
export const latestRecordDate = (now: Date = new Date()): string =>
  dateOfDayNumber(Math.floor(now.getTime() / MS_PER_DAY) + 1);
