import type { TrialAnalysis } from '@common/contracts/analysis';
import type { UnitSystem } from '@common/contracts/me';
import type { TraitDisplayUnit } from '@common/contracts/trials';
import { displayUnit, formatScaled } from '@common/display-units';
import { directionWords, type TraitDirection } from '@common/ranking';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';

export interface ComparedTrait {
  key: string;
  label: string;
  direction: TraitDirection;
  displayUnit: TraitDisplayUnit | null;
}

interface Cell {
  mean: number;
  se: number | null;
  /** The model's adjusted mean where the layout is unbalanced (or the mixed model was used). */
  adjusted?: { mean: number; se: number | null };
  group: string;
  rank: number | null;
}

interface Row {
  variety: string;
  cells: Record<string, Cell | undefined>;
}

/** The value ranks and letters come from: the adjusted mean where there is one. */
const rankedOn = (c: Cell) => c.adjusted?.mean ?? c.mean;

function cellOf(analysis: TrialAnalysis, variety: string): Cell | undefined {
  const m = analysis.means.find((x) => x.variety === variety);
  if (!m) return undefined;
  const adjusted =
    analysis.method === 'least-squares' || analysis.model === 'mixed'
      ? analysis.adjustedMeans.find((a) => a.variety === variety)
      : undefined;
  return {
    mean: m.mean,
    se: m.se,
    ...(adjusted ? { adjusted: { mean: adjusted.mean, se: adjusted.se } } : {}),
    group: m.group,
    rank: m.rank,
  };
}

/** "best first" when the order shown puts the best entry on top, for traits with a direction. */
function orderWords(direction: TraitDirection, sorted: false | 'asc' | 'desc') {
  if (!sorted || direction === 'none') return null;
  const bestFirst = (sorted === 'desc') === (direction === 'higher');
  return bestFirst ? 'best first' : 'worst first';
}

const column = createColumnHelper<Row>();

/**
 * Entries side by side, one column per chosen trait, each trait in the reader's unit system.
 * A trait's first sort puts its best entry on top: highest mean first when higher is better,
 * lowest first when lower is better (so aria-sort says "ascending" there), highest first with
 * no preferred direction. Where the layout is unbalanced the adjusted mean is what sorts, as it
 * is what the ranks and letters come from.
 */
export function ComparisonTable({
  entries,
  traits,
  analyses,
  units,
}: {
  entries: { name: string }[];
  traits: ComparedTrait[];
  /** Each trait's analysis by trait key; missing while it loads. */
  analyses: Map<string, TrialAnalysis | undefined>;
  units: UnitSystem;
}) {
  const rows: Row[] = entries.map((e) => ({
    variety: e.name,
    cells: Object.fromEntries(
      traits.map((t) => {
        const analysis = analyses.get(t.key);
        return [t.key, analysis ? cellOf(analysis, e.name) : undefined];
      }),
    ),
  }));
  const columns = [
    column.accessor('variety', { header: 'Variety' }),
    ...traits.map((t) => {
      const analysis = analyses.get(t.key);
      const unit = analysis
        ? displayUnit(analysis.unit, units, analysis.grandMean, t.displayUnit)
        : null;
      const decimals = analysis?.decimals.mean ?? 1;
      const shown = (v: number | null) => (unit ? formatScaled(v, unit, decimals) : '—');
      return column.accessor((r) => (r.cells[t.key] ? rankedOn(r.cells[t.key]!) : undefined), {
        id: t.key,
        header: ({ column: c }) => {
          const order = orderWords(t.direction, c.getIsSorted());
          return (
            <span className="flex flex-col text-left">
              <span>
                {t.label}
                {unit?.label ? ` (${unit.label})` : ''}
              </span>
              <span className="text-xs font-normal text-loam-700">
                {directionWords[t.direction]}
              </span>
              {order ? <span className="text-xs font-normal">({order})</span> : null}
            </span>
          );
        },
        sortingFn: 'basic',
        // The first press puts the best entry on top.
        sortDescFirst: t.direction !== 'lower',
        sortUndefined: 'last',
        cell: ({ row }) => {
          const m = row.original.cells[t.key];
          if (!m) return '—';
          return (
            <>
              {shown(m.mean)} ± {shown(m.se)}{' '}
              <span className="font-mono text-leaf-700">{m.group}</span>
              {m.rank === null ? null : <span className="text-xs text-loam-700"> #{m.rank}</span>}
              {m.adjusted ? (
                <span className="block text-xs text-loam-700">
                  adjusted {shown(m.adjusted.mean)}
                  {m.adjusted.se === null ? '' : ` ± ${shown(m.adjusted.se)}`}
                </span>
              ) : null}
            </>
          );
        },
      });
    }),
  ];
  const first = traits.map((t) => analyses.get(t.key)).find((a) => a !== undefined);
  const letters = first?.letters === 'lsd' ? "Fisher's LSD" : "Tukey's HSD";
  return (
    <ScrollRegion label="Entries compared" className="mt-3 rounded-lg bg-white shadow-sm">
      <DataTable
        showCaption
        className="min-w-[28rem]"
        caption={
          <>
            Entries compared
            <span className="block text-xs font-normal text-loam-700">
              Mean ± SE, letter group (same letter: not significantly different, {letters} at α ={' '}
              {first?.alpha ?? 0.05}) and rank (#1 = best in the trait's direction; traits with no
              preferred direction are not ranked). Where plots are missing, the adjusted mean below
              is the one ranked and sorted. Select a header to sort, best first.
            </span>
          </>
        }
        data={rows}
        columns={columns}
        rowId={(r) => r.variety}
        rowHeader="variety"
      />
    </ScrollRegion>
  );
}
