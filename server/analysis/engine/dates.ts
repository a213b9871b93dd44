/** Calendar dates as YYYY-MM-DD text, handled as whole days in UTC (no time zones). */
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;

/** Day number (days since 1970-01-01) of a YYYY-MM-DD date; throws on an invalid date. */
export function dayNumber(date: string): number {
  const m = ISO_DATE.exec(date);
  if (!m) throw new RangeError(`"${date}" is not a YYYY-MM-DD date`);
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const t = Date.UTC(y, mo - 1, d);
  const back = new Date(t);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) {
    throw new RangeError(`"${date}" is not a calendar date`);
  }
  return t / MS_PER_DAY;
}

export function dateOfDayNumber(day: number): string {
  return new Date(day * MS_PER_DAY).toISOString().slice(0, 10);
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: string, to: string): number {
  return dayNumber(to) - dayNumber(from);
}
