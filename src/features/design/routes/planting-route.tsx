import { type Design, type DesignPlot, plantingForm } from '@common/contracts/design';
import { createColumnHelper } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { FormMessage } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useRecordPlanting } from '../api/layout';
import { DesignPage } from '../components/design-page';
import { firstSiteWithPlots, SitePicker } from '../components/site-picker';

const rowOf = (p: DesignPlot) => ({
  plotId: p.id,
  plantsSet: p.plantsSet?.toString() ?? '',
  plantsSurviving: p.plantsSurviving?.toString() ?? '',
  gaps: p.gaps?.toString() ?? '',
  note: p.plantedNote,
});
const plotCol = createColumnHelper<DesignPlot>();
const countLabels = {
  plantsSet: 'Plants set',
  plantsSurviving: 'Survivors',
  gaps: 'Gaps',
} as const;

const cellInput = (invalid: boolean) =>
  `min-h-11 w-full max-w-20 rounded border bg-white px-2 sm:w-20 ${invalid ? 'border-frost-600' : 'border-leaf-300'}`;
/** On a phone each plot is a card: a cell's column name shows above it. */
const phoneLabel = (text: string) => (
  <span aria-hidden="true" className="block text-xs text-loam-700 sm:hidden">
    {text}
  </span>
);

type PlantingForm = ReturnType<typeof useContractForm<typeof plantingForm>>;

/** A plot row's problems in words (read at render time, so the columns can stay the same). */
const problemAt = (form: PlantingForm, i: number) =>
  (['plantsSet', 'plantsSurviving', 'gaps', 'note'] as const)
    .map((k) => form.formState.errors.plots?.[i]?.[k]?.message)
    .filter(Boolean)
    .join(' ');

/**
 * A row per plot in field order, each a card on a phone; the cells are the form's inputs. Made
 * once per form: a new cell renderer would remount its input (and lose the caret) on each render.
 */
function plantingColumns(form: PlantingForm, entryCode: (entryId: string) => string) {
  const rowError = (i: number) => form.formState.errors.plots?.[i];
  const count = (k: keyof typeof countLabels) =>
    plotCol.display({
      id: k,
      header: countLabels[k],
      cell: ({ row: { original: p, index: i } }) => (
        <>
          {phoneLabel(countLabels[k])}
          <input
            aria-label={`${countLabels[k]}, plot ${p.plotNumber}`}
            inputMode="numeric"
            aria-invalid={rowError(i)?.[k] ? true : undefined}
            className={cellInput(!!rowError(i)?.[k])}
            {...form.register(`plots.${i}.${k}`)}
          />
        </>
      ),
    });
  // A row per plot in field order, each a card on a phone; the cells are the form's inputs.
  return [
    plotCol.accessor('plotNumber', {
      id: 'plot',
      header: 'Plot',
      cell: (c) => (
        <>
          <span className="sm:hidden">Plot </span>
          {c.getValue()}
        </>
      ),
    }),
    plotCol.accessor((p) => entryCode(p.entryId), {
      id: 'entry',
      header: 'Entry',
      meta: { cellClassName: () => 'font-mono' },
    }),
    plotCol.accessor('plannedPlants', {
      header: 'Planned',
      cell: (c) => (
        <>
          <span className="sm:hidden">Planned </span>
          {c.getValue() ?? '—'}
        </>
      ),
    }),
    count('plantsSet'),
    count('plantsSurviving'),
    count('gaps'),
    plotCol.display({
      id: 'note',
      header: 'Note',
      cell: ({ row: { original: p, index: i } }) => {
        const problem = problemAt(form, i);
        return (
          <>
            {phoneLabel('Note')}
            <input
              aria-label={`Note, plot ${p.plotNumber}`}
              className="min-h-11 w-full rounded border border-leaf-300 bg-white px-2 sm:w-48"
              {...form.register(`plots.${i}.note`)}
            />
            {problem ? <p className="mt-1 text-frost-600">{problem}</p> : null}
          </>
        );
      },
      meta: { cellClassName: () => 'max-sm:col-span-3' },
    }),
  ];
}

/** The plots of one site, one row of counts each; saving sends this site's rows. */
function SitePlanting({
  design,
  slug,
  plots,
}: {
  design: Design;
  slug: string;
  plots: DesignPlot[];
}) {
  const save = useRecordPlanting(slug);
  const form = useContractForm(plantingForm, { plots: plots.map(rowOf) });
  const { errors, isSubmitting, isSubmitSuccessful } = form.formState;
  const columns = useMemo(() => {
    const code = new Map(design.entries.map((e) => [e.id, e.code]));
    return plantingColumns(form, (id) => code.get(id) ?? '');
  }, [form, design.entries]);
  const onSubmit = submitTo(form, (body) => save.mutateAsync(body));
  const refusal = formRefusal(form);
  const anyRowProblem = errors.plots !== undefined && plots.some((_, i) => problemAt(form, i));

  return (
    <form noValidate aria-label="What was planted" onSubmit={onSubmit} className="space-y-3">
      <div className="flex flex-wrap items-center gap-3">
        <Button
          type="button"
          variant="secondary"
          disabled={!design.canEdit}
          onClick={() =>
            plots.forEach((p, i) => {
              if (p.plannedPlants != null && form.getValues(`plots.${i}.plantsSet`) === '')
                form.setValue(`plots.${i}.plantsSet`, String(p.plannedPlants));
            })
          }
        >
          Fill plants set from the plan
        </Button>
      </div>
      <p className="text-sm text-loam-700">
        Plants set at planting, survivors after transplant shock, and gaps (empty places in the
        row).
      </p>
      <fieldset disabled={!design.canEdit}>
        <ScrollRegion label="What was planted per plot" className="rounded-lg bg-white shadow-sm">
          <DataTable
            caption="What was planted per plot"
            sortable={false}
            cardsBelow="sm"
            className="sm:min-w-[40rem]"
            data={plots}
            rowId={(p) => p.id}
            rowHeader="plot"
            rowClassName={() => 'align-top max-sm:grid max-sm:grid-cols-3 max-sm:gap-x-2'}
            columns={columns}
          />
        </ScrollRegion>
      </fieldset>
      {anyRowProblem ? (
        <FormMessage tone="error">Check the marked plots; nothing was saved.</FormMessage>
      ) : refusal ? (
        <FormMessage tone="error">{refusal}</FormMessage>
      ) : null}
      {isSubmitSuccessful && !refusal ? (
        <p role="status" className="text-leaf-700">
          Saved {plots.length} plots.
        </p>
      ) : null}
      {design.canEdit ? (
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Saving…' : 'Save what was planted'}
        </Button>
      ) : null}
    </form>
  );
}

function PlantingEditor({ design, slug }: { design: Design; slug: string }) {
  const [siteId, setSiteId] = useState(firstSiteWithPlots(design));
  if (design.plots.length === 0)
    return <p className="rounded-lg bg-white p-4 shadow-sm">No plots yet.</p>;
  return (
    <div className="space-y-3">
      <SitePicker design={design} value={siteId} onChange={setSiteId} />
      <SitePlanting
        key={siteId}
        design={design}
        slug={slug}
        plots={design.plots.filter((p) => p.siteId === siteId)}
      />
    </div>
  );
}

export function Component() {
  return (
    <DesignPage title="What was planted">
      {(design, slug) => <PlantingEditor design={design} slug={slug} />}
    </DesignPage>
  );
}
