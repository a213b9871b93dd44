import { type Design, type DesignEntry, type EntryBody } from '@common/contracts/design';
import { entryTypes } from '@common/contracts/trials';
import { formatLength, toStored } from '@common/units';
import { useState } from 'react';
import { useUnitSystem } from '@/lib/session';
import { useDeletePart, useSavePart } from '../api/design-parts';
import { DesignPage } from '../components/design-page';
import {
  fieldErrors,
  FormError,
  numberOrNull,
  SelectField,
  TextArea,
  TextField,
} from '../components/form-fields';
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
  const { mutation, save } = useSavePart(slug, 'entries', editing?.id ?? null);
  const errors = fieldErrors(mutation.error);

  function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    const spacing = numberOrNull(f.get('spacing'));
    const body: EntryBody = {
      code: String(f.get('code') ?? ''),
      name: String(f.get('name') ?? ''),
      seedSource: String(f.get('seedSource') ?? ''),
      seedLot: String(f.get('seedLot') ?? ''),
      entryType: String(f.get('entryType')) as EntryBody['entryType'],
      daysToMaturityClaimed: numberOrNull(f.get('days')),
      inRowSpacingMm: spacing === null ? null : toStored(spacing, unit),
      noFertilizer: f.get('noFertilizer') === 'on',
      notes: String(f.get('notes') ?? ''),
    };
    save(body, () => {
      form.reset();
      onDone();
    });
  }

  return (
    <PartForm
      editingId={editing?.id ?? null}
      title={editing ? `Edit ${editing.name}` : 'Add an entry'}
      onSubmit={onSubmit}
    >
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField
          label="Code"
          name="code"
          defaultValue={editing?.code}
          maxLength={6}
          hint="1–6 letters or digits, shown on the map"
          error={errors.code}
        />
        <TextField
          label="Variety name"
          name="name"
          defaultValue={editing?.name}
          className="sm:col-span-2"
          error={errors.name}
        />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          label="Seed source"
          name="seedSource"
          defaultValue={editing?.seedSource}
          error={errors.seedSource}
        />
        <TextField
          label="Seed lot"
          name="seedLot"
          defaultValue={editing?.seedLot}
          error={errors.seedLot}
        />
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField
          label="Type"
          name="entryType"
          defaultValue={editing?.entryType ?? 'heirloom'}
          error={errors.entryType}
          options={entryTypes.map((t) => [t, entryTypeLabels[t]] as const)}
        />
        <TextField
          label="Days to maturity (seed source’s claim)"
          name="days"
          type="number"
          inputMode="numeric"
          min={1}
          max={400}
          suffix="days"
          defaultValue={editing?.daysToMaturityClaimed ?? ''}
          error={errors.daysToMaturityClaimed}
        />
        <TextField
          label="In-row spacing"
          name="spacing"
          type="number"
          inputMode="decimal"
          step="any"
          min={0}
          suffix={unit}
          hint="Between plants in the row; a bushy dwarf may need three times a pruned tall one."
          defaultValue={lengthInput(editing?.inRowSpacingMm, unit)}
          error={errors.inRowSpacingMm}
        />
      </div>
      {design.fertilizerPolicy === 'per_entry' ? (
        <label className="flex min-h-11 items-center gap-2">
          <input
            type="checkbox"
            name="noFertilizer"
            defaultChecked={editing?.noFertilizer}
            className="h-5 w-5"
          />
          No fertilizer for this entry
        </label>
      ) : null}
      <TextArea label="Notes" name="notes" defaultValue={editing?.notes} error={errors.notes} />
      <PartFormActions
        mutation={mutation}
        errors={errors}
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
                {e.name}
              </p>
              <p className="text-sm text-loam-700">
                {entryTypeLabels[e.entryType]}
                {e.seedSource ? ` · ${e.seedSource}` : ''}
                {e.seedLot ? ` · lot ${e.seedLot}` : ''}
                {e.daysToMaturityClaimed ? ` · ${e.daysToMaturityClaimed} days claimed` : ''}
                {' · '}
                {e.inRowSpacingMm
                  ? `${formatLength(e.inRowSpacingMm, system)} apart`
                  : 'spacing not set'}
                {e.noFertilizer && design.fertilizerPolicy === 'per_entry'
                  ? ' · no fertilizer'
                  : ''}
              </p>
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
        <FormError error={remove.error} />
      </section>
      {design.canEdit && (editing || !layoutExists) ? (
        <EntryForm
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
