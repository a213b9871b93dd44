import type { RecordPlot } from '@common/contracts/records';
import { useId, useState } from 'react';
import { ScrollRegion } from '@/components/ui/scroll-region';

/** A two-factor trial's plot level, named by the treatment ("Fertilizer: none"); else null. */
export function plotTreatment(
  factorName: string | null | undefined,
  plot: Pick<RecordPlot, 'treatment'>,
): string | null {
  return factorName && plot.treatment ? `${factorName}: ${plot.treatment}` : null;
}

/**
 * Pick a plot by typing its number, by entry, or by tapping it on the grid of blocks; in a
 * two-factor trial each plot on the grid also shows its level of the treatment.
 */
export function PlotPicker({
  plots,
  currentId,
  onPick,
  factorName,
}: {
  plots: RecordPlot[];
  currentId: string | null;
  onPick: (plotId: string) => void;
  /** the trial's treatment, when it has a second factor */
  factorName?: string | null;
}) {
  const id = useId();
  const [number, setNumber] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const entries = [...new Map(plots.map((p) => [p.entryId, p])).values()].sort((a, b) =>
    a.entryName.localeCompare(b.entryName),
  );
  const blocks = [...new Set(plots.map((p) => p.block))].sort((a, b) => a - b);

  const goToNumber = () => {
    const plot = plots.find((p) => p.plotNumber === Number(number));
    if (!plot) return setProblem(`No plot ${number || '(blank)'} at this site.`);
    setProblem(null);
    setNumber('');
    onPick(plot.plotId);
  };

  return (
    <div className="space-y-3">
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          goToNumber();
        }}
      >
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-n`} className="font-medium">
            Plot number
          </label>
          <input
            id={`${id}-n`}
            inputMode="numeric"
            pattern="[0-9]*"
            value={number}
            onChange={(e) => setNumber(e.target.value)}
            aria-invalid={problem ? true : undefined}
            aria-describedby={problem ? `${id}-err` : undefined}
            className="min-h-11 w-28 rounded-lg border border-leaf-300 bg-white px-3 text-lg"
          />
        </div>
        <button
          type="submit"
          className="min-h-11 rounded-lg bg-leaf-700 px-4 font-semibold text-white"
        >
          Go to plot
        </button>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-e`} className="font-medium">
            Or by entry
          </label>
          <select
            id={`${id}-e`}
            className="min-h-11 max-w-[14rem] rounded-lg border border-leaf-300 bg-white px-2"
            value=""
            onChange={(e) => {
              const first = plots.find((p) => p.entryId === e.target.value);
              if (first) onPick(first.plotId);
            }}
          >
            <option value="">Choose an entry…</option>
            {entries.map((e) => (
              <option key={e.entryId} value={e.entryId}>
                {e.entryName} ({e.entryCode})
              </option>
            ))}
          </select>
        </div>
      </form>
      {problem ? (
        <p id={`${id}-err`} role="alert" className="text-sm font-medium text-frost-600">
          {problem}
        </p>
      ) : null}
      <ScrollRegion label="Plots by block" hint="More plots to the side: swipe or scroll sideways">
        <div className="space-y-1 pb-1">
          {blocks.map((block) => (
            <div key={block} className="flex items-center gap-1">
              <span className="w-14 shrink-0 text-xs text-loam-700">Block {block}</span>
              {plots
                .filter((p) => p.block === block)
                .sort((a, b) => a.position - b.position)
                .map((p) => (
                  <button
                    key={p.plotId}
                    type="button"
                    aria-pressed={p.plotId === currentId}
                    onClick={() => onPick(p.plotId)}
                    // relative: the screen-reader words inside stay within the scrolling grid
                    // (absolutely placed, they would otherwise widen the whole page on a phone)
                    className={`relative min-h-11 min-w-11 shrink-0 rounded-md border px-1 text-xs leading-tight ${
                      p.plotId === currentId
                        ? 'border-pod-500 bg-pod-500 font-bold text-ink'
                        : 'border-leaf-300 bg-white text-leaf-900'
                    }`}
                  >
                    <span className="sr-only">Plot </span>
                    {p.plotNumber}
                    <br />
                    <span className="font-mono">{p.entryCode}</span>
                    <span className="sr-only">, {p.entryName}</span>
                    {plotTreatment(factorName, p) ? (
                      <>
                        <br />
                        <span className="sr-only">, {factorName}: </span>
                        <span className="text-[0.7rem]">{p.treatment}</span>
                      </>
                    ) : null}
                  </button>
                ))}
            </div>
          ))}
        </div>
      </ScrollRegion>
    </div>
  );
}
