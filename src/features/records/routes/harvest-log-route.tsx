import {
  harvestGrades,
  harvestLogQuery,
  type Harvest,
  type HarvestList,
} from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import { columnUnit, formatInUnit, formatScaled } from '@common/display-units';
import { harvestChecks, harvestDoubts } from '@common/plausibility';
import { decimalsInUnit, exportNumber, recordedDecimals } from '@common/precision';
import { fromStored, type QuantityUnit, toStored } from '@common/units';
import { useUnitSystem } from '@/lib/session';
import type { TrialWithPermissions } from '@/lib/trial';
import { harvestsQueryOptions, useUpdateHarvest } from '../api/record-api';
import { type LogFilters, type RecordLogKind, RecordLogRoute } from '../components/record-log-page';
import { DoubtFlag, editCell, editText } from '../components/record-log';

interface Draft {
  harvestedOn: string;
  fruitCount: string;
  /** in `unit`, to the precision recorded */
  mass: string;
  grade: Harvest['grade'];
  note: string;
  unit: QuantityUnit;
  places: number;
}

/** The harvest log: what each kind of log needs to know about harvests. */
function useHarvestLog(
  slug: string,
  trial: TrialWithPermissions,
): RecordLogKind<Harvest, Draft, HarvestList> {
  const units = useUnitSystem();
  const update = useUpdateHarvest(slug);
  const traits = trial.traits;
  const massText = (g: number, unit: QuantityUnit, places: number) =>
    exportNumber(fromStored(g, unit), places);
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
    answer: (d) => {
      // One mass unit and precision for the whole column, chosen from the harvests shown.
      const masses = d.harvests.map((h) => h.massG);
      const col = columnUnit('mass', units, masses, harvestChecks(traits).massUnit);
      const unit = col.unit!;
      const decimals = recordedDecimals(masses);
      const places = decimalsInUnit(decimals, col.shown.factor);
      return {
        rows: d.harvests,
        summary: `${d.total.toLocaleString('en')} harvests · ${formatInUnit(d.totalMassG, col.shown, decimals)} in total`,
        toDraft: (h) => ({
          harvestedOn: h.harvestedOn,
          fruitCount: String(h.fruitCount),
          mass: massText(h.massG, unit, places),
          grade: h.grade,
          note: h.note,
          unit,
          places,
        }),
        columns: [
          {
            header: 'Date',
            sort: 'date',
            cell: (h) => h.harvestedOn,
            edit: editText<Draft>('harvestedOn', 'Date', { type: () => 'date' }),
          },
          { header: 'Site', cell: (h) => h.siteName },
          { header: 'Plot', sort: 'plot', align: 'right', cell: (h) => h.plotNumber },
          { header: 'Entry', sort: 'entry', cell: (h) => `${h.entryName} (${h.entryCode})` },
          {
            header: 'Fruit',
            align: 'right',
            cell: (h) => h.fruitCount,
            edit: editText<Draft>('fruitCount', 'Fruit count', { inputMode: 'numeric' }),
          },
          {
            header: `Mass (${col.shown.label})`,
            align: 'right',
            cell: (h) => (
              <>
                {formatScaled(h.massG, col.shown, decimals)}
                <DoubtFlag doubts={harvestDoubts(h, traits, units)} />
              </>
            ),
            edit: editText<Draft>('mass', `Mass (${unit})`, { inputMode: 'decimal' }),
          },
          {
            header: 'Grade',
            cell: (h) => h.grade,
            edit: (draft, change) => (
              <select
                aria-label="Grade"
                value={draft.grade}
                onChange={(e) => change({ ...draft, grade: e.target.value as Draft['grade'] })}
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
          { header: 'Note', cell: (h) => h.note, edit: editText<Draft>('note', 'Note') },
          { header: 'By', cell: (h) => h.updatedByName },
        ],
      };
    },
    rowName: (h) => `harvest of plot ${h.plotNumber} on ${h.harvestedOn}`,
    fromStored: (c, d) => ({
      ...d,
      harvestedOn: String(c.harvestedOn),
      fruitCount: String(c.fruitCount),
      mass: massText(Number(c.massG), d.unit, d.places),
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
          massG: toStored(readNumberField(d.mass) ?? Number.NaN, d.unit),
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
