import {
  harvestEntryForm,
  measureEntryForm,
  plotNoteForm,
  type RecordPlot,
  scoreEntryForm,
  standCountEntryForm,
} from '@common/contracts/records';
import { entryUnitsFor } from '@common/display-units';
import { harvestChecks, harvestDoubts, observationDoubt } from '@common/plausibility';
import { type QuantityUnit, toStored, type UnitSystem } from '@common/units';
import { type ReactNode, useEffect, useId, useRef, useState } from 'react';
import { SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { useContractForm } from '@/lib/contract-form';
import type { TrialWithPermissions } from '@/lib/trial';
import { clientId } from '@/lib/client-id';
import type { OutboxItem } from '../api/outbox';

export type QueuedEntry = Pick<
  OutboxItem,
  'id' | 'trialSlug' | 'kind' | 'method' | 'url' | 'body' | 'label'
>;
type Trait = TrialWithPermissions['traits'][number];

interface FormProps {
  slug: string;
  plot: RecordPlot;
  date: string;
  units: UnitSystem;
  traits: Trait[];
  /** queue the entries; `next` moves on to the next plot keeping date and form */
  onSave: (entries: QueuedEntry[], next: boolean) => Promise<void>;
}

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

/** A save held back until the grower says the values outside their plausible range are right. */
interface HeldSave {
  doubts: string[];
  save: () => Promise<void>;
}

/**
 * "Are you sure?" inside the form: values outside a trait's plausible range are asked about
 * before they are saved, never refused (common/plausibility.ts). Changing any value drops the
 * question; the form asks again on the next save.
 */
function useSureCheck(
  form: { watch: (cb: () => void) => { unsubscribe: () => void } },
  /** where "let me change it" puts the cursor */
  refocus: () => void,
) {
  const [held, setHeld] = useState<HeldSave | null>(null);
  useEffect(() => {
    const sub = form.watch(() => setHeld(null));
    return () => sub.unsubscribe();
  }, [form]);
  const drop = () => setHeld(null);
  return {
    drop,
    /** Saves at once when nothing is in doubt, else holds the save for the question. */
    saveOrAsk: async (doubts: string[], save: () => Promise<void>) => {
      if (doubts.length === 0) await save();
      else setHeld({ doubts, save });
    },
    question: held ? (
      <SureCheck
        held={held}
        onDone={drop}
        onChange={() => {
          drop();
          refocus();
        }}
      />
    ) : null,
  };
}

/** The unit a mass or length is typed in; changing it drops any question about the values. */
function UnitSelect({
  label,
  value,
  units,
  onChange,
}: {
  label: string;
  value: QuantityUnit;
  units: QuantityUnit[];
  onChange: (unit: QuantityUnit) => void;
}) {
  return (
    <SelectField
      label={label}
      className="w-32"
      value={value}
      onChange={(e) => onChange(e.target.value as QuantityUnit)}
      options={units.map((u) => [u, u] as const)}
    />
  );
}

/** The question itself: focused when it appears, both answers reachable by keyboard. */
function SureCheck({
  held,
  onChange,
  onDone,
}: {
  held: HeldSave;
  onChange: () => void;
  onDone: () => void;
}) {
  const id = useId();
  const ref = useRef<HTMLDivElement>(null);
  const [busy, setBusy] = useState(false);
  useEffect(() => ref.current?.focus(), [held]);
  return (
    <div
      ref={ref}
      tabIndex={-1}
      role="group"
      aria-labelledby={`${id}-q`}
      aria-describedby={`${id}-why`}
      className="space-y-2 rounded-lg border-2 border-pod-500 bg-straw-50 p-3 focus:outline-none focus-visible:ring-2 focus-visible:ring-pod-500"
    >
      <p id={`${id}-q`} className="font-semibold text-loam-700">
        <span aria-hidden="true">⚠ </span>Are you sure?
      </p>
      <ul id={`${id}-why`} className="list-disc pl-5 text-ink">
        {held.doubts.map((d) => (
          <li key={d}>{d}</li>
        ))}
      </ul>
      <div className="flex flex-wrap gap-2">
        <button
          type="button"
          disabled={busy}
          onClick={async () => {
            setBusy(true);
            try {
              await held.save();
              onDone();
            } finally {
              setBusy(false);
            }
          }}
          className="min-h-11 rounded-lg bg-leaf-700 px-4 font-semibold text-white disabled:bg-leaf-300"
        >
          Yes, save as typed
        </button>
        <button
          type="button"
          onClick={onChange}
          className="min-h-11 rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700"
        >
          No, let me change it
        </button>
      </div>
    </div>
  );
}

/**
 * A new record for the outbox. Its client-made id is also the outbox id, so a retry sends the
 * same record again.
 */
export function newRecord(
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
export function HarvestForm({ slug, plot, date, units, traits, onSave }: FormProps) {
  const checks = harvestChecks(traits);
  const massUnits = entryUnitsFor('mass', units, checks.massUnit)!;
  const [unit, setUnit] = useState<QuantityUnit>(massUnits[0]!);
  const blank = { marketableCount: '', marketableMass: '', cullCount: '', cullMass: '', note: '' };
  const form = useContractForm(harvestEntryForm, blank);
  const sure = useSureCheck(form, () => form.setFocus('marketableCount'));
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (v, e) => {
    const grades = [
      ['marketable', 'Marketable', v.marketableCount, v.marketableMass],
      ['cull', 'Cull', v.cullCount, v.cullMass],
    ] as const;
    const doubts: string[] = [];
    const entries = grades.flatMap(([grade, title, fruitCount, mass]) => {
      if (fruitCount === undefined || mass === undefined) return [];
      const massG = toStored(mass, unit);
      for (const d of harvestDoubts({ fruitCount, massG }, traits, units))
        doubts.push(`${title}: ${d}`);
      return [
        newRecord(
          slug,
          'harvest',
          'harvests',
          { plotId: plot.plotId, harvestedOn: date, fruitCount, massG, grade, note: v.note },
          `${plotLabel(plot)} · ${date} · ${fruitCount} fruit, ${mass} ${unit}, ${grade}`,
        ),
      ];
    });
    const next = submitterNext(e);
    await sure.saveOrAsk(doubts, async () => {
      await onSave(entries, next);
      form.reset(blank);
    });
  });

  const row = (grade: 'marketable' | 'cull', title: string) => {
    const c = `${grade}Count` as const;
    const m = `${grade}Mass` as const;
    return (
      <fieldset className="grid grid-cols-2 gap-3">
        <legend className="mb-1 font-semibold text-leaf-900">{title}</legend>
        <TextField
          label={`${title} count`}
          error={errors[c]?.message}
          inputMode="numeric"
          pattern="[0-9]*"
          autoComplete="off"
          {...form.register(c)}
        />
        <TextField
          label={`${title} mass (${unit})`}
          error={errors[m]?.message}
          inputMode="decimal"
          autoComplete="off"
          {...form.register(m)}
        />
      </fieldset>
    );
  };

  return (
    <form aria-label="Harvest" className="space-y-3" noValidate onSubmit={onSubmit}>
      {row('marketable', 'Marketable')}
      {row('cull', 'Cull')}
      <p className="text-sm text-loam-700">Leave cull blank when there was none.</p>
      <UnitSelect
        label="Mass unit"
        value={unit}
        units={massUnits}
        onChange={(u) => {
          setUnit(u);
          sure.drop();
        }}
      />
      <TextField label="Note (optional)" error={errors.note?.message} {...form.register('note')} />
      {sure.question}
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
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
  const [traitId, setTraitId] = useState(traits[0]?.id ?? '');
  const trait = traits.find((t) => t.id === traitId);
  if (!trait) return <p>{empty}</p>;
  return children(
    trait,
    <SelectField
      label="Trait"
      value={traitId}
      onChange={(e) => setTraitId(e.target.value)}
      options={traits.map((t) => [t.id, describe(t)] as const)}
    />,
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
  const unitOptions = entryUnitsFor(trait.quantityKind, units, trait.displayUnit);
  const [unit, setUnit] = useState<QuantityUnit | null>(unitOptions?.[0] ?? null);
  const [plants, setPlants] = useState(5);
  const form = useContractForm(measureEntryForm(trait), { values: [] });
  const sure = useSureCheck(form, () => form.setFocus('values.0'));
  const { isSubmitting } = form.formState;
  const valueErrors = (form.formState.errors.values ?? []) as ({ message?: string } | undefined)[];
  const suffix = unit ?? (trait.quantityKind === 'percent' ? '%' : '');

  const onSubmit = form.handleSubmit(async (v, e) => {
    const doubts: string[] = [];
    const entries = v.values.slice(0, plants).flatMap((typed, i) => {
      if (typed === undefined) return [];
      const value = unit ? toStored(typed, unit) : typed;
      const doubt = observationDoubt(value, trait, units);
      if (doubt) doubts.push(`Plant ${i + 1}: ${doubt}`);
      return [
        newRecord(
          slug,
          'observation',
          'observations',
          { plotId: plot.plotId, traitId: trait.id, observedOn: date, value, plantNumber: i + 1 },
          `${plotLabel(plot)} · ${date} · ${trait.label}, plant ${i + 1}: ${typed} ${suffix}`,
        ),
      ];
    });
    const next = submitterNext(e);
    await sure.saveOrAsk(doubts, async () => {
      await onSave(entries, next);
      form.reset({ values: [] });
    });
  });

  return (
    <form aria-label="Measurements" className="space-y-3" noValidate onSubmit={onSubmit}>
      <div className="grid grid-cols-2 gap-3">
        {children}
        <TextField
          label="Plants sampled"
          inputMode="numeric"
          type="number"
          min={1}
          max={50}
          value={plants}
          onChange={(e) => setPlants(Math.max(1, Math.min(50, Number(e.target.value) || 1)))}
        />
      </div>
      {unitOptions && unitOptions.length > 1 ? (
        <UnitSelect
          label="Unit"
          value={unit!}
          units={unitOptions}
          onChange={(u) => {
            setUnit(u);
            sure.drop();
          }}
        />
      ) : null}
      <div className="grid grid-cols-2 gap-2 sm:grid-cols-5">
        {Array.from({ length: plants }, (_, i) => (
          <TextField
            key={i}
            label={`Plant ${i + 1}${suffix ? ` (${suffix})` : ''}`}
            error={valueErrors[i]?.message}
            inputMode={trait.quantityKind === 'count' ? 'numeric' : 'decimal'}
            autoComplete="off"
            {...form.register(`values.${i}`)}
          />
        ))}
      </div>
      {sure.question}
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
      {errors.score?.message ? (
        <p id={`${id}-err`} role="alert" className="text-sm font-medium text-frost-600">
          {errors.score.message}
        </p>
      ) : null}
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}

export function StandCountForm({ slug, plot, onSave }: FormProps) {
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
      <TextField
        label={<>Plants standing{plot.plantsSet !== null ? ` (of ${plot.plantsSet} set)` : ''}</>}
        error={errors.plantsSurviving?.message}
        inputMode="numeric"
        pattern="[0-9]*"
        {...form.register('plantsSurviving')}
      />
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}

export function NoteForm({ slug, plot, date, onSave }: FormProps) {
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
      <TextArea
        label="Note"
        maxLength={2000}
        error={errors.note?.message}
        {...form.register('note')}
      />
      <SaveButtons disabled={isSubmitting} />
    </form>
  );
}
