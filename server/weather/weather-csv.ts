/**
 * Reading a home station's daily CSV: one row per day with a date and any of low, high and
 * rain. Every problem is reported with its line number; the caller writes nothing unless the
 * whole file is clean. Pure.
 */
import { isCalendarDate } from '../../common/calendar-date';
import { parse } from 'csv-parse/sync';
import {
  MAX_DAILY_RAIN_MM,
  TEMPERATURE_RANGE_C,
  type WeatherImportRowError,
} from '../../common/contracts/weather';
import { readDecimalText } from '../../common/decimal';
import { MM_PER_INCH } from '../../common/units';

const columnPatterns = {
  date: /^(date|day|obs(ervation)?[ _-]?date)$/i,
  tmin: /^(t[ _-]?min|min(imum)?([ _-]?temp(erature)?)?|low|temp(erature)?[ _-]?(min|low))(\s*\(.*\))?$/i,
  tmax: /^(t[ _-]?max|max(imum)?([ _-]?temp(erature)?)?|high|temp(erature)?[ _-]?(max|high))(\s*\(.*\))?$/i,
  rain: /^(rain(fall)?|precip(itation)?)([ _-]?(mm|in|total))?(\s*\(.*\))?$/i,
};

export interface ParsedWeatherRow {
  row: number;
  date: string;
  tminC: number | null;
  tmaxC: number | null;
  rainMm: number | null;
}

export interface ParsedWeatherCsv {
  columns: { date: string; tmin: string | null; tmax: string | null; rain: string | null };
  rows: ParsedWeatherRow[];
  errors: WeatherImportRowError[];
}

function isoDate(text: string): string | null {
  const m = /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})$/.exec(text.trim());
  if (!m) return null;
  const iso = `${m[1]}-${m[2]!.padStart(2, '0')}-${m[3]!.padStart(2, '0')}`;
  return isCalendarDate(iso) ? iso : null;
}

export function parseWeatherCsv(
  text: string,
  units: { temperature: 'C' | 'F'; rain: 'mm' | 'in' },
): ParsedWeatherCsv {
  let records: string[][];
  try {
    records = parse(text, {
      bom: true,
      skip_empty_lines: true,
      relax_column_count: true,
      trim: true,
    });
  } catch (err) {
    const msg = err instanceof Error ? err.message.split('\n')[0]! : String(err);
    return {
      columns: { date: '', tmin: null, tmax: null, rain: null },
      rows: [],
      errors: [{ row: 1, column: null, message: `The file could not be read as CSV: ${msg}` }],
    };
  }
  const errors: WeatherImportRowError[] = [];
  const header = records[0] ?? [];
  const find = (p: RegExp) => header.findIndex((h) => p.test(h.trim()));
  const idx = {
    date: find(columnPatterns.date),
    tmin: find(columnPatterns.tmin),
    tmax: find(columnPatterns.tmax),
    rain: find(columnPatterns.rain),
  };
  const columns = {
    date: idx.date >= 0 ? header[idx.date]! : '',
    tmin: idx.tmin >= 0 ? header[idx.tmin]! : null,
    tmax: idx.tmax >= 0 ? header[idx.tmax]! : null,
    rain: idx.rain >= 0 ? header[idx.rain]! : null,
  };
  if (idx.date < 0)
    errors.push({
      row: 1,
      column: null,
      message: 'No date column: name one "date" (values like 2026-06-01).',
    });
  if (idx.tmin < 0 && idx.tmax < 0 && idx.rain < 0)
    errors.push({
      row: 1,
      column: null,
      message: 'No weather columns: name them "tmin", "tmax" and "rain" (any of the three).',
    });
  if (records.length < 2)
    errors.push({ row: 1, column: null, message: 'The file has no data rows under the header.' });
  if (errors.length > 0) return { columns, rows: [], errors };

  const tempToC = (v: number) => (units.temperature === 'F' ? ((v - 32) * 5) / 9 : v);
  const rainToMm = (v: number) => (units.rain === 'in' ? v * MM_PER_INCH : v);
  const tUnit = units.temperature === 'F' ? '°F' : '°C';
  const rows: ParsedWeatherRow[] = [];
  const seen = new Map<string, number>();
  for (let r = 1; r < records.length; r++) {
    const line = r + 1;
    const rec = records[r]!;
    const cell = (i: number) => (i >= 0 ? (rec[i] ?? '').trim() : '');
    const rowErrors: WeatherImportRowError[] = [];
    const date = isoDate(cell(idx.date));
    if (!date)
      rowErrors.push({
        row: line,
        column: columns.date,
        message: `"${cell(idx.date)}" is not a date like 2026-06-01.`,
      });
    else if (seen.has(date))
      rowErrors.push({
        row: line,
        column: columns.date,
        message: `${date} already appears on line ${seen.get(date)}.`,
      });
    else seen.set(date, line);

    const num = (i: number, name: string | null): number | null => {
      const t = cell(i);
      if (t === '' || /^(na|n\/a|-|—)$/i.test(t)) return null;
      const reading = readDecimalText(t);
      if (!reading.ok) {
        rowErrors.push({ row: line, column: name, message: reading.message });
        return null;
      }
      return Number(reading.text);
    };
    const lowRaw = num(idx.tmin, columns.tmin);
    const highRaw = num(idx.tmax, columns.tmax);
    const rainRaw = num(idx.rain, columns.rain);
    const tminC = lowRaw === null ? null : tempToC(lowRaw);
    const tmaxC = highRaw === null ? null : tempToC(highRaw);
    const rainMm = rainRaw === null ? null : rainToMm(rainRaw);
    for (const [v, raw, name] of [
      [tminC, lowRaw, columns.tmin],
      [tmaxC, highRaw, columns.tmax],
    ] as const) {
      if (v !== null && (v < TEMPERATURE_RANGE_C.min || v > TEMPERATURE_RANGE_C.max))
        rowErrors.push({
          row: line,
          column: name,
          message: `${raw} ${tUnit} is outside ${TEMPERATURE_RANGE_C.min}…${TEMPERATURE_RANGE_C.max} °C: check the unit.`,
        });
    }
    if (tminC !== null && tmaxC !== null && tminC > tmaxC)
      rowErrors.push({
        row: line,
        column: columns.tmin,
        message: `The low (${lowRaw}) is above the high (${highRaw}).`,
      });
    if (rainMm !== null && (rainMm < 0 || rainMm > MAX_DAILY_RAIN_MM))
      rowErrors.push({
        row: line,
        column: columns.rain,
        message: `${rainRaw} is not a day's rain (0 to ${MAX_DAILY_RAIN_MM} mm).`,
      });
    if (date && tminC === null && tmaxC === null && rainMm === null && rowErrors.length === 0)
      rowErrors.push({ row: line, column: null, message: 'The row has a date but no values.' });
    if (rowErrors.length > 0) errors.push(...rowErrors);
    else rows.push({ row: line, date: date!, tminC, tmaxC, rainMm });
  }
  return { columns, rows, errors };
}
