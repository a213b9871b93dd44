import { type Design, type DesignEntry, type EntryBody } from '@common/contracts/design';
import { entryTypes } from '@common/contracts/trials';
import { formatLength, toStored } from '@common/units';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { useUnitSystem } from '@/lib/session';
import { useCreatePart, useDeletePart, useUpdatePart } from '../api/design-parts';
import { DesignPage } from '../components/design-page';
import {
  fieldErrors,
  FormError,
  numberOrNull,
  SelectField,
  TextArea,
  TextField,
} from '../components/form-fields';
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
  const create = useCreatePart(slug, 'entries');
  const update = useUpdatePart(slug, 'entries');
  const mutation = editing ? update : create;
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
    const done = () => {
      form.reset();
      onDone();
    };
    if (editing) update.mutate({ id: editing.id, body }, { onSuccess: done });
    else create.mutate(body, { onSuccess: done });
  }

  return (
    <form
      key={editing?.id ?? 'new'}
      onSubmit={onSubmit}
      noValidate
      aria-label={editing ? `Edit ${editing.name}` : 'Add an entry'}
      className="space-y-3 rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 className="text-xl font-semibold text-leaf-900">
        {editing ? `Edit ${editing.name}` : 'Add an entry'}
      </h2>
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
      <FormError error={Object.keys(errors).length ? null : mutation.error} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={mutation.isPending}>
          {mutation.isPending ? 'Saving…' : editing ? 'Save entry' : 'Add entry'}
        </Button>
        {editing ? (
          <Button type="button" variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
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
                <div className="mt-2 flex gap-2">
                  <Button
                    variant="secondary"
                    onClick={() => setEditingId(e.id)}
                    aria-label={`Edit ${e.name}`}
                  >
                    Edit
                  </Button>
                  <Button
                    variant="ghost"
                    disabled={layoutExists || remove.isPending}
                    title={layoutExists ? 'Clear the layout first' : undefined}
                    aria-label={`Remove ${e.name}`}
                    onClick={() => {
                      if (window.confirm(`Remove ${e.name} from the trial?`)) remove.mutate(e.id);
                    }}
                  >
                    Remove
                  </Button>
                </div>
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
