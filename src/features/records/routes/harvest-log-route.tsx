import { harvestGrades, harvestLogQuery, type Harvest } from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import { formatMass, fromStored, G_PER_OUNCE, toStored } from '@common/units';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { useUnitSystem } from '@/lib/session';
import type { TrialWithPermissions } from '@/lib/trial';
import { harvestsQueryOptions, useUpdateHarvest } from '../api/record-api';
import { type LogFilters, type RecordLogKind, RecordLogRoute } from '../components/record-log-page';
import { editCell } from '../components/record-log';

interface Draft {
  harvestedOn: string;
  fruitCount: string;
  mass: string;
  grade: Harvest['grade'];
  note: string;
}

/** The harvest log: what each kind of log needs to know about harvests. */
function useHarvestLog(slug: string, _trial: TrialWithPermissions): RecordLogKind<Harvest, Draft> {
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
    useList: (filters: LogFilters | null) => {
      const q = useQuery({
        ...harvestsQueryOptions(slug, filters ?? {}),
        enabled: filters !== null,
        placeholderData: keepPreviousData,
      });
      const d = q.data;
      return {
        ...q,
        data: d && {
          rows: d.harvests,
          total: d.total,
          page: d.page,
          limit: d.limit,
          summary: `${d.total.toLocaleString('en')} harvests · ${formatMass(d.totalMassG, units)} in total${
            units === 'us' ? ` (${Math.round(d.totalMassG / G_PER_OUNCE)} oz)` : ''
          }`,
        },
      };
    },
    columns: [
      {
        header: 'Date',
        cell: (h) => h.harvestedOn,
        edit: (d, change) => (
          <input
            aria-label="Date"
            type="date"
            value={d.harvestedOn}
            onChange={(e) => change({ ...d, harvestedOn: e.target.value })}
            className={editCell}
          />
        ),
      },
      { header: 'Site', cell: (h) => h.siteName },
      { header: 'Plot', cell: (h) => h.plotNumber },
      { header: 'Entry', cell: (h) => `${h.entryName} (${h.entryCode})` },
      {
        header: 'Fruit',
        cell: (h) => h.fruitCount,
        edit: (d, change) => (
          <input
            aria-label="Fruit count"
            inputMode="numeric"
            value={d.fruitCount}
            onChange={(e) => change({ ...d, fruitCount: e.target.value })}
            className={editCell}
          />
        ),
      },
      {
        header: 'Mass',
        cell: (h) => formatMass(h.massG, units),
        edit: (d, change) => (
          <input
            aria-label={`Mass (${massUnit})`}
            inputMode="decimal"
            value={d.mass}
            onChange={(e) => change({ ...d, mass: e.target.value })}
            className={editCell}
          />
        ),
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
        edit: (d, change) => (
          <input
            aria-label="Note"
            value={d.note}
            onChange={(e) => change({ ...d, note: e.target.value })}
            className={editCell}
          />
        ),
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
