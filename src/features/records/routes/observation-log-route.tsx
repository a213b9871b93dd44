import {
  observationLogQuery,
  type Observation,
  type ObservationList,
} from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import { formatLength, formatMass, fromStored, type QuantityUnit, toStored } from '@common/units';
import { useUnitSystem } from '@/lib/session';
import type { TrialWithPermissions } from '@/lib/trial';
import { observationsQueryOptions, useUpdateObservation } from '../api/record-api';
import { type LogFilters, type RecordLogKind, RecordLogRoute } from '../components/record-log-page';
import { editText } from '../components/record-log';

interface Draft {
  /** a number in the edit unit, or a date for a date trait */
  value: string;
  note: string;
  unit: QuantityUnit | null;
  isDate: boolean;
}

/** The observation log: measurements, scores and dates, one row per plant or plot. */
function useObservationLog(
  slug: string,
  trial: TrialWithPermissions,
): RecordLogKind<Observation, Draft, ObservationList> {
  const units = useUnitSystem();
  const update = useUpdateObservation(slug);
  const kindOf = new Map(trial.traits.map((t) => [t.id, t.quantityKind]));
  const editUnit = (traitId: string): QuantityUnit | null => {
    const k = kindOf.get(traitId);
    if (k === 'length') return units === 'metric' ? 'mm' : 'in';
    if (k === 'mass') return units === 'metric' ? 'g' : 'oz';
    return null;
  };
  const show = (o: Observation) => {
    if (o.valueDate) return o.valueDate;
    const k = kindOf.get(o.traitId);
    if (o.value === null) return '—';
    if (k === 'length') return formatLength(o.value, units, 0);
    if (k === 'mass') return formatMass(o.value, units);
    if (k === 'percent') return `${o.value} %`;
    return String(o.value);
  };
  const valueText = (value: number | null, unit: QuantityUnit | null) =>
    value === null ? '' : String(unit ? Math.round(fromStored(value, unit) * 100) / 100 : value);
  return {
    title: 'Observation log',
    table: 'observations',
    loadingLabel: 'Loading observations…',
    query: observationLogQuery,
    choice: {
      field: 'traitId',
      label: 'Trait',
      all: 'All traits',
      options: trial.traits.map((t) => [t.id, t.label]),
    },
    searchLabel: 'Search',
    list: (filters: LogFilters) => observationsQueryOptions(slug, filters),
    answer: (d) => ({
      rows: d.observations,
      summary: `${d.total.toLocaleString('en')} observations`,
    }),
    columns: [
      { header: 'Date', cell: (o) => o.observedOn },
      { header: 'Site', cell: (o) => o.siteName },
      { header: 'Plot', cell: (o) => o.plotNumber },
      { header: 'Entry', cell: (o) => `${o.entryName} (${o.entryCode})` },
      { header: 'Trait', cell: (o) => o.traitLabel },
      { header: 'Plant', cell: (o) => o.plantNumber },
      {
        header: 'Value',
        cell: show,
        edit: editText<Draft>('value', (d) => `Value${d.unit ? ` (${d.unit})` : ''}`, {
          type: (d) => (d.isDate ? 'date' : 'text'),
          inputMode: 'decimal',
        }),
      },
      {
        header: 'Note',
        cell: (o) => o.note,
        edit: editText<Draft>('note', 'Note'),
      },
      { header: 'By', cell: (o) => o.updatedByName },
    ],
    rowName: (o) =>
      `${o.traitLabel} of plot ${o.plotNumber}${o.plantNumber ? `, plant ${o.plantNumber}` : ''} on ${o.observedOn}`,
    toDraft: (o) => {
      const unit = editUnit(o.traitId);
      return {
        value: o.valueDate ?? valueText(o.value, unit),
        note: o.note,
        unit,
        isDate: o.valueDate !== null,
      };
    },
    fromStored: (c, d) => ({
      ...d,
      value: d.isDate
        ? String(c.valueDate ?? '')
        : valueText(typeof c.value === 'number' ? c.value : null, d.unit),
      note: String(c.note ?? ''),
    }),
    save: (o, d, version) => {
      const typed = readNumberField(d.value) ?? Number.NaN;
      return update.mutateAsync({
        id: o.id,
        body: d.isDate
          ? { version, valueDate: d.value, note: d.note }
          : { version, value: d.unit ? toStored(typed, d.unit) : typed, note: d.note },
      });
    },
    saving: update.isPending,
  };
}

/** The observation log: filter, page, edit in place, delete with undo. */
export function Component() {
  return <RecordLogRoute useKind={useObservationLog} />;
}
