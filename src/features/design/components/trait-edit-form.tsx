import { type DesignTrait, traitEditForm } from '@common/contracts/design';
import type { UnitSystem } from '@common/contracts/me';
import { displayUnitsOfKind, traitBases, traitDirections } from '@common/contracts/trials';
import { columnUnit } from '@common/display-units';
import { decimalsInUnit, decimalsOf, exportNumber } from '@common/precision';
import { fromStored, type QuantityUnit } from '@common/units';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormMessage, SelectField, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useUpdateTrait } from '../api/update-trait';

export const basisLabels: Record<(typeof traitBases)[number], string> = {
  plant: 'Per plant',
  plot: 'Per plot',
  harvest: 'Per harvest',
};
export const directionLabels: Record<(typeof traitDirections)[number], string> = {
  higher: 'Higher is better',
  lower: 'Lower is better',
  none: 'No preference',
};

/** The unit a trait's plausible range is typed in: its own display unit (cm for a height). */
const rangeUnitOf = (t: DesignTrait, units: UnitSystem): QuantityUnit | null =>
  columnUnit(t.quantityKind, units, [], t.displayUnit).unit;

/** A stored range end as typed in `unit`, at the precision it was stored with. */
const typed = (stored: number | null, unit: QuantityUnit | null) => {
  if (stored === null) return '';
  if (!unit) return String(stored);
  const factor = fromStored(1, unit);
  return exportNumber(fromStored(stored, unit), decimalsInUnit(decimalsOf(stored), factor));
};

/** What the range measures, where that is not the value itself. */
function rangeHint(t: DesignTrait) {
  if (t.basis === 'harvest' && t.quantityKind === 'mass')
    return 'For one fruit: a harvest is asked about when its mass per fruit is outside.';
  if (t.basis === 'harvest' && t.quantityKind === 'count')
    return 'Fruit in one harvest. Values outside are asked about, never refused.';
  return 'Values outside are asked about before saving, never refused. Leave an end blank for no limit.';
}

type Answer = { altersPublished: boolean; publishedVersion: number | null };

/** What the server said about the published sheet after an edit. */
function PublishedNote({ answer, slug }: { answer: Answer; slug: string }) {
  if (answer.publishedVersion === null) return <>Saved.</>;
  if (!answer.altersPublished)
    return <>Saved. The published sheet (version {answer.publishedVersion}) does not change.</>;
  return (
    <>
      Saved. The published sheet (version {answer.publishedVersion}) still shows the trait as it
      was: <Link to={`/t/${encodeURIComponent(slug)}/results`}>publish a new version</Link> to show
      this.
    </>
  );
}

/**
 * Edits a trait after it was added, records or not: only the fields the lead changed are sent,
 * so a range shown rounded in inches is not rewritten by saving something else.
 */
export function TraitEditForm({
  slug,
  trait,
  units,
  onClose,
}: {
  slug: string;
  trait: DesignTrait;
  units: UnitSystem;
  onClose: () => void;
}) {
  const update = useUpdateTrait(slug);
  const [answer, setAnswer] = useState<Answer | null>(null);
  // The unit the form opened with stays while it is open, so typed values keep their meaning.
  const [rangeUnit] = useState(() => rangeUnitOf(trait, units));
  const hasRange = trait.quantityKind !== 'score' && trait.quantityKind !== 'date';
  const unitChoices =
    trait.quantityKind === 'length' || trait.quantityKind === 'mass'
      ? displayUnitsOfKind[trait.quantityKind]
      : null;
  const values = {
    label: trait.label,
    direction: trait.direction,
    basis: trait.basis,
    displayUnit: trait.displayUnit ?? '',
    plausibleMin: typed(trait.plausibleMin, rangeUnit),
    plausibleMax: typed(trait.plausibleMax, rangeUnit),
  };
  const form = useContractForm(traitEditForm(trait.quantityKind, rangeUnit), values);
  const { errors, isSubmitting, dirtyFields } = form.formState;
  const onSubmit = submitTo(form, async (body) => {
    const changed = Object.fromEntries(
      Object.entries(body).filter(([k]) => dirtyFields[k as keyof typeof dirtyFields]),
    );
    if (Object.keys(changed).length === 0) {
      onClose();
      return;
    }
    setAnswer(await update.mutateAsync({ id: trait.id, body: changed }));
    form.reset(form.getValues());
  });
  const refusal = formRefusal(form);
  const suffix = rangeUnit ?? (trait.quantityKind === 'percent' ? '%' : undefined);
  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={`Edit ${trait.label}`}
      className="mt-2 space-y-3 border-t border-leaf-100 pt-3"
    >
      <TextField label="Trait name" error={errors.label?.message} {...form.register('label')} />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          label="Direction"
          error={errors.direction?.message}
          options={traitDirections.map((d) => [d, directionLabels[d]] as const)}
          {...form.register('direction')}
        />
        <SelectField
          label="Basis"
          error={errors.basis?.message}
          options={traitBases.map((b) => [b, basisLabels[b]] as const)}
          {...form.register('basis')}
        />
      </div>
      {unitChoices ? (
        <SelectField
          label="Shown in"
          hint={
            units === 'us'
              ? 'Readers using US customary units see the matching inches, feet, ounces or pounds.'
              : undefined
          }
          error={errors.displayUnit?.message}
          options={[
            [
              '',
              trait.quantityKind === 'length' ? 'Usual unit (cm)' : 'Usual unit (g or kg by size)',
            ],
            ...unitChoices.map((u) => [u, u] as const),
          ]}
          {...form.register('displayUnit')}
        />
      ) : null}
      {hasRange ? (
        <fieldset className="space-y-2">
          <legend className="font-medium">Plausible range</legend>
          <p className="text-sm text-loam-700">{rangeHint(trait)}</p>
          <div className="grid grid-cols-2 gap-3">
            <TextField
              label="From"
              inputMode="decimal"
              suffix={suffix}
              error={errors.plausibleMin?.message}
              {...form.register('plausibleMin')}
            />
            <TextField
              label="To"
              inputMode="decimal"
              suffix={suffix}
              error={errors.plausibleMax?.message}
              {...form.register('plausibleMax')}
            />
          </div>
        </fieldset>
      ) : null}
      {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
      {answer ? (
        <FormMessage tone="ok">
          <PublishedNote answer={answer} slug={slug} />
        </FormMessage>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Saving…' : 'Save changes'}
        </Button>
        <Button type="button" variant="ghost" onClick={onClose}>
          {answer ? 'Close' : 'Cancel'}
        </Button>
      </div>
    </form>
  );
}
