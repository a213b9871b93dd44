import {
  harvestGrades,
  harvestLogQuery,
  type Harvest,
  type HarvestList,
} from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import { formatMass, fromStored, G_PER_OUNCE, toStored } from '@common/units';
import { useUnitSystem } from '@/lib/session';
import type { TrialWithPermissions } from '@/lib/trial';
import { harvestsQueryOptions, useUpdateHarvest } from '../api/record-api';
import { type LogFilters, type RecordLogKind, RecordLogRoute } from '../components/record-log-page';
import { editCell, editText } from '../components/record-log';

interface Draft {
  harvestedOn: string;
  fruitCount: string;
  mass: string;
  grade: Harvest['grade'];
  note: string;
}

/** The harvest log: what each kind of log needs to know about harvests. */
function useHarvestLog(
  slug: string,
  _trial: TrialWithPermissions,
): RecordLogKind<Harvest, Draft, HarvestList> {
  const units = useUnitSystem();
  const massUnit = units === 'metric' ? 'g' : 'oz';
  const update = useUpdateHarvest(slug);
  const massText = (g: number) => String(Math.round(fromStored(g, massUnit) * 100) / 100);
  return {
    title: 'Harvest log',
    table: 'harvests',
    loadingLabel: 'Loading harvests…',
    query: harvestLogQuery,
    choice: {
      field: 'grade',
      label: 'Grade',
      all: 'Both',
      options: harvestGrades.map((g) => [g, g === 'marketable' ? 'Marketable' : 'Cull']),
    },
    searchLabel: 'Search entry, note…',
    list: (filters: LogFilters) => harvestsQueryOptions(slug, filters),
    answer: (d) => ({
      rows: d.harvests,
      summary: `${d.total.toLocaleString('en')} harvests · ${formatMass(d.totalMassG, units)} in total${
        units === 'us' ? ` (${Math.round(d.totalMassG / G_PER_OUNCE)} oz)` : ''
      }`,
    }),
    columns: [
      {
        header: 'Date',
        cell: (h) => h.harvestedOn,
        edit: editText<Draft>('harvestedOn', 'Date', { type: () => 'date' }),
      },
      { header: 'Site', cell: (h) => h.siteName },
      { header: 'Plot', cell: (h) => h.plotNumber },
      { header: 'Entry', cell: (h) => `${h.entryName} (${h.entryCode})` },
      {
        header: 'Fruit',
        cell: (h) => h.fruitCount,
        edit: editText<Draft>('fruitCount', 'Fruit count', { inputMode: 'numeric' }),
      },
      {
        header: 'Mass',
        cell: (h) => formatMass(h.massG, units),
        edit: editText<Draft>('mass', `Mass (${massUnit})`, { inputMode: 'decimal' }),
      },
      {
        header: 'Grade',
        cell: (h) => h.grade,
        edit: (d, change) => (
          <select
            aria-label="Grade"
            value={d.grade}
            onChange={(e) => change({ ...d, grade: e.target.value as Draft['grade'] })}
            className={editCell}
          >
            {harvestGrades.map((g) => (
              <option key={g} value={g}>
                {g}
              </option>
            ))}
          </select>
        ),
      },
      {
        header: 'Note',
        cell: (h) => h.note,
        edit: editText<Draft>('note', 'Note'),
      },
      { header: 'By', cell: (h) => h.updatedByName },
    ],
    rowName: (h) => `harvest of plot ${h.plotNumber} on ${h.harvestedOn}`,
    toDraft: (h) => ({
      harvestedOn: h.harvestedOn,
      fruitCount: String(h.fruitCount),
      mass: massText(h.massG),
      grade: h.grade,
      note: h.note,
    }),
    fromStored: (c) => ({
      harvestedOn: String(c.harvestedOn),
      fruitCount: String(c.fruitCount),
      mass: massText(Number(c.massG)),
      grade: c.grade === 'cull' ? 'cull' : 'marketable',
      note: String(c.note ?? ''),
    }),
    save: (h, d, version) =>
      update.mutateAsync({
        id: h.id,
        body: {
          version,
          harvestedOn: d.harvestedOn,
          fruitCount: readNumberField(d.fruitCount) ?? Number.NaN,
          massG: toStored(readNumberField(d.mass) ?? Number.NaN, massUnit),
          grade: d.grade,
          note: d.note,
        },
      }),
    saving: update.isPending,
  };
}

/** The harvest log: filter, page, edit in place (a stale edit is refused with 409), delete with undo. */
export function Component() {
  return <RecordLogRoute useKind={useHarvestLog} />;
}
