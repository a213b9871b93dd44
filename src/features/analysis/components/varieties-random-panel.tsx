import {
  HERITABILITY_NOTE,
  type TrialAnalysis,
  varietiesRandomSourceLabels,
} from '@common/contracts/analysis';
import { type DisplayUnit, formatNumber } from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';
import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { rankColumn } from './rank-column';
import { type TrialAnalysisParams, useTrialAnalysis } from '../api/get-trial-analysis';

type Random = NonNullable<TrialAnalysis['varietiesRandom']>;
type Blup = Random['blups'][number];
type Component = Random['varianceComponents'][number];
const blupCol = createColumnHelper<Blup>();
const componentCol = createColumnHelper<Component>();

/**
 * The mixed model with varieties random, fitted on request (a second REML fit): how much of the
 * differences between entries would repeat (heritability), and each entry's BLUP, which pulls
 * entries seen in few plots towards the overall mean.
 */
export function VarietiesRandomPanel({
  slug,
  query,
  unit,
}: {
  slug: string;
  query: TrialAnalysisParams;
  unit: DisplayUnit;
}) {
  const id = useId();
  const [asked, setAsked] = useState(false);
  const analysis = useTrialAnalysis(slug, {
    ...query,
    trait: asked ? query.trait : '',
    varietiesRandom: true,
  });
  const random = asked ? analysis.data?.varietiesRandom : undefined;
  const f2 = unit.factor * unit.factor;
  return (
    <section aria-labelledby={`${id}-h`} className="mt-4 rounded-lg bg-white p-3 text-sm shadow-sm">
      <h3 id={`${id}-h`} className="text-lg font-semibold text-leaf-900">
        Varieties as random: heritability
      </h3>
      {!asked ? (
        <>
          <p className="mt-1 max-w-prose">
            Fits the same model once more with the entries as a random sample of varieties, to say
            how repeatable the differences between them are.
          </p>
          <Button type="button" variant="secondary" className="mt-2" onClick={() => setAsked(true)}>
            Estimate heritability
          </Button>
        </>
      ) : null}
      {asked && analysis.isFetching ? <Spinner label="Fitting varieties as random…" /> : null}
      {asked && analysis.error ? (
        <ErrorPanel error={analysis.error} title="Heritability could not be estimated" />
      ) : null}
      {asked && analysis.data && !analysis.isFetching && !random ? (
        <p className="mt-1">Not estimated: {analysis.data.warnings.join('; ')}</p>
      ) : null}
      {random ? (
        <>
          <p className="mt-2 text-base">
            Heritability (entry means):{' '}
            <strong data-heritability={random.heritability}>
              {formatNumber(random.heritability, 2)}
            </strong>
          </p>
          <p className="mt-1 max-w-prose text-xs text-loam-700">{HERITABILITY_NOTE}</p>
          <p className="mt-1">{random.summary}</p>
          <ScrollRegion label="Sources of variation with varieties random" className="mt-2">
            <DataTable
              caption={`Sources of variation with varieties random (REML, (${unit.label})²)`}
              data={random.varianceComponents}
              rowId={(c) => c.source}
              rowHeader="source"
              columns={[
                componentCol.accessor((c) => varietiesRandomSourceLabels[c.source], {
                  id: 'source',
                  header: 'Source',
                }),
                componentCol.accessor('variance', {
                  header: `Variance (${unit.label})²`,
                  cell: (c) =>
                    `${formatNumber(c.getValue() * f2)}${c.row.original.se === null ? '' : ` ± ${formatNumber(c.row.original.se * f2, 3)}`}`,
                }),
              ]}
            />
          </ScrollRegion>
          <ScrollRegion label="Predicted entry means (BLUPs)" className="mt-2">
            <DataTable
              caption={`Predicted entry means with varieties random (${unit.label})`}
              data={random.blups}
              rowId={(b) => b.variety}
              rowHeader="variety"
              columns={[
                rankColumn(blupCol),
                blupCol.accessor('variety', { header: 'Entry' }),
                blupCol.accessor('predicted', {
                  header: `Predicted mean (${unit.label})`,
                  cell: (c) => formatNumber(c.getValue() * unit.factor),
                }),
                blupCol.accessor('blup', {
                  header: `BLUP (${unit.label})`,
                  cell: (c) => formatNumber(c.getValue() * unit.factor),
                }),
              ]}
            />
          </ScrollRegion>
          <p className="mt-1 text-xs text-loam-700">
            Predicted mean = overall mean + BLUP. Ranks and letters above stay with the entries as
            fixed (their own estimates); these predictions pull entries with few plots towards the
            overall mean.
          </p>
        </>
      ) : null}
    </section>
  );
}
