/**
 * Today on the device's calendar, YYYY-MM-DD: field records and photos are dated by the day
 * where the grower stands, not by UTC.
 */
export function localToday(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}
