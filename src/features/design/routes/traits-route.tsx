import { customTraitForm, type Design } from '@common/contracts/design';
import { quantityKinds, traitBases, traitDirections } from '@common/contracts/trials';
import { describeRange } from '@common/plausibility';
import { presetByKey, traitPresets } from '@common/trait-presets';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { CautionNote } from '@/components/ui/caution-note';
import { FormMessage, SelectField, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUnitSystem } from '@/lib/session';
import { useCreatePart, useDeletePart } from '../api/design-parts';
import { DesignPage } from '../components/design-page';
import { basisLabels, directionLabels, TraitEditForm } from '../components/trait-edit-form';

const kindLabels: Record<(typeof quantityKinds)[number], string> = {
  mass: 'Mass',
  length: 'Length',
  count: 'Count',
  score: 'Score on a scale',
  date: 'Date',
  percent: 'Percent',
};

function CustomTraitForm({ slug }: { slug: string }) {
  const create = useCreatePart(slug, 'traits');
  const blank = {
    label: '',
    key: '',
    quantityKind: 'count',
    basis: 'plot',
    direction: 'higher',
    scaleMin: '1',
    scaleMax: '5',
  } as const;
  const form = useContractForm(customTraitForm, blank);
  const { errors, isSubmitting } = form.formState;
  const kind = form.watch('quantityKind');
  const onSubmit = submitTo(form, async (body) => {
    await create.mutateAsync(body);
    form.reset(blank);
  });
  const refusal = formRefusal(form);
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Add a custom trait"
      className="space-y-3 rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 className="text-xl font-semibold text-leaf-900">Add a custom trait</h2>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Trait name" error={errors.label?.message} {...form.register('label')} />
        <TextField
          label="Key (optional)"
          hint="Short name in exported files; made from the name when blank."
          error={errors.key?.message}
          {...form.register('key')}
        />
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField
          label="What is recorded"
          error={errors.quantityKind?.message}
          options={quantityKinds.map((k) => [k, kindLabels[k]] as const)}
          {...form.register('quantityKind')}
        />
        <SelectField
          label="Basis"
          error={errors.basis?.message}
          options={traitBases.map((b) => [b, basisLabels[b]] as const)}
          {...form.register('basis')}
        />
        <SelectField
          label="Direction"
          error={errors.direction?.message}
          options={traitDirections.map((d) => [d, directionLabels[d]] as const)}
          {...form.register('direction')}
        />
      </div>
      {kind === 'score' ? (
        <div className="grid grid-cols-2 gap-3">
          <TextField
            label="Scale from"
            inputMode="numeric"
            error={errors.scaleMin?.message}
            {...form.register('scaleMin')}
          />
          <TextField
            label="Scale to"
            inputMode="numeric"
            error={errors.scaleMax?.message}
            {...form.register('scaleMax')}
          />
        </div>
      ) : null}
      {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
      <Button type="submit" disabled={isSubmitting}>
        Add trait
      </Button>
    </form>
  );
}

function Traits({ design, slug }: { design: Design; slug: string }) {
  const create = useCreatePart(slug, 'traits');
  const remove = useDeletePart(slug, 'traits');
  const units = useUnitSystem();
  const [editingId, setEditingId] = useState<string | null>(null);
  const have = new Set(design.traits.map((t) => t.key));
  const missing = traitPresets.filter((p) => !have.has(p.key));
  const cautionIds = [
    ...new Set(design.traits.map((t) => presetByKey(t.key)?.caution).filter(Boolean)),
  ];
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <section aria-labelledby="trait-list">
        <h2 id="trait-list" className="text-xl font-semibold text-leaf-900">
          Traits recorded in this trial
        </h2>
        {design.traits.length === 0 ? (
          <p className="mt-2">No traits yet: add presets or your own.</p>
        ) : null}
        <ul className="mt-2 space-y-2">
          {design.traits.map((t) => (
            <li key={t.id} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold">{t.label}</p>
              <p className="text-sm text-loam-700">
                {kindLabels[t.quantityKind]}
                {t.quantityKind === 'score' ? ` ${t.scaleMin}–${t.scaleMax}` : ''} ·{' '}
                {basisLabels[t.basis]} · {directionLabels[t.direction]}
                {t.observationCount ? ` · ${t.observationCount} measurements` : ''}
              </p>
              {t.plausibleMin !== null || t.plausibleMax !== null ? (
                <p className="text-sm text-loam-700">
                  Plausible:{' '}
                  {describeRange(
                    { min: t.plausibleMin, max: t.plausibleMax },
                    t.quantityKind,
                    units,
                    t.displayUnit,
                  )}
                  {t.basis === 'harvest' && t.quantityKind === 'mass' ? ' per fruit' : ''}
                </p>
              ) : null}
              {presetByKey(t.key)?.hint ? (
                <p className="mt-1 text-sm">{presetByKey(t.key)!.hint}</p>
              ) : null}
              {design.canEdit ? (
                <div className="mt-1 flex flex-wrap gap-2">
                  <Button
                    variant="secondary"
                    aria-label={`Edit ${t.label}`}
                    aria-expanded={editingId === t.id}
                    onClick={() => setEditingId(editingId === t.id ? null : t.id)}
                  >
                    Edit
                  </Button>
                  <Button
                    variant="ghost"
                    aria-label={`Remove ${t.label}`}
                    disabled={t.observationCount > 0 || remove.isPending}
                    title={t.observationCount > 0 ? 'Measurements use this trait' : undefined}
                    onClick={() => remove.mutate(t.id)}
                  >
                    Remove
                  </Button>
                </div>
              ) : null}
              {design.canEdit && editingId === t.id ? (
                <TraitEditForm
                  slug={slug}
                  trait={t}
                  units={units}
                  onClose={() => setEditingId(null)}
                />
              ) : null}
            </li>
          ))}
        </ul>
        {remove.error ? <FormMessage tone="error">{remove.error.message}</FormMessage> : null}
        {cautionIds.map((id) => (
          <CautionNote key={id} id={id!} className="mt-3" />
        ))}
      </section>
      {design.canEdit ? (
        <div className="space-y-4">
          <section aria-labelledby="presets" className="rounded-xl bg-white p-4 shadow-sm">
            <h2 id="presets" className="text-xl font-semibold text-leaf-900">
              Presets
            </h2>
            {missing.length === 0 ? <p className="mt-2">Every preset is in the trial.</p> : null}
            <ul className="mt-2 flex flex-wrap gap-2">
              {missing.map((p) => (
                <li key={p.key}>
                  <Button
                    variant="secondary"
                    disabled={create.isPending}
                    onClick={() => create.mutate(p)}
                    aria-label={`Add ${p.label}`}
                  >
                    + {p.label}
                  </Button>
                </li>
              ))}
            </ul>
            {create.error ? <FormMessage tone="error">{create.error.message}</FormMessage> : null}
          </section>
          <CustomTraitForm slug={slug} />
        </div>
      ) : null}
    </div>
  );
}

export function Component() {
  return (
    <DesignPage title="Traits">
      {(design, slug) => <Traits design={design} slug={slug} />}
    </DesignPage>
  );
}
