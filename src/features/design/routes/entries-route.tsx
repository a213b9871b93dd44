import { type Design, type DesignEntry, entryForm } from '@common/contracts/design';
import { entryTypes } from '@common/contracts/trials';
import { formatSpacing } from '@common/display-units';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUnitSystem } from '@/lib/session';
import { useDeletePart, useSavePart } from '../api/design-parts';
import { useEntryLots } from '../api/entry-lots';
import { DesignPage } from '../components/design-page';
import { EntryLot } from '../components/entry-lot';
import { PartActions, PartForm, PartFormActions } from '../components/part-editing';
import { lengthInput, spacingUnit } from '../components/units';

const entryTypeLabels = {
  heirloom: 'Heirloom',
  open_pollinated: 'Open-pollinated',
  hybrid: 'Hybrid',
} as const;

function EntryForm({
  slug,
  design,
  editing,
  onDone,
}: {
  slug: string;
  design: Design;
  editing: DesignEntry | null;
  onDone: () => void;
}) {
  const system = useUnitSystem();
  const unit = spacingUnit(system);
  const save = useSavePart(slug, 'entries', editing?.id ?? null);
  const blank = {
    code: editing?.code ?? '',
    name: editing?.name ?? '',
    seedSource: editing?.seedSource ?? '',
    seedLot: editing?.seedLot ?? '',
    entryType: editing?.entryType ?? 'heirloom',
    daysToMaturityClaimed: editing?.daysToMaturityClaimed?.toString() ?? '',
    inRowSpacingMm: lengthInput(editing?.inRowSpacingMm, unit),
    noFertilizer: editing?.noFertilizer ?? false,
    notes: editing?.notes ?? '',
    varietyId: editing?.variety?.id ?? '',
  };
  const form = useContractForm(entryForm(unit), blank);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    await save(body);
    form.reset(blank);
    onDone();
  });

  return (
    <PartForm
      editingId={editing?.id ?? null}
      title={editing ? `Edit ${editing.name}` : 'Add an entry'}
      onSubmit={onSubmit}
    >
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField
          label="Code"
          maxLength={6}
          hint="1–6 letters or digits, shown on the map"
          error={errors.code?.message}
          {...form.register('code')}
        />
        <TextField
          label="Variety name"
          className="sm:col-span-2"
          error={errors.name?.message}
          {...form.register('name')}
        />
      </div>
      <SelectField
        label="Register variety"
        hint="The variety this entry grows, followed across trials. Left as new, the register gains a variety of the entry’s name (or links the one it already has)."
        error={errors.varietyId?.message}
        options={[
          ['', 'New in the register, named as the entry'] as const,
          ...design.register.map((v) => [v.id, v.name] as const),
        ]}
        {...form.register('varietyId', {
          onChange: (e: { target: { value: string } }) => {
            const picked = design.register.find((v) => v.id === e.target.value);
            if (picked && !form.getValues('name')) form.setValue('name', picked.name);
          },
        })}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          label="Seed source"
          error={errors.seedSource?.message}
          {...form.register('seedSource')}
        />
        <TextField label="Seed lot" error={errors.seedLot?.message} {...form.register('seedLot')} />
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField
          label="Type"
          error={errors.entryType?.message}
          options={entryTypes.map((t) => [t, entryTypeLabels[t]] as const)}
          {...form.register('entryType')}
        />
        <TextField
          label="Days to maturity (seed source’s claim)"
          inputMode="numeric"
          suffix="days"
          error={errors.daysToMaturityClaimed?.message}
          {...form.register('daysToMaturityClaimed')}
        />
        <TextField
          label="In-row spacing"
          inputMode="decimal"
          suffix={unit}
          hint="Between plants in the row; a bushy dwarf may need three times a pruned tall one."
          error={errors.inRowSpacingMm?.message}
          {...form.register('inRowSpacingMm')}
        />
      </div>
      {design.fertilizerPolicy === 'per_entry' ? (
        <label className="flex min-h-11 items-center gap-2">
          <input type="checkbox" className="h-5 w-5" {...form.register('noFertilizer')} />
          No fertilizer for this entry
        </label>
      ) : null}
      <TextArea label="Notes" error={errors.notes?.message} {...form.register('notes')} />
      <PartFormActions
        refusal={formRefusal(form)}
        pending={isSubmitting}
        submitLabel={editing ? 'Save entry' : 'Add entry'}
        onCancel={editing ? onDone : undefined}
      />
    </PartForm>
  );
}

function Entries({ design, slug }: { design: Design; slug: string }) {
  const system = useUnitSystem();
  const [editingId, setEditingId] = useState<string | null>(null);
  const remove = useDeletePart(slug, 'entries');
  const editing = design.entries.find((e) => e.id === editingId) ?? null;
  const layoutExists = design.plots.length > 0;
  const { data: entryLots } = useEntryLots(slug);
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <section aria-labelledby="entry-list">
        <h2 id="entry-list" className="text-xl font-semibold text-leaf-900">
          {design.entries.length} {design.entries.length === 1 ? 'entry' : 'entries'}
        </h2>
        {layoutExists ? (
          <p className="mt-1 text-sm text-loam-700">
            The layout has plots: entries can be edited, but adding or removing one needs the layout
            cleared first (Layout page).
          </p>
        ) : null}
        <ul className="mt-2 space-y-2">
          {design.entries.map((e) => (
            <li key={e.id} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold">
                <span className="mr-2 rounded bg-leaf-100 px-1.5 font-mono">{e.code}</span>
                {e.variety ? (
                  <Link
                    to={`/varieties/${e.variety.slug}`}
                    className="text-leaf-800 underline decoration-leaf-300 underline-offset-2 hover:decoration-leaf-700"
                  >
                    {e.name}
                  </Link>
                ) : (
                  e.name
                )}
              </p>
              <p className="text-sm text-loam-700">
                {entryTypeLabels[e.entryType]}
                {e.seedSource ? ` · ${e.seedSource}` : ''}
                {e.seedLot ? ` · lot ${e.seedLot}` : ''}
                {e.daysToMaturityClaimed ? ` · ${e.daysToMaturityClaimed} days claimed` : ''}
                {' · '}
                {e.inRowSpacingMm
                  ? `${formatSpacing(e.inRowSpacingMm, system)} apart`
                  : 'spacing not set'}
                {e.noFertilizer && design.fertilizerPolicy === 'per_entry'
                  ? ' · no fertilizer'
                  : ''}
              </p>
              {entryLots?.entries.find((l) => l.entryId === e.id) ? (
                <EntryLot
                  slug={slug}
                  entry={entryLots.entries.find((l) => l.entryId === e.id)!}
                  canEdit={entryLots.canEdit}
                />
              ) : null}
              {design.canEdit ? (
                <PartActions
                  name={e.name}
                  onEdit={() => setEditingId(e.id)}
                  layoutExists={layoutExists}
                  removing={remove.isPending}
                  confirmMessage={`Remove ${e.name} from the trial?`}
                  onRemove={() => remove.mutate(e.id)}
                />
              ) : null}
            </li>
          ))}
        </ul>
        {remove.error ? <FormMessage tone="error">{remove.error.message}</FormMessage> : null}
      </section>
      {design.canEdit && (editing || !layoutExists) ? (
        <EntryForm
          key={editing?.id ?? 'new'}
          slug={slug}
          design={design}
          editing={editing}
          onDone={() => setEditingId(null)}
        />
      ) : null}
    </div>
  );
}

export function Component() {
  return (
    <DesignPage title="Entries">
      {(design, slug) => <Entries design={design} slug={slug} />}
    </DesignPage>
  );
}
