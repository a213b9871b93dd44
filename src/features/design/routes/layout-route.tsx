import { type Design, layoutForm, MAX_LAYOUT_SEED } from '@common/contracts/design';
import { isFertilizerFactor } from '@common/cautions';
import {
  designLabels,
  factorArrangementLabels,
  factorArrangements,
  isIncompleteDesign,
} from '@common/contracts/trials';
import { gardensPerReplicate } from '@common/layout';
import { DataTable } from '@/components/ui/data-table';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { CautionNote } from '@/components/ui/caution-note';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUnitSystem } from '@/lib/session';
import { useClearLayout, useGenerateLayout } from '../api/layout';
import { DesignPage } from '../components/design-page';
import { firstSiteWithPlots, SitePicker } from '../components/site-picker';
import { planColumns } from '../components/plan-columns';
import { lengthInput, rowLengthUnit, spacingUnit } from '../components/units';

/** Which button sent the form: "Re-randomize" asks for a fresh seed. */
const wantsFreshSeed = (e: React.BaseSyntheticEvent | undefined) =>
  ((e?.nativeEvent as SubmitEvent | undefined)?.submitter as HTMLButtonElement | null)?.value ===
  'fresh';

function LayoutForm({ design, slug }: { design: Design; slug: string }) {
  const system = useUnitSystem();
  const generate = useGenerateLayout(slug);
  const clear = useClearLayout(slug);
  const { locked, lockedReason } = design.layout;
  const hasPlots = design.plots.length > 0;
  const lengthUnit = rowLengthUnit(system);
  const spaceUnit = spacingUnit(system);
  const unspaced = design.entries.filter((e) => e.inRowSpacingMm == null);
  const form = useContractForm(layoutForm({ rowLength: lengthUnit, spacing: spaceUnit }), {
    replicates: String(design.layout.replicates ?? 3),
    rowsPerPlot: String(design.layout.rowsPerPlot),
    rowLengthMm: lengthInput(design.layout.rowLengthMm, lengthUnit),
    rowSpacingMm: lengthInput(design.layout.rowSpacingMm, spaceUnit),
    inRowSpacingMm: lengthInput(design.layout.inRowSpacingMm, spaceUnit),
    seed: design.layout.seed?.toString() ?? '',
    factorName: design.factor?.name ?? '',
    factorLevels: design.factor?.levels.join('\n') ?? '',
    factorArrangement: design.factor?.arrangement ?? 'factorial',
    blockSize: design.layout.blockSize?.toString() ?? '',
  });
  const [factorName, factorLevels] = form.watch(['factorName', 'factorLevels']);
  const fertilizer = isFertilizerFactor({
    name: factorName ?? '',
    levels: String(factorLevels ?? '').split(/[\n,]/),
  });
  const network = design.design === 'network';
  const incomplete = isIncompleteDesign(design.design);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async ({ seed, ...body }, e) => {
    const fresh = wantsFreshSeed(e);
    const r = await generate.mutateAsync(fresh || seed === undefined ? body : { ...body, seed });
    form.setValue('seed', String(r.seed));
  });
  const refusal = formRefusal(form);

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Layout"
      className="space-y-3 rounded-xl bg-white p-4 shadow-sm"
    >
      <p className="text-sm text-loam-700">
        {designLabels[design.design]} · {design.entries.length} entries · {design.sites.length}{' '}
        {design.sites.length === 1 ? 'site' : 'sites'}
        {design.factor
          ? ` · ${design.factor.name} (${design.factor.levels.join(', ')}), ${design.factor.arrangement === 'split_plot' ? 'split plot' : 'factorial'}`
          : ''}
      </p>
      <fieldset disabled={!design.canEdit || locked} className="space-y-3">
        <div className="grid gap-3 sm:grid-cols-2">
          {network ? null : (
            <TextField
              label={
                design.design === 'crd'
                  ? 'Plots per entry (replicates)'
                  : incomplete
                    ? 'Replicates'
                    : 'Blocks (replicates)'
              }
              inputMode="numeric"
              hint={incomplete ? 'Each replicate holds every entry once.' : undefined}
              error={errors.replicates?.message}
              {...form.register('replicates')}
            />
          )}
          {incomplete ? (
            <TextField
              label={network ? 'Entries each garden grows' : 'Entries per block'}
              inputMode="numeric"
              hint={
                network
                  ? `Each garden (site) is one block. ${gardensNeeded(design, Number(form.watch('blockSize')))}`
                  : `From 2 to ${Math.max(2, design.entries.length - 1)}; blocks of that size or one fewer.`
              }
              error={errors.blockSize?.message}
              {...form.register('blockSize')}
            />
          ) : null}
          <TextField
            label="Rows per plot"
            inputMode="numeric"
            error={errors.rowsPerPlot?.message}
            {...form.register('rowsPerPlot')}
          />
          <TextField
            label="Row length"
            inputMode="decimal"
            suffix={lengthUnit}
            error={errors.rowLengthMm?.message}
            {...form.register('rowLengthMm')}
          />
          <TextField
            label="Between-row spacing"
            inputMode="decimal"
            suffix={spaceUnit}
            error={errors.rowSpacingMm?.message}
            {...form.register('rowSpacingMm')}
          />
          <TextField
            label="In-row spacing for entries without their own"
            inputMode="decimal"
            suffix={spaceUnit}
            hint={
              unspaced.length
                ? `Needed for ${unspaced.map((e) => e.code).join(', ')}.`
                : 'Every entry has its own spacing.'
            }
            error={errors.inRowSpacingMm?.message}
            {...form.register('inRowSpacingMm')}
          />
          <TextField
            label="Seed"
            inputMode="numeric"
            hint={`The same seed with the same entries and sites gives the same plan. Leave blank for a new one (0 to ${MAX_LAYOUT_SEED}).`}
            error={errors.seed?.message}
            {...form.register('seed')}
          />
        </div>
        {design.design === 'crd' || incomplete ? null : (
          <fieldset className="space-y-3 rounded-lg border border-leaf-100 p-3">
            <legend className="px-1 font-semibold text-leaf-900">Second factor (optional)</legend>
            <p className="text-sm text-loam-700">
              A treatment compared across the varieties, such as fertilizer or irrigation. Leave the
              name and levels blank for a variety trial alone.
            </p>
            <TextField
              label="Treatment"
              hint="What is varied, e.g. Fertilizer."
              error={errors.factorName?.message}
              {...form.register('factorName')}
            />
            <TextArea
              label="Levels, one per line"
              hint="2 to 6 levels, e.g. none and pre-plant."
              error={errors.factorLevels?.message}
              {...form.register('factorLevels')}
            />
            <SelectField
              label="Arrangement"
              options={factorArrangements.map((a) => [a, factorArrangementLabels[a]] as const)}
              error={errors.factorArrangement?.message}
              {...form.register('factorArrangement')}
            />
            {fertilizer ? <CautionNote id="fertilizer-handling" /> : null}
          </fieldset>
        )}
        {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
        <div className="flex flex-wrap gap-2">
          <Button type="submit" value="seed" disabled={isSubmitting}>
            {isSubmitting
              ? 'Laying out plots…'
              : hasPlots
                ? 'Generate with this seed'
                : 'Generate layout'}
          </Button>
          {hasPlots ? (
            <Button type="submit" value="fresh" variant="secondary" disabled={isSubmitting}>
              Re-randomize (new seed)
            </Button>
          ) : null}
          {hasPlots ? (
            <Button
              type="button"
              variant="ghost"
              disabled={clear.isPending}
              onClick={() => {
                if (window.confirm('Clear the layout? Every plot of the plan is removed.'))
                  clear.mutate();
              }}
            >
              Clear layout
            </Button>
          ) : null}
        </div>
        {clear.error ? <FormMessage tone="error">{clear.error.message}</FormMessage> : null}
      </fieldset>
      {locked ? (
        <p role="note" className="rounded-lg bg-straw-100 p-3 text-sm">
          {lockedReason}
        </p>
      ) : null}
      {isSubmitting ? (
        <div
          role="progressbar"
          aria-label="Laying out plots"
          className="h-1 animate-pulse rounded bg-pod-500"
        />
      ) : null}
    </form>
  );
}

/** How many gardens a network needs for its block size, once the lead has typed one. */
function gardensNeeded(design: Design, k: number) {
  const v = design.entries.length;
  if (!k || k < 2 || k >= v)
    return 'Every set of gardens that grows every entry once is a replicate.';
  const perReplicate = gardensPerReplicate(v, k);
  return `${perReplicate} gardens grow every entry once; the trial has ${design.sites.length}.`;
}

/** What an incomplete-block plan gives: replicates, block sizes and how evenly entries meet. */
function BlockBalance({ design }: { design: Design }) {
  const b = design.layout.blocks;
  if (!b) return null;
  const network = design.design === 'network';
  const blockWord = network ? 'gardens' : 'blocks';
  const sizes =
    b.smallestBlock === b.largestBlock
      ? `${b.largestBlock} entries each`
      : `${b.smallestBlock} or ${b.largestBlock} entries each`;
  const replication =
    b.replicationMin === b.replicationMax
      ? `every entry on ${b.replicationMin} plots`
      : `entries on ${b.replicationMin} to ${b.replicationMax} plots`;
  const extra = b.blocks - b.fullReplicates * Math.ceil(design.entries.length / b.largestBlock);
  return (
    <section aria-labelledby="balance-heading" className="rounded-lg bg-white p-4 shadow-sm">
      <h2 id="balance-heading" className="text-lg font-semibold text-leaf-900">
        How evenly entries meet
      </h2>
      <dl className="mt-2 grid grid-cols-2 gap-2 text-sm sm:grid-cols-4">
        <div>
          <dt className="text-xs uppercase tracking-wide text-loam-700">Pair concurrence</dt>
          <dd className="font-display text-lg font-semibold text-leaf-900">
            {b.concurrenceMin === b.concurrenceMax
              ? `${b.concurrenceMin} (every pair)`
              : `${b.concurrenceMin} to ${b.concurrenceMax}`}
          </dd>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wide text-loam-700">
            {network ? 'Gardens' : 'Blocks'}
          </dt>
          <dd className="font-display text-lg font-semibold text-leaf-900">{b.blocks}</dd>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wide text-loam-700">Full replicates</dt>
          <dd className="font-display text-lg font-semibold text-leaf-900">{b.fullReplicates}</dd>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wide text-loam-700">Efficiency factor</dt>
          <dd className="font-display text-lg font-semibold text-leaf-900">
            {b.efficiency === null ? '—' : b.efficiency.toFixed(3)}
          </dd>
        </div>
      </dl>
      <p className="mt-2 text-sm">
        {b.blocks} {blockWord} of {sizes}, {replication}
        {extra > 0 ? `; ${extra} ${blockWord} beyond the last full replicate` : ''}. Any two entries
        share a {network ? 'garden' : 'block'}{' '}
        {b.concurrenceMin === b.concurrenceMax
          ? `exactly ${b.concurrenceMin} ${b.concurrenceMin === 1 ? 'time' : 'times'}`
          : `from ${b.concurrenceMin} to ${b.concurrenceMax} times`}{' '}
        (
        {b.concurrenceCounts
          .map((n, c) => (n > 0 ? `${n} ${n === 1 ? 'pair' : 'pairs'} ${c}×` : null))
          .filter(Boolean)
          .join(', ')}
        ): the closer these are, the more evenly every comparison is measured.
        {b.efficiency === null
          ? ' The efficiency factor needs every entry equally often.'
          : ' The efficiency factor is the share of information the blocks leave for comparing entries (1 for complete blocks).'}
      </p>
    </section>
  );
}

function PlotPlan({ design, slug }: { design: Design; slug: string }) {
  const system = useUnitSystem();
  const [siteId, setSiteId] = useState(firstSiteWithPlots(design));
  const plots = design.plots.filter((p) => p.siteId === siteId);
  if (design.plots.length === 0)
    return <p className="rounded-lg bg-white p-4 shadow-sm">No plots yet: generate the layout.</p>;
  const total = plots.reduce((s, p) => s + (p.plannedPlants ?? 0), 0);
  return (
    <section aria-labelledby="plan-heading" className="space-y-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="plan-heading" className="text-xl font-semibold text-leaf-900">
          Plot plan · seed {design.layout.seed ?? '(not stored)'}
        </h2>
        <SitePicker design={design} value={siteId} onChange={setSiteId} />
      </div>
      <p className="text-sm">
        {plots.length} plots here, {total} plants planned.{' '}
        <Link className="font-semibold text-leaf-700 underline" to={`/t/${slug}/map`}>
          Planting map
        </Link>{' '}
        ·{' '}
        <Link className="font-semibold text-leaf-700 underline" to={`/t/${slug}/field-sheet`}>
          Field sheet
        </Link>
      </p>
      <ScrollRegion
        label="Plots in field order"
        hint="More columns to the side: swipe or scroll sideways"
        className="rounded-lg bg-white shadow-sm"
      >
        <DataTable
          caption="Plots of the site in field order"
          className="min-w-[36rem]"
          data={plots}
          columns={planColumns(design, system)}
          rowId={(p) => p.id}
          rowHeader="plot"
        />
      </ScrollRegion>
      <p className="text-xs text-loam-700">
        Plants planned per plot = rows × whole in-row spacings that fit in the row length.
      </p>
    </section>
  );
}

export function Component() {
  return (
    <DesignPage title="Layout">
      {(design, slug) => (
        <div className="grid gap-4 lg:grid-cols-[minmax(0,26rem)_1fr]">
          <LayoutForm
            key={`${design.id}-${design.layout.generatedAt}`}
            design={design}
            slug={slug}
          />
          <div className="min-w-0 space-y-4">
            <BlockBalance design={design} />
            <PlotPlan key={design.layout.generatedAt ?? 'none'} design={design} slug={slug} />
          </div>
        </div>
      )}
    </DesignPage>
  );
}
