/** The one calendar-date module: real days, whole-day arithmetic, ISO weeks and "today". */
import { describe, expect, it } from 'vitest';
import {
  addDays,
  calendarDate,
  daysBetween,
  isCalendarDate,
  latestRecordDate,
  localToday,
  utcDateOf,
  weekStartOf,
} from '../../common/calendar-date';

describe('calendar dates', () => {
  it('accepts real days only, by the Gregorian leap-year rule', () => {
    // Gregorian calendar: a leap year is divisible by 4, except centuries not divisible by 400.
    expect(isCalendarDate('2024-02-29')).toBe(true);
    expect(isCalendarDate('2000-02-29')).toBe(true);
    expect(isCalendarDate('1900-02-29')).toBe(false);
    expect(isCalendarDate('2026-02-29')).toBe(false);
    expect(isCalendarDate('2026-06-31')).toBe(false);
    expect(isCalendarDate('2026-6-1')).toBe(false);
    expect(isCalendarDate('2026-06-01T00:00:00Z')).toBe(false);
    const refused = calendarDate().safeParse('2026-04-31');
    expect(refused.success).toBe(false);
    expect(refused.error?.issues[0]?.message).toBe('Use a date like 2026-07-14.');
  });

  it('counts whole days across month ends and leap days', () => {
    expect(daysBetween('2024-02-28', '2024-03-01')).toBe(2);
    expect(daysBetween('2026-02-28', '2026-03-01')).toBe(1);
    expect(daysBetween('2026-12-31', '2026-01-01')).toBe(-364);
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2024-03-01', -1)).toBe('2024-02-29');
  });

  it('starts a week on the Monday on or before the day (ISO 8601)', () => {
    // ISO 8601: 2026-01-01 is a Thursday, so its week starts on Monday 2025-12-29.
    expect(weekStartOf('2026-01-01')).toBe('2025-12-29');
    expect(weekStartOf('2026-07-13')).toBe('2026-07-13'); // a Monday
    expect(weekStartOf('2026-07-19')).toBe('2026-07-13'); // the Sunday after
    expect(weekStartOf('1969-12-31')).toBe('1969-12-29'); // before day 0 too
    expect(() => weekStartOf('2026-13-01')).toThrow(RangeError);
  });

  it("reads today from the device's calendar, and lets a record run one UTC day ahead", () => {
    // 23:30 on 14 July in the local zone is 14 July here whatever UTC says.
    expect(localToday(new Date(2026, 6, 14, 23, 30))).toBe('2026-07-14');
    expect(localToday(new Date(2026, 0, 1, 0, 5))).toBe('2026-01-01');
    expect(latestRecordDate(new Date(Date.UTC(2026, 6, 14, 23, 30)))).toBe('2026-07-15');
    expect(latestRecordDate(new Date(Date.UTC(2026, 11, 31, 0, 0)))).toBe('2027-01-01');
  });

  it('dates a stored timestamp by its UTC calendar day, whatever offset it was written with', () => {
    // RFC 3339 (ISO 8601) timestamps: 23:30 at UTC−05:00 is 04:30 the next day in UTC.
    expect(utcDateOf('2026-07-14T23:30:00-05:00')).toBe('2026-07-15');
    expect(utcDateOf('2026-07-14T23:30:00.000Z')).toBe('2026-07-14');
    expect(utcDateOf(new Date(Date.UTC(2024, 1, 29, 12)))).toBe('2024-02-29');
  });
});
