import type { AnalysisModel } from '@common/contracts/analysis';
import type { TrialWithPermissions } from '@/lib/trial';
import { useEffect, useId, useState } from 'react';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useRanking } from '../api/get-ranking';
import { displayNumber } from '@common/precision';
import { formatP } from '@common/display-units';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { DataTable } from '@/components/ui/data-table';
import type { Ranking } from '@common/contracts/analysis';
import { createColumnHelper } from '@tanstack/react-table';

const rankCol = createColumnHelper<Ranking['entries'][number]>();

const directionWords = { higher: 'higher is better', lower: 'lower is better', none: '' };

/** Weighted index across traits, with weights the reader sets (kept only on this screen). */
export function RankingPanel({
  trial,
  alpha,
  model,
}: {
  trial: TrialWithPermissions;
  alpha: number;
  /**
   * The page's model, so the ranking uses the means the tables above show; left out where the
   * model is the analysis API's choice per trait (a split plot: mixed for a trait that lost plots).
   */
  model?: AnalysisModel;
}) {
  const id = useId();
  const ranked = trial.traits.filter((t) => t.direction !== 'none');
  const [weights, setWeights] = useState<Record<string, string>>(() =>
    Object.fromEntries(ranked.map((t) => [t.key, '1'])),
  );
  // Let typing settle before asking the server again.
  const [settled, setSettled] = useState(weights);
  useEffect(() => {
    const h = setTimeout(() => setSettled(weights), 400);
    return () => clearTimeout(h);
  }, [weights]);
  const chosen = ranked.filter((t) => {
    const w = Number(settled[t.key]);
    return Number.isFinite(w) && w > 0;
  });
  const query = {
    traits: chosen.map((t) => t.key),
    weights: chosen.map((t) => Number(settled[t.key])),
    alpha,
    model,
  };
  const { data, error, isFetching } = useRanking(trial.slug, query);
  if (ranked.length === 0) return null;
  const labelOf = Object.fromEntries(trial.traits.map((t) => [t.key, t.label]));

  return (
    <section aria-labelledby={`${id}-h`} className="mt-8">
      <h2 id={`${id}-h`} className="text-2xl font-semibold text-leaf-900">
        Ranking across traits
      </h2>
      <p className="mt-1 max-w-prose text-sm">
        Each trait’s entry means are standardised (z = distance from the average entry in SDs of the
        entry means), turned so that better is positive, and averaged with your weights. A weight of
        0 leaves a trait out. The rank sum adds each entry’s rank per trait.
      </p>
      <fieldset className="mt-3 grid gap-2 sm:grid-cols-3">
        <legend className="sr-only">Weights</legend>
        {ranked.map((t) => (
          <label
            key={t.key}
            className="flex items-center justify-between gap-2 rounded-lg bg-white p-2 text-sm shadow-sm"
          >
            <span>
              {t.label}
              <span className="block text-xs text-loam-700">{directionWords[t.direction]}</span>
            </span>
            <input
              type="number"
              min={0}
              max={100}
              step={0.5}
              inputMode="decimal"
              className="min-h-11 w-20 rounded-lg border border-leaf-300 px-2 text-right"
              value={weights[t.key] ?? '1'}
              onChange={(e) => setWeights({ ...weights, [t.key]: e.target.value })}
              aria-label={`Weight for ${t.label}`}
            />
          </label>
        ))}
      </fieldset>
      {isFetching ? <Spinner label="Ranking…" /> : null}
      {error ? <ErrorPanel error={error} title="The ranking could not be computed" /> : null}
      {data ? (
        <>
          {data.warnings.length > 0 ? (
            <ul className="mt-2 list-disc pl-5 text-sm text-loam-700">
              {data.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          ) : null}
          <ScrollRegion label="Weighted index" className="mt-2 rounded-lg bg-white shadow-sm">
            <DataTable
              showCaption
              className="min-w-[40rem]"
              caption="Weighted index and each trait’s contribution (z-score units)"
              data={data.entries}
              rowId={(e) => e.entry}
              rowHeader="entry"
              columns={[
                rankCol.accessor('indexRank', { header: 'Rank', meta: { align: 'right' } }),
                rankCol.accessor('entry', {
                  header: 'Entry',
                  cell: ({ row: { original: e } }) => (
                    <>
                      <span className="mr-1 font-mono text-xs text-loam-700">{e.entryCode}</span>
                      {e.entry}
                    </>
                  ),
                }),
                rankCol.accessor('index', {
                  header: 'Index',
                  cell: (c) => displayNumber(c.getValue(), 2),
                  meta: { align: 'right', cellClassName: () => 'font-semibold' },
                }),
                rankCol.accessor('rankSumRank', {
                  header: 'Rank-sum rank',
                  cell: ({ row: { original: e } }) => (
                    <>
                      {e.rankSumRank} <span className="text-xs text-loam-700">({e.rankSum})</span>
                    </>
                  ),
                  meta: { align: 'right' },
                }),
                ...data.traits.map((t) =>
                  rankCol.accessor(
                    (e) => e.contributions.find((c) => c.trait === t.key)?.contribution,
                    {
                      id: `trait-${t.key}`,
                      header: () => (
                        <>
                          {labelOf[t.key] ?? t.key}
                          <span className="block text-xs font-normal text-loam-700">
                            weight {t.weight}; variety p {formatP(t.varietyP)}
                          </span>
                        </>
                      ),
                      // z-scale figures: 2 decimals (common/precision.ts), no "-0.00"
                      cell: (c) =>
                        c.getValue() === undefined
                          ? '—'
                          : displayNumber(c.getValue()!, 2).replace(/^(?!-)/, '+'),
                      meta: { align: 'right' },
                    },
                  ),
                ),
              ]}
            />
          </ScrollRegion>
        </>
      ) : null}
    </section>
  );
}
