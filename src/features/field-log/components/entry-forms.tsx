import {
  harvestEntryForm,
  measureEntryForm,
  plotNoteForm,
  type RecordPlot,
  scoreEntryForm,
  standCountEntryForm,
} from '@common/contracts/records';
import { entryUnitsFor } from '@common/display-units';
import { type QuantityUnit, toStored, type UnitSystem } from '@common/units';
import { type ReactNode, useId, useState } from 'react';
import { useContractForm } from '@/lib/contract-form';
import type { TrialWithPermissions } from '@/lib/trial';
import { clientId } from '../api/client-id';
import type { OutboxItem } from '../api/outbox';

export type QueuedEntry = Pick<
  OutboxItem,
  'id' | 'trialSlug' | 'kind' | 'method' | 'url' | 'body' | 'label'
>;
type Trait = TrialWithPermissions['traits'][number];
/** A field's problem as react-hook-form reports it. */
type Problem = { message?: string | undefined } | undefined;

interface FormProps {
  slug: string;
  plot: RecordPlot;
  date: string;
  units: UnitSystem;
  traits: Trait[];
  /** queue the entries; `next` moves on to the next plot keeping date and form */
  onSave: (entries: QueuedEntry[], next: boolean) => Promise<void>;
}

const inputClass = (invalid: boolean) =>
  `min-h-11 w-full rounded-lg border bg-white px-3 text-lg ${invalid ? 'border-frost-600' : 'border-leaf-300'}`;
const base = (slug: string) => `/api/trials/${encodeURIComponent(slug)}`;
const plotLabel = (p: RecordPlot) => `Plot ${p.plotNumber} (${p.entryCode})`;
function SaveButtons({ disabled }: { disabled?: boolean }) {
  return (
    <div className="flex flex-wrap gap-2 pt-1">
      <button
        type="submit"
        name="next"
        value="yes"
        disabled={disabled}
        className="min-h-12 flex-1 rounded-lg bg-leaf-700 px-4 text-lg font-semibold text-white disabled:bg-leaf-300"
      >
        Save and next plot
      </button>
      <button
        type="submit"
        name="next"
        value="no"
        disabled={disabled}
        className="min-h-12 rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700"
      >
        Save
      </button>
    </div>
  );
}

/** The contract's message for a field, tied to its input. */
function FieldMessage({ id, error }: { id: string; error: Problem }) {
  return error?.message ? (
    <p id={id} role="alert" className="text-sm font-medium text-frost-600">
      {error.message}
    </p>
  ) : null;
}

/** A label above its control, and the control's error below it. */
function Field({
  id,
  label,
  error,
  children,
}: {
  id: string;
  label: ReactNode;
  error?: Problem;
  children: ReactNode;
}) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="font-medium">
        {label}
      </label>
      {children}
      <FieldMessage id={`${id}-err`} error={error} />
    </div>
  );
}

/** aria attributes of an input whose error shows under it. */
const invalidProps = (id: string, error: Problem) =>
  error ? { 'aria-invalid': true as const, 'aria-describedby': `${id}-err` } : {};

/**
 * A new record for the outbox. Its client-made id is also the outbox id, so a retry sends the
 * same record again.
 */
function newRecord(
  slug: string,
  kind: QueuedEntry['kind'],
  path: string,
  body: Record<string, unknown>,
  label: string,
): QueuedEntry {
  const entryId = clientId();
  return {
    id: entryId,
    trialSlug: slug,
    kind,
    method: 'POST',
    url: `${base(slug)}/${path}`,
    body: { id: entryId, ...body },
    label,
  };
}

/** Which save button was pressed: "Save and next plot" unless it was the plain "Save". */
const submitterNext = (e: React.BaseSyntheticEvent | undefined) =>
  ((e?.nativeEvent as SubmitEvent | undefined)?.submitter as HTMLButtonElement | null)?.value !==
  'no';

/** One harvest round at a plot: marketable and cull in one save. */
export function HarvestForm({ slug, plot, date, units, onSave }: FormProps) {
  const id = useId();
  const massUnits = entryUnitsFor('mass', units)!;
  const [unit, setUnit] = useState<QuantityUnit>(massUnits[0]!);
  const blank = { marketableCount: '', marketableMass: '', cullCount: '', cullMass: '', note: '' };
  const form = useContractForm(harvestEntryForm, blank);
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (v, e) => {
    const grades = [
      ['marketable', v.marketableCount, v.marketableMass],
      ['cull', v.cullCount, v.cullMass],
    ] as const;
    const entries = grades.flatMap(([grade, fruitCount, mass]) =>
      fruitCount === undefined || mass === undefined
        ? []
        : [
            newRecord(
              slug,
              'harvest',
              'harvests',
              {
                plotId: plot.plotId,
                harvestedOn: date,
                fruitCount,
                massG: toStored(mass, unit),
                grade,
                note: v.note,
              },
              `${plotLabel(plot)} · ${date} · ${fruitCount} fruit, ${mass} ${unit}, ${grade}`,
            ),
          ],
    );
    await onSave(entries, submitterNext(e));
    form.reset(blank);
  });

  const row = (grade: 'marketable' | 'cull', title: string) => {
    const c = `${grade}Count` as const;
    const m = `${grade}Mass` as const;
    return (
      <fieldset className="grid grid-cols-2 gap-3">
        <legend className="mb-1 font-semibold text-leaf-900">{title}</legend>
        <Field id={`${id}-${c}`} label={`${title} count`} error={errors[c]}>
          <input
            id={`${id}-${c}`}
            inputMode="numeric"
            pattern="[0-9]*"
            autoComplete="off"
            className={inputClass(!!errors[c])}
            {...invalidProps(`${id}-${c}`, errors[c])}
            {...form.register(c)}
          />
        </Field>
        <Field id={`${id}-${m}`} label={`${title} mass (${unit})`} error={errors[m]}>
          <input
            id={`${id}-${m}`}
            inputMode="decimal"
            autoComplete="off"
            className={inputClass(!!errors[m])}
            {...invalidProps(`${id}-${m}`, errors[m])}
            {...form.register(m)}
          />
        </Field>
      </fieldset>
    );
  };

  return (
    <form aria-label="Harvest" className="space-y-3" noValidate onSubmit={onSubmit}>
      {row('marketable', 'Marketable')}
      {row('cull', 'Cull')}
      <p className="text-sm text-loam-700">Leave cull blank when there was none.</p>
      <div className="flex items-center gap-2">
        <label htmlFor={`${id}-unit`} className="font-medium">
          Mass unit
        </label>
        <select
          id={`${id}-unit`}
          value={unit}
          onChange={(e) => setUnit(e.target.value as QuantityUnit)}
          className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
        >
          {massUnits.map((u) => (
            <option key={u}>{u}</option>
          ))}
        </select>
      </div>
      <Field id={`${id}-n`} label="Note (optional)" error={errors.note}>
        <input
          id={`${id}-n`}
          className={inputClass(!!errors.note)}
          {...invalidProps(`${id}-n`, errors.note)}
          {...form.register('note')}
        />
      </Field>
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}

/** The units a measured trait may be typed in, the first being the default. */
function unitOptionsOf(trait: Trait, units: UnitSystem): QuantityUnit[] | null {
  return entryUnitsFor(trait.quantityKind, units, trait.displayUnit);
}

/** A trait picked from a list; the form below it starts afresh for each trait. */
function TraitChooser({
  traits,
  describe = (t) => t.label,
  empty,
  children,
}: {
  traits: Trait[];
  describe?: (t: Trait) => string;
  empty: string;
  children: (trait: Trait, chooser: ReactNode) => ReactNode;
}) {
  const id = useId();
  const [traitId, setTraitId] = useState(traits[0]?.id ?? '');
  const trait = traits.find((t) => t.id === traitId);
  if (!trait) return <p>{empty}</p>;
  return children(
    trait,
    <Field id={`${id}-t`} label="Trait">
      <select
        id={`${id}-t`}
        value={traitId}
        onChange={(e) => setTraitId(e.target.value)}
        className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
      >
        {traits.map((t) => (
          <option key={t.id} value={t.id}>
            {describe(t)}
          </option>
        ))}
      </select>
    </Field>,
  );
}

/** Values of one trait for several sample plants at once (e.g. heights of 5 plants). */
export function MeasureForm(props: FormProps) {
  const measurable = props.traits.filter(
    (t) => ['length', 'mass', 'count', 'percent'].includes(t.quantityKind) && t.basis !== 'harvest',
  );
  return (
    <TraitChooser traits={measurable} empty="This trial has no measured traits.">
      {(trait, chooser) => (
        <MeasureTraitForm key={trait.id} {...props} trait={trait}>
          {chooser}
        </MeasureTraitForm>
      )}
    </TraitChooser>
  );
}

function MeasureTraitForm({
  slug,
  plot,
  date,
  units,
  onSave,
  trait,
  children,
}: FormProps & { trait: Trait; children: ReactNode }) {
  const id = useId();
  const unitOptions = unitOptionsOf(trait, units);
  const [unit, setUnit] = useState<QuantityUnit | null>(unitOptions?.[0] ?? null);
  const [plants, setPlants] = useState(5);
  const form = useContractForm(measureEntryForm(trait), { values: [] });
  const { isSubmitting } = form.formState;
  const valueErrors = (form.formState.errors.values ?? []) as Problem[];
  const suffix = unit ?? (trait.quantityKind === 'percent' ? '%' : '');

  const onSubmit = form.handleSubmit(async (v, e) => {
    const entries = v.values.slice(0, plants).flatMap((typed, i) =>
      typed === undefined
        ? []
        : [
            newRecord(
              slug,
              'observation',
              'observations',
              {
                plotId: plot.plotId,
                traitId: trait.id,
                observedOn: date,
                value: unit ? toStored(typed, unit) : typed,
                plantNumber: i + 1,
              },
              `${plotLabel(plot)} · ${date} · ${trait.label}, plant ${i + 1}: ${typed} ${suffix}`,
            ),
          ],
    );
    await onSave(entries, submitterNext(e));
    form.reset({ values: [] });
  });

  return (
    <form aria-label="Measurements" className="space-y-3" noValidate onSubmit={onSubmit}>
      <div className="grid grid-cols-2 gap-3">
        {children}
        <Field id={`${id}-p`} label="Plants sampled">
          <input
            id={`${id}-p`}
            inputMode="numeric"
            type="number"
            min={1}
            max={50}
            value={plants}
            onChange={(e) => setPlants(Math.max(1, Math.min(50, Number(e.target.value) || 1)))}
            className={inputClass(false)}
          />
        </Field>
      </div>
      {unitOptions && unitOptions.length > 1 ? (
        <div className="flex items-center gap-2">
          <label htmlFor={`${id}-u`} className="font-medium">
            Unit
          </label>
          <select
            id={`${id}-u`}
            value={unit ?? ''}
            onChange={(e) => setUnit(e.target.value as QuantityUnit)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            {unitOptions.map((u) => (
              <option key={u}>{u}</option>
            ))}
          </select>
        </div>
      ) : null}
      <div className="grid grid-cols-2 gap-2 sm:grid-cols-5">
        {Array.from({ length: plants }, (_, i) => (
          <Field
            key={i}
            id={`${id}-v${i}`}
            label={`Plant ${i + 1}${suffix ? ` (${suffix})` : ''}`}
            error={valueErrors[i]}
          >
            <input
              id={`${id}-v${i}`}
              inputMode={trait.quantityKind === 'count' ? 'numeric' : 'decimal'}
              autoComplete="off"
              className={inputClass(!!valueErrors[i])}
              {...invalidProps(`${id}-v${i}`, valueErrors[i])}
              {...form.register(`values.${i}`)}
            />
          </Field>
        ))}
      </div>
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}

/** A plot score on the trait's scale, one tap per step. */
export function ScoreForm(props: FormProps) {
  return (
    <TraitChooser
      traits={props.traits.filter((t) => t.quantityKind === 'score')}
      describe={(t) => `${t.label} (${t.scaleMin}–${t.scaleMax})`}
      empty="This trial has no scored traits."
    >
      {(trait, chooser) => (
        <ScoreTraitForm key={trait.id} {...props} trait={trait}>
          {chooser}
        </ScoreTraitForm>
      )}
    </TraitChooser>
  );
}

function ScoreTraitForm({
  slug,
  plot,
  date,
  onSave,
  trait,
  children,
}: FormProps & { trait: Trait; children: ReactNode }) {
  const id = useId();
  const form = useContractForm(scoreEntryForm(trait), { score: '' });
  const { errors, isSubmitting } = form.formState;
  const chosen = form.watch('score');
  const steps: number[] = [];
  for (let s = trait.scaleMin!; s <= trait.scaleMax!; s++) steps.push(s);

  const onSubmit = form.handleSubmit(async (v, e) => {
    await onSave(
      [
        newRecord(
          slug,
          'observation',
          'observations',
          { plotId: plot.plotId, traitId: trait.id, observedOn: date, value: v.score },
          `${plotLabel(plot)} · ${date} · ${trait.label}: ${v.score}`,
        ),
      ],
      submitterNext(e),
    );
    form.reset({ score: '' });
  });

  return (
    <form aria-label="Score" className="space-y-3" noValidate onSubmit={onSubmit}>
      {children}
      <fieldset aria-describedby={errors.score ? `${id}-err` : undefined}>
        <legend className="mb-1 font-medium">Score</legend>
        <div className="flex flex-wrap gap-2">
          {steps.map((s) => (
            <label
              key={s}
              className={`flex min-h-12 min-w-12 cursor-pointer items-center justify-center rounded-lg border text-lg font-bold has-[:focus-visible]:ring-2 has-[:focus-visible]:ring-pod-500 ${
                String(chosen) === String(s)
                  ? 'border-leaf-700 bg-leaf-700 text-white'
                  : 'border-leaf-300 bg-white'
              }`}
            >
              <input type="radio" value={s} className="sr-only" {...form.register('score')} />
              {s}
            </label>
          ))}
        </div>
      </fieldset>
      <FieldMessage id={`${id}-err`} error={errors.score} />
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}

export function StandCountForm({ slug, plot, onSave }: FormProps) {
  const id = useId();
  const form = useContractForm(standCountEntryForm(plot.plantsSet), { plantsSurviving: '' });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (v, e) => {
    await onSave(
      [
        {
          id: clientId(),
          trialSlug: slug,
          kind: 'stand-count',
          method: 'PUT',
          url: `${base(slug)}/records/plots/${plot.plotId}/stand-count`,
          body: { plantsSurviving: v.plantsSurviving },
          label: `${plotLabel(plot)} · stand count ${v.plantsSurviving}`,
        },
      ],
      submitterNext(e),
    );
    form.reset({ plantsSurviving: '' });
  });
  return (
    <form aria-label="Stand count" className="space-y-3" noValidate onSubmit={onSubmit}>
      <Field
        id={`${id}-c`}
        label={<>Plants standing{plot.plantsSet !== null ? ` (of ${plot.plantsSet} set)` : ''}</>}
        error={errors.plantsSurviving}
      >
        <input
          id={`${id}-c`}
          inputMode="numeric"
          pattern="[0-9]*"
          className={inputClass(!!errors.plantsSurviving)}
          {...invalidProps(`${id}-c`, errors.plantsSurviving)}
          {...form.register('plantsSurviving')}
        />
      </Field>
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}

export function NoteForm({ slug, plot, date, onSave }: FormProps) {
  const id = useId();
  const form = useContractForm(plotNoteForm, { note: '' });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (v, e) => {
    await onSave(
      [
        newRecord(
          slug,
          'field-event',
          'field-events',
          {
            siteId: plot.siteId,
            plotId: plot.plotId,
            kind: 'note',
            occurredOn: date,
            note: v.note,
          },
          `${plotLabel(plot)} · ${date} · note: ${v.note.slice(0, 60)}`,
        ),
      ],
      submitterNext(e),
    );
    form.reset({ note: '' });
  });
  return (
    <form aria-label="Plot note" className="space-y-3" noValidate onSubmit={onSubmit}>
      <Field id={`${id}-t`} label="Note" error={errors.note}>
        <textarea
          id={`${id}-t`}
          rows={3}
          maxLength={2000}
          className="rounded-lg border border-leaf-300 bg-white p-3 text-lg"
          {...invalidProps(`${id}-t`, errors.note)}
          {...form.register('note')}
        />
      </Field>
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}
