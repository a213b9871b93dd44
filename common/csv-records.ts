/**
 * CSV files of harvests and observations: the columns, and row-by-row checking against the
 * trial's plots and traits. Pure: the caller parses the file into rows of text and supplies
 * the lookups. Row numbers count the header as row 1, as a spreadsheet shows them.
 */
import { DATE_HINT, isCalendarDate, latestRecordDate } from './calendar-date';
import { treatmentColumn } from './csv';
import { observationValueProblem, storedUnitOf, type ImportRowError } from './contracts/records';
import { readDecimal } from './decimal';
import {
  readSheetColumn,
  type SheetColumn,
  type SheetTrait,
  sheetLeadColumns,
  sheetNoteColumn,
} from './recording-sheet';
import { type QuantityUnit, toStored } from './units';

export const harvestCsvColumns = [
  'record_id',
  'site',
  'plot_number',
  'entry_code',
  'harvested_on',
  'fruit_count',
  'mass_g',
  'grade',
  'note',
] as const;

export const observationCsvColumns = [
  'record_id',
  'site',
  'plot_number',
  'entry_code',
  'trait_key',
  'observed_on',
  'plant_number',
  'value',
  'unit',
  'value_date',
  'note',
] as const;

/**
 * An export's header: a two-factor trial's rows carry their plot's level of the treatment
 * after the entry code, under the treatment's name (the import reads the same header and
 * leaves that column alone: the plot number already says where the record was taken).
 */
export function recordCsvHeader(
  columns: readonly string[],
  factorName: string | null | undefined,
): string[] {
  if (!factorName) return [...columns];
  const at = columns.indexOf('entry_code') + 1;
  return [...columns.slice(0, at), treatmentColumn(factorName, columns), ...columns.slice(at)];
}

/** Mass columns a harvest file may use instead of mass_g (typed from a scale in kg, oz or lb). */
const massColumns: Record<string, QuantityUnit> = {
  mass_g: 'g',
  mass_kg: 'kg',
  mass_oz: 'oz',
  mass_lb: 'lb',
};
const convertible: Record<'mass' | 'length', QuantityUnit[]> = {
  mass: ['g', 'kg', 'oz', 'lb'],
  length: ['mm', 'cm', 'm', 'in', 'ft'],
};

export interface CsvPlot {
  id: string;
  entryCode: string;
  label: string;
}
export type CsvTrait = SheetTrait;
export interface CsvLookups {
  siteNames: string[];
  plot(siteName: string, plotNumber: number): CsvPlot | undefined;
  trait?(key: string): CsvTrait | undefined;
  /** a two-factor trial's treatment name: its column in an export is accepted and not read */
  factorName?: string | null;
  /** every trait of the trial, for a recording sheet's columns */
  traits?: readonly CsvTrait[];
  today?: string;
}

export interface ParsedHarvestRow {
  row: number;
  id: string | null;
  plot: CsvPlot;
  harvestedOn: string;
  fruitCount: number;
  massG: number;
  grade: 'marketable' | 'cull';
  note: string;
  /** on a recording sheet, the column(s) the record was read from */
  source?: string;
}
export interface ParsedObservationRow {
  row: number;
  id: string | null;
  plot: CsvPlot;
  trait: CsvTrait;
  observedOn: string;
  plantNumber: number | null;
  value: number | null;
  valueDate: string | null;
  note: string;
  source?: string;
}

export interface CsvCheck<T> {
  columns: string[];
  records: T[];
  errors: ImportRowError[];
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
function checkDate(text: string, today: string): string | null {
  if (!isCalendarDate(text)) return DATE_HINT;
  if (text > today) return 'The date is in the future.';
  if (text < '1900-01-01') return 'The date is too far in the past.';
  return null;
}

function headerIndex(header: string[]) {
  const names = header.map((h) =>
    h
      .trim()
      .toLowerCase()
      .replace(/^\uFEFF/, ''),
  );
  return {
    names,
    col: (name: string) => names.indexOf(name),
  };
}

/** Shared start of both file kinds: header check, then the plot each row names. */
function begin(
  rows: string[][],
  required: string[],
  known: readonly string[],
  errors: ImportRowError[],
) {
  if (rows.length === 0) {
    errors.push({ row: 1, column: '', message: 'The file has no header row.' });
    return null;
  }
  const { names, col } = headerIndex(rows[0]!);
  for (const name of required)
    if (col(name) < 0)
      errors.push({ row: 1, column: name, message: `The header has no ${name} column.` });
  for (const name of names)
    if (name && !known.includes(name))
      errors.push({ row: 1, column: name, message: `Unknown column "${name}".` });
  if (rows.length < 2) errors.push({ row: 1, column: '', message: 'The file has no records.' });
  return errors.length ? null : { names, col };
}

function plotOf(
  cell: (name: string) => string,
  rowNo: number,
  lookups: CsvLookups,
  errors: ImportRowError[],
): CsvPlot | null {
  let site = cell('site');
  if (!site && lookups.siteNames.length === 1) site = lookups.siteNames[0]!;
  const siteName = lookups.siteNames.find((s) => s.toLowerCase() === site.toLowerCase());
  if (!siteName) {
    errors.push({
      row: rowNo,
      column: 'site',
      message: site ? `No site named "${site}" in this trial.` : 'Enter the site.',
    });
    return null;
  }
  const numberText = cell('plot_number');
  const n = readDecimal(numberText);
  if (n === null || !Number.isInteger(n)) {
    errors.push({ row: rowNo, column: 'plot_number', message: 'Enter the plot number.' });
    return null;
  }
  const plot = lookups.plot(siteName, n);
  if (!plot) {
    errors.push({ row: rowNo, column: 'plot_number', message: `No plot ${n} at ${siteName}.` });
    return null;
  }
  const code = cell('entry_code');
  if (code && code.toLowerCase() !== plot.entryCode.toLowerCase()) {
    errors.push({
      row: rowNo,
      column: 'entry_code',
      message: `Plot ${n} at ${siteName} holds entry ${plot.entryCode}, not ${code}: check the plot number.`,
    });
    return null;
  }
  return plot;
}

function recordId(cell: (name: string) => string, rowNo: number, errors: ImportRowError[]) {
  const id = cell('record_id');
  if (!id) return null;
  if (!UUID.test(id)) {
    errors.push({
      row: rowNo,
      column: 'record_id',
      message: 'Not a record id (leave it blank for new records).',
    });
    return undefined;
  }
  return id.toLowerCase();
}

/** Checks of every record row: the note's length, and a record id used once in the file. */
function checkNoteAndId(
  cell: (name: string) => string,
  rowNo: number,
  id: string | null | undefined,
  seen: Set<string>,
  errors: ImportRowError[],
) {
  const noteText = cell('note');
  if (noteText.length > 2000)
    errors.push({ row: rowNo, column: 'note', message: 'Use at most 2000 characters.' });
  if (id) {
    if (seen.has(id))
      errors.push({
        row: rowNo,
        column: 'record_id',
        message: 'This record id appears twice in the file.',
      });
    seen.add(id);
  }
  return noteText;
}

const cellsOf = (row: string[], col: (n: string) => number) => (name: string) => {
  const i = col(name);
  return i < 0 ? '' : (row[i] ?? '').trim();
};
const isBlank = (row: string[]) => row.every((c) => c.trim() === '');

export function checkHarvestCsv(rows: string[][], lookups: CsvLookups): CsvCheck<ParsedHarvestRow> {
  const errors: ImportRowError[] = [];
  const today = lookups.today ?? latestRecordDate();
  const known = [
    ...recordCsvHeader(harvestCsvColumns, lookups.factorName)
      .filter((c) => c !== 'mass_g')
      .map((c) => c.toLowerCase()),
    ...Object.keys(massColumns),
  ];
  const head = begin(rows, ['plot_number', 'harvested_on', 'fruit_count', 'grade'], known, errors);
  const massName = head?.names.find((n) => n in massColumns);
  if (head && !massName)
    errors.push({
      row: 1,
      column: 'mass_g',
      message: 'The header has no mass column (mass_g, mass_kg, mass_oz or mass_lb).',
    });
  if (!head || !massName) return { columns: head?.names ?? [], records: [], errors };
  const records: ParsedHarvestRow[] = [];
  const seen = new Set<string>();
  rows.slice(1).forEach((row, i) => {
    const rowNo = i + 2;
    if (isBlank(row)) return;
    const before = errors.length;
    const cell = cellsOf(row, head.col);
    const id = recordId(cell, rowNo, errors);
    const plot = plotOf(cell, rowNo, lookups, errors);
    const harvestedOn = cell('harvested_on');
    const dateProblem = checkDate(harvestedOn, today);
    if (dateProblem) errors.push({ row: rowNo, column: 'harvested_on', message: dateProblem });
    const fruitCount = readDecimal(cell('fruit_count'));
    if (fruitCount === null)
      errors.push({ row: rowNo, column: 'fruit_count', message: 'Enter a whole number.' });
    else if (!Number.isInteger(fruitCount) || fruitCount < 0)
      errors.push({
        row: rowNo,
        column: 'fruit_count',
        message: 'The count must be a whole number, 0 or more.',
      });
    const mass = readDecimal(cell(massName));
    if (mass === null)
      errors.push({ row: rowNo, column: massName, message: 'Enter the mass as a number.' });
    else if (mass < 0)
      errors.push({ row: rowNo, column: massName, message: 'The mass cannot be negative.' });
    const grade = cell('grade').toLowerCase();
    if (grade !== 'marketable' && grade !== 'cull')
      errors.push({ row: rowNo, column: 'grade', message: 'Use marketable or cull.' });
    const noteText = checkNoteAndId(cell, rowNo, id, seen, errors);
    if (errors.length > before || !plot || id === undefined) return;
    records.push({
      row: rowNo,
      id,
      plot,
      harvestedOn,
      fruitCount: fruitCount!,
      massG: toStored(mass!, massColumns[massName]!),
      grade: grade as 'marketable' | 'cull',
      note: noteText,
    });
  });
  return { columns: head.names, records, errors };
}

export function checkObservationCsv(
  rows: string[][],
  lookups: CsvLookups,
): CsvCheck<ParsedObservationRow> {
  const errors: ImportRowError[] = [];
  const today = lookups.today ?? latestRecordDate();
  const head = begin(
    rows,
    ['plot_number', 'trait_key', 'observed_on'],
    recordCsvHeader(observationCsvColumns, lookups.factorName).map((c) => c.toLowerCase()),
    errors,
  );
  if (head && head.col('value') < 0 && head.col('value_date') < 0)
    errors.push({
      row: 1,
      column: 'value',
      message: 'The header has no value or value_date column.',
    });
  if (!head || errors.length) return { columns: head?.names ?? [], records: [], errors };
  const records: ParsedObservationRow[] = [];
  const seen = new Set<string>();
  rows.slice(1).forEach((row, i) => {
    const rowNo = i + 2;
    if (isBlank(row)) return;
    const before = errors.length;
    const cell = cellsOf(row, head.col);
    const id = recordId(cell, rowNo, errors);
    const plot = plotOf(cell, rowNo, lookups, errors);
    const key = cell('trait_key');
    const trait = key ? lookups.trait?.(key) : undefined;
    if (!trait)
      errors.push({
        row: rowNo,
        column: 'trait_key',
        message: key ? `No trait "${key}" in this trial.` : 'Enter the trait key.',
      });
    const observedOn = cell('observed_on');
    const dateProblem = checkDate(observedOn, today);
    if (dateProblem) errors.push({ row: rowNo, column: 'observed_on', message: dateProblem });
    let plantNumber: number | null = null;
    if (cell('plant_number')) {
      plantNumber = readDecimal(cell('plant_number'));
      if (
        plantNumber === null ||
        !Number.isInteger(plantNumber) ||
        plantNumber < 1 ||
        plantNumber > 999
      ) {
        errors.push({
          row: rowNo,
          column: 'plant_number',
          message: 'Use a whole number from 1 to 999.',
        });
      }
    }
    let value: number | null = null;
    let valueDate: string | null = null;
    if (trait) {
      if (trait.quantityKind === 'date') {
        valueDate = cell('value_date') || cell('value');
        const p = checkDate(valueDate, today);
        if (p) errors.push({ row: rowNo, column: 'value_date', message: p });
      } else {
        const raw = readDecimal(cell('value'));
        const unit = cell('unit').toLowerCase();
        const stored = storedUnitOf(trait.quantityKind);
        if (raw === null)
          errors.push({ row: rowNo, column: 'value', message: 'Enter the value as a number.' });
        else if (unit && unit !== stored) {
          const options =
            trait.quantityKind === 'mass' || trait.quantityKind === 'length'
              ? convertible[trait.quantityKind]
              : [];
          if (!options.includes(unit as QuantityUnit))
            errors.push({
              row: rowNo,
              column: 'unit',
              message: `${trait.label} is recorded in ${[stored, ...options.filter((u) => u !== stored)].join(', ')}.`,
            });
          else value = toStored(raw, unit as QuantityUnit);
        } else value = raw;
        if (value !== null) {
          const p = observationValueProblem(trait, value, null);
          if (p) errors.push({ row: rowNo, column: 'value', message: p.message });
        }
      }
    }
    const noteText = checkNoteAndId(cell, rowNo, id, seen, errors);
    if (errors.length > before || !plot || !trait || id === undefined) return;
    records.push({
      row: rowNo,
      id,
      plot,
      trait,
      observedOn,
      plantNumber,
      value,
      valueDate,
      note: noteText,
    });
  });
  return { columns: head.names, records, errors };
}

// ---------- The recording sheet, typed in ----------

/** A typed-in cell as a number, or the row's problem with it. */
function sheetNumber(text: string, column: SheetColumn): number | string {
  const n = readDecimal(text);
  if (n === null) return `${column.heading}: enter a number.`;
  return n;
}

/**
 * A recording sheet typed into a spreadsheet: each plot row becomes its harvests (marketable
 * and cull, count and mass together) and one observation per filled trait cell, in stored
 * units. Rows with no value typed are plots not recorded this round, and are skipped.
 */
export function checkRecordingSheetCsv(
  rows: string[][],
  lookups: CsvLookups,
): CsvCheck<ParsedHarvestRow | ParsedObservationRow> {
  const errors: ImportRowError[] = [];
  const today = lookups.today ?? latestRecordDate();
  const traits = lookups.traits ?? [];
  if (rows.length === 0) {
    errors.push({ row: 1, column: '', message: 'The file has no header row.' });
    return { columns: [], records: [], errors };
  }
  const { names, col } = headerIndex(rows[0]!);
  const fixed: readonly string[] = [...sheetLeadColumns, sheetNoteColumn];
  for (const name of ['plot_number', 'recorded_on'])
    if (col(name) < 0)
      errors.push({ row: 1, column: name, message: `The header has no ${name} column.` });
  const columns: SheetColumn[] = [];
  names.forEach((name) => {
    if (!name || fixed.includes(name)) return;
    const read = readSheetColumn(name, traits);
    if ('problem' in read) errors.push({ row: 1, column: name, message: read.problem });
    else if (columns.some((c) => c.name === name))
      errors.push({ row: 1, column: name, message: `The column ${name} appears twice.` });
    else columns.push(read);
  });
  if (!errors.length && columns.length === 0)
    errors.push({ row: 1, column: '', message: 'The header has no column to record in.' });
  if (errors.length) return { columns: names, records: [], errors };

  const records: (ParsedHarvestRow | ParsedObservationRow)[] = [];
  const rowOfPlotDate = new Map<string, number>();
  rows.slice(1).forEach((row, i) => {
    const rowNo = i + 2;
    const cell = cellsOf(row, col);
    const filled = columns.filter((c) => cell(c.name) !== '');
    if (filled.length === 0 && !cell(sheetNoteColumn)) return; // a plot not recorded this round
    const before = errors.length;
    const problem = (column: string, message: string) =>
      errors.push({ row: rowNo, column, message });
    const plot = plotOf(cell, rowNo, lookups, errors);
    const date = cell('recorded_on');
    const dateProblem = date ? checkDate(date, today) : 'Enter the date the plot was recorded.';
    if (dateProblem) problem('recorded_on', dateProblem);
    const note = cell(sheetNoteColumn);
    if (note.length > 2000) problem(sheetNoteColumn, 'Use at most 2000 characters.');
    const earlier = plot && !dateProblem ? rowOfPlotDate.get(`${plot.id}#${date}`) : undefined;
    if (earlier)
      problem(
        'plot_number',
        `Row ${earlier} already records this plot on ${date}: join the two rows.`,
      );
    else if (plot && !dateProblem) rowOfPlotDate.set(`${plot.id}#${date}`, rowNo);
    if (filled.length === 0)
      problem(
        sheetNoteColumn,
        'A note needs a value beside it; write plot notes in the field log.',
      );
    const found: (ParsedHarvestRow | ParsedObservationRow)[] = [];
    for (const grade of ['marketable', 'cull'] as const) {
      const countCol = columns.find((c) => c.kind === 'harvest-count' && c.grade === grade);
      const massCol = columns.find((c) => c.kind === 'harvest-mass' && c.grade === grade);
      const countText = countCol ? cell(countCol.name) : '';
      const massText = massCol ? cell(massCol.name) : '';
      if (!countText && !massText) continue;
      if (!countText || !massText) {
        const missing = countText ? massCol : countCol;
        problem(
          missing?.name ?? `${grade}_count`,
          countText ? 'Enter the mass of these fruit too.' : 'Enter how many fruit too.',
        );
        continue;
      }
      const count = sheetNumber(countText, countCol!);
      const mass = sheetNumber(massText, massCol!);
      if (typeof count === 'string') problem(countCol!.name, count);
      else if (!Number.isInteger(count) || count < 0)
        problem(countCol!.name, 'The count must be a whole number, 0 or more.');
      if (typeof mass === 'string') problem(massCol!.name, mass);
      else if (mass < 0) problem(massCol!.name, 'The mass cannot be negative.');
      if (typeof count === 'string' || typeof mass === 'string' || massCol?.kind !== 'harvest-mass')
        continue;
      found.push({
        row: rowNo,
        id: null,
        plot: plot!,
        harvestedOn: date,
        fruitCount: count,
        massG: toStored(mass, massCol.valueUnit),
        grade,
        note,
        source: `${countCol!.name}+${massCol.name}`,
      });
    }
    for (const c of filled) {
      if (c.kind !== 'trait') continue;
      const text = cell(c.name);
      const t = c.trait;
      let value: number | null = null;
      let valueDate: string | null = null;
      if (t.quantityKind === 'date') {
        const p = checkDate(text, today);
        if (p) problem(c.name, p);
        valueDate = text;
      } else {
        const typed = sheetNumber(text, c);
        if (typeof typed === 'string') {
          problem(c.name, typed);
          continue;
        }
        value = c.valueUnit ? toStored(typed, c.valueUnit) : typed;
        const p = observationValueProblem(t, value, null);
        if (p) problem(c.name, p.message);
      }
      found.push({
        row: rowNo,
        id: null,
        plot: plot!,
        trait: t,
        observedOn: date,
        plantNumber: c.plant,
        value,
        valueDate,
        note,
        source: c.name,
      });
    }
    if (errors.length > before || !plot) return;
    records.push(...found);
  });
  return { columns: names, records, errors };
}
