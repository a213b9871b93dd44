import {
  observationLogQuery,
  type Observation,
  type ObservationList,
} from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import { columnUnit, formatScaled } from '@common/display-units';
import { observationDoubt } from '@common/plausibility';
import { decimalsInUnit, exportNumber, recordedDecimals } from '@common/precision';
import { fromStored, type QuantityUnit, toStored } from '@common/units';
import { useUnitSystem } from '@/lib/session';
import type { TrialWithPermissions } from '@/lib/trial';
import { observationsQueryOptions, useUpdateObservation } from '../api/record-api';
import { type LogFilters, type RecordLogKind, RecordLogRoute } from '../components/record-log-page';
import { DoubtFlag, editText } from '../components/record-log';

interface Draft {
  /** a number in the edit unit, or a date for a date trait */
  value: string;
  note: string;
  unit: QuantityUnit | null;
  /** decimals the value is typed with, in `unit` */
  places: number | null;
  isDate: boolean;
}

/** The observation log: measurements, scores and dates, one row per plant or plot. */
function useObservationLog(
  slug: string,
  trial: TrialWithPermissions,
): RecordLogKind<Observation, Draft, ObservationList> {
  const units = useUnitSystem();
  const update = useUpdateObservation(slug);
  const valueText = (value: number | null, d: Pick<Draft, 'unit' | 'places'>) =>
    value === null
      ? ''
      : d.unit && d.places !== null
        ? exportNumber(fromStored(value, d.unit), d.places)
        : String(value);
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
    answer: (d) => {
      // Each trait's one unit and precision on this page, chosen from all its values shown
      // (a height in cm on every row, never cm on one row and m on the next).
      const traitColumns = new Map(
        trial.traits.map((t) => {
          const values = d.observations.flatMap((o) =>
            o.traitId === t.id && o.value !== null ? [o.value] : [],
          );
          const col = columnUnit(t.quantityKind, units, values, t.displayUnit);
          return [t.id, { trait: t, ...col, decimals: recordedDecimals(values) }] as const;
        }),
      );
      const unitLabel = (traitId: string) => traitColumns.get(traitId)?.shown.label ?? '';
      const only = d.observations.every((o) => o.traitId === d.observations[0]?.traitId)
        ? d.observations[0]?.traitId
        : undefined;
      const show = (o: Observation) => {
        if (o.valueDate) return o.valueDate;
        const col = traitColumns.get(o.traitId);
        if (o.value === null || !col) return '—';
        return (
          <>
            {formatScaled(o.value, col.shown, col.decimals)}
            <DoubtFlag
              doubts={[observationDoubt(o.value, col.trait, units)].filter((x) => x !== null)}
            />
          </>
        );
      };
      return {
        rows: d.observations,
        summary: `${d.total.toLocaleString('en')} observations`,
        toDraft: (o) => {
          const col = traitColumns.get(o.traitId);
          const unit = col?.unit ?? null;
          const places = col?.unit ? decimalsInUnit(col.decimals, col.shown.factor) : null;
          return {
            value: o.valueDate ?? valueText(o.value, { unit, places }),
            note: o.note,
            unit,
            places,
            isDate: o.valueDate !== null,
          };
        },
        columns: [
          { header: 'Date', sort: 'date', cell: (o) => o.observedOn },
          { header: 'Site', cell: (o) => o.siteName },
          { header: 'Plot', sort: 'plot', align: 'right', cell: (o) => o.plotNumber },
          { header: 'Entry', sort: 'entry', cell: (o) => `${o.entryName} (${o.entryCode})` },
          {
            header: 'Trait',
            cell: (o) =>
              unitLabel(o.traitId) ? `${o.traitLabel} (${unitLabel(o.traitId)})` : o.traitLabel,
          },
          { header: 'Plant', align: 'right', cell: (o) => o.plantNumber },
          {
            // With one trait shown, the heading names its unit once.
            header: only && unitLabel(only) ? `Value (${unitLabel(only)})` : 'Value',
            align: 'right',
            cell: show,
            edit: editText<Draft>('value', (x) => `Value${x.unit ? ` (${x.unit})` : ''}`, {
              type: (x) => (x.isDate ? 'date' : 'text'),
              inputMode: 'decimal',
            }),
          },
          { header: 'Note', cell: (o) => o.note, edit: editText<Draft>('note', 'Note') },
          { header: 'By', cell: (o) => o.updatedByName },
        ],
      };
    },
    rowName: (o) =>
      `${o.traitLabel} of plot ${o.plotNumber}${o.plantNumber ? `, plant ${o.plantNumber}` : ''} on ${o.observedOn}`,
    fromStored: (c, d) => ({
      ...d,
      value: d.isDate
        ? String(c.valueDate ?? '')
        : valueText(typeof c.value === 'number' ? c.value : null, d),
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
