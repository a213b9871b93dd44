import { type Design, type TraitBody } from '@common/contracts/design';
import { quantityKinds, traitBases, traitDirections } from '@common/contracts/trials';
import { presetByKey, traitPresets } from '@common/trait-presets';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { CautionNote } from '@/components/ui/caution-note';
import { useCreatePart, useDeletePart } from '../api/design-parts';
import { DesignPage } from '../components/design-page';
import {
  fieldErrors,
  FormError,
  numberOrNull,
  SelectField,
  TextField,
} from '../components/form-fields';

const kindLabels: Record<(typeof quantityKinds)[number], string> = {
  mass: 'Mass',
  length: 'Length',
  count: 'Count',
  score: 'Score on a scale',
  date: 'Date',
  percent: 'Percent',
};
const basisLabels: Record<(typeof traitBases)[number], string> = {
  plant: 'Per plant',
  plot: 'Per plot',
  harvest: 'Per harvest',
};
const directionLabels: Record<(typeof traitDirections)[number], string> = {
  higher: 'Higher is better',
  lower: 'Lower is better',
  none: 'No preference',
};

function CustomTraitForm({ slug }: { slug: string }) {
  const create = useCreatePart(slug, 'traits');
  const [kind, setKind] = useState<TraitBody['quantityKind']>('count');
  const errors = fieldErrors(create.error);
  function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    const label = String(f.get('label') ?? '');
    const key =
      String(f.get('key') ?? '').trim() ||
      label
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '_')
        .replace(/^_+|_+$/g, '')
        .replace(/^([0-9])/, 't_$1')
        .slice(0, 40);
    create.mutate(
      {
        key,
        label,
        quantityKind: kind,
        basis: String(f.get('basis')) as TraitBody['basis'],
        direction: String(f.get('direction')) as TraitBody['direction'],
        scaleMin: kind === 'score' ? numberOrNull(f.get('scaleMin')) : null,
        scaleMax: kind === 'score' ? numberOrNull(f.get('scaleMax')) : null,
      },
      { onSuccess: () => form.reset() },
    );
  }
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label="Add a custom trait"
      className="space-y-3 rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 className="text-xl font-semibold text-leaf-900">Add a custom trait</h2>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Trait name" name="label" error={errors.label} />
        <TextField
          label="Key (optional)"
          name="key"
          hint="Short name in exported files; made from the name when blank."
          error={errors.key}
        />
      </div>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField
          label="What is recorded"
          name="quantityKind"
          value={kind}
          onChange={(e) => setKind(e.target.value as TraitBody['quantityKind'])}
          options={quantityKinds.map((k) => [k, kindLabels[k]] as const)}
        />
        <SelectField
          label="Basis"
          name="basis"
          defaultValue="plot"
          options={traitBases.map((b) => [b, basisLabels[b]] as const)}
        />
        <SelectField
          label="Direction"
          name="direction"
          defaultValue="higher"
          options={traitDirections.map((d) => [d, directionLabels[d]] as const)}
        />
      </div>
      {kind === 'score' ? (
        <div className="grid grid-cols-2 gap-3">
          <TextField
            label="Scale from"
            name="scaleMin"
            type="number"
            defaultValue="1"
            error={errors.scaleMin}
          />
          <TextField
            label="Scale to"
            name="scaleMax"
            type="number"
            defaultValue="5"
            error={errors.scaleMax}
          />
        </div>
      ) : null}
      <FormError error={Object.keys(errors).length ? null : create.error} />
      <Button type="submit" disabled={create.isPending}>
        Add trait
      </Button>
    </form>
  );
}

function Traits({ design, slug }: { design: Design; slug: string }) {
  const create = useCreatePart(slug, 'traits');
  const remove = useDeletePart(slug, 'traits');
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
              {presetByKey(t.key)?.hint ? (
                <p className="mt-1 text-sm">{presetByKey(t.key)!.hint}</p>
              ) : null}
              {design.canEdit ? (
                <Button
                  variant="ghost"
                  className="mt-1"
                  aria-label={`Remove ${t.label}`}
                  disabled={t.observationCount > 0 || remove.isPending}
                  title={t.observationCount > 0 ? 'Measurements use this trait' : undefined}
                  onClick={() => remove.mutate(t.id)}
                >
                  Remove
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
        <FormError error={remove.error} />
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
            <FormError error={create.error} />
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
