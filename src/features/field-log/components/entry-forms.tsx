import type { RecordPlot } from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import type { TrialWithPermissions } from '@/lib/trial';
import { type QuantityUnit, toStored, type UnitSystem } from '@common/units';
import { type ReactNode, useId, useState } from 'react';
import type { OutboxItem } from '../api/outbox';
import { clientId } from '../api/client-id';

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

const inputClass = 'min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3 text-lg';
const base = (slug: string) => `/api/trials/${encodeURIComponent(slug)}`;
const plotLabel = (p: RecordPlot) => `Plot ${p.plotNumber} (${p.entryCode})`;

const readNumber = readNumberField;

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

function FieldError({ id, message }: { id: string; message: string | null }) {
  return message ? (
    <p id={id} role="alert" className="text-sm font-medium text-frost-600">
      {message}
    </p>
  ) : null;
}

/** A label above its control. */
function Field({ id, label, children }: { id: string; label: ReactNode; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="font-medium">
        {label}
      </label>
      {children}
    </div>
  );
}

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

const submitterNext = (e: React.FormEvent<HTMLFormElement>) =>
  ((e.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null)?.value !== 'no';

export function HarvestForm({ slug, plot, date, units, onSave }: FormProps) {
  const id = useId();
  const massUnits: QuantityUnit[] = units === 'metric' ? ['g', 'kg'] : ['oz', 'lb'];
  const [count, setCount] = useState('');
  const [mass, setMass] = useState('');
  const [unit, setUnit] = useState<QuantityUnit>(massUnits[0]!);
  const [grade, setGrade] = useState<'marketable' | 'cull'>('marketable');
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);

  return (
    <form
      aria-label="Harvest"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const fruitCount = readNumber(count);
        const massValue = readNumber(mass);
        if (fruitCount === null || !Number.isInteger(fruitCount) || fruitCount < 0)
          return setError('Enter the fruit count as a whole number, 0 or more.');
        if (massValue === null || Number.isNaN(massValue) || massValue < 0)
          return setError('Enter the mass as a number, 0 or more.');
        setError(null);
        const massG = toStored(massValue, unit);
        await onSave(
          [
            newRecord(
              slug,
              'harvest',
              'harvests',
              {
                plotId: plot.plotId,
                harvestedOn: date,
                fruitCount,
                massG,
                grade,
                note,
              },
              `${plotLabel(plot)} · ${date} · ${fruitCount} fruit, ${massValue} ${unit}, ${grade}`,
            ),
          ],
          submitterNext(e),
        );
        setCount('');
        setMass('');
        setNote('');
      }}
    >
      <div className="grid grid-cols-2 gap-3">
        <Field id={`${id}-c`} label="Fruit count">
          <input
            id={`${id}-c`}
            inputMode="numeric"
            pattern="[0-9]*"
            autoComplete="off"
            value={count}
            onChange={(e) => setCount(e.target.value)}
            className={inputClass}
          />
        </Field>
        <Field id={`${id}-m`} label={<>Mass ({unit})</>}>
          <div className="flex gap-1">
            <input
              id={`${id}-m`}
              inputMode="decimal"
              autoComplete="off"
              value={mass}
              onChange={(e) => setMass(e.target.value)}
              className={inputClass}
            />
            <select
              aria-label="Mass unit"
              value={unit}
              onChange={(e) => setUnit(e.target.value as QuantityUnit)}
              className="min-h-11 rounded-lg border border-leaf-300 bg-white px-1"
            >
              {massUnits.map((u) => (
                <option key={u}>{u}</option>
              ))}
            </select>
          </div>
        </Field>
      </div>
      <fieldset className="flex gap-2">
        <legend className="mb-1 font-medium">Grade</legend>
        {(['marketable', 'cull'] as const).map((g) => (
          <label
            key={g}
            className={`flex min-h-11 flex-1 cursor-pointer items-center justify-center rounded-lg border px-3 font-semibold ${
              grade === g ? 'border-leaf-700 bg-leaf-700 text-white' : 'border-leaf-300 bg-white'
            }`}
          >
            <input
              type="radio"
              name={`${id}-grade`}
              value={g}
              checked={grade === g}
              onChange={() => setGrade(g)}
              className="sr-only"
            />
            {g === 'marketable' ? 'Marketable' : 'Cull'}
          </label>
        ))}
      </fieldset>
      <Field id={`${id}-n`} label="Note (optional)">
        <input
          id={`${id}-n`}
          value={note}
          onChange={(e) => setNote(e.target.value)}
          className={inputClass}
        />
      </Field>
      <FieldError id={`${id}-err`} message={error} />
      <SaveButtons />
    </form>
  );
}

/** Values of one trait for several sample plants at once (e.g. heights of 5 plants). */
export function MeasureForm({ slug, plot, date, units, traits, onSave }: FormProps) {
  const id = useId();
  const measurable = traits.filter((t) =>
    ['length', 'mass', 'count', 'percent'].includes(t.quantityKind),
  );
  const [traitId, setTraitId] = useState(measurable[0]?.id ?? '');
  const trait = measurable.find((t) => t.id === traitId);
  const unitOptions: QuantityUnit[] | null =
    trait?.quantityKind === 'length'
      ? units === 'metric'
        ? ['mm', 'cm']
        : ['in']
      : trait?.quantityKind === 'mass'
        ? units === 'metric'
          ? ['g', 'kg']
          : ['oz', 'lb']
        : null;
  const [unit, setUnit] = useState<QuantityUnit | null>(null);
  const activeUnit = unit && unitOptions?.includes(unit) ? unit : (unitOptions?.[0] ?? null);
  const [plants, setPlants] = useState(5);
  const [values, setValues] = useState<string[]>([]);
  const [error, setError] = useState<string | null>(null);
  if (!trait) return <p>This trial has no measured traits.</p>;
  const suffix = activeUnit ?? (trait.quantityKind === 'percent' ? '%' : '');

  return (
    <form
      aria-label="Measurements"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const entries: QueuedEntry[] = [];
        for (let i = 0; i < plants; i++) {
          const v = readNumber(values[i] ?? '');
          if (v === null) continue;
          if (Number.isNaN(v) || v < 0)
            return setError(`Plant ${i + 1}: enter a number, 0 or more.`);
          if (trait.quantityKind === 'count' && !Number.isInteger(v))
            return setError(`Plant ${i + 1}: a count is a whole number.`);
          const value = activeUnit ? toStored(v, activeUnit) : v;
          entries.push(
            newRecord(
              slug,
              'observation',
              'observations',
              {
                plotId: plot.plotId,
                traitId: trait.id,
                observedOn: date,
                value,
                plantNumber: i + 1,
              },
              `${plotLabel(plot)} · ${date} · ${trait.label}, plant ${i + 1}: ${v} ${suffix}`,
            ),
          );
        }
        if (!entries.length) return setError('Enter at least one value.');
        setError(null);
        await onSave(entries, submitterNext(e));
        setValues([]);
      }}
    >
      <div className="grid grid-cols-2 gap-3">
        <Field id={`${id}-t`} label="Trait">
          <select
            id={`${id}-t`}
            value={traitId}
            onChange={(e) => setTraitId(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            {measurable.map((t) => (
              <option key={t.id} value={t.id}>
                {t.label}
              </option>
            ))}
          </select>
        </Field>
        <Field id={`${id}-p`} label="Plants sampled">
          <input
            id={`${id}-p`}
            inputMode="numeric"
            type="number"
            min={1}
            max={50}
            value={plants}
            onChange={(e) => setPlants(Math.max(1, Math.min(50, Number(e.target.value) || 1)))}
            className={inputClass}
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
            value={activeUnit ?? ''}
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
          <div key={i} className="flex flex-col gap-1">
            <label htmlFor={`${id}-v${i}`} className="text-sm font-medium">
              Plant {i + 1} {suffix ? `(${suffix})` : ''}
            </label>
            <input
              id={`${id}-v${i}`}
              inputMode={trait.quantityKind === 'count' ? 'numeric' : 'decimal'}
              autoComplete="off"
              value={values[i] ?? ''}
              onChange={(e) => {
                const next = [...values];
                next[i] = e.target.value;
                setValues(next);
              }}
              className={inputClass}
            />
          </div>
        ))}
      </div>
      <FieldError id={`${id}-err`} message={error} />
      <SaveButtons />
    </form>
  );
}

export function ScoreForm({ slug, plot, date, traits, onSave }: FormProps) {
  const id = useId();
  const scored = traits.filter((t) => t.quantityKind === 'score');
  const [traitId, setTraitId] = useState(scored[0]?.id ?? '');
  const [score, setScore] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const trait = scored.find((t) => t.id === traitId);
  if (!trait) return <p>This trial has no scored traits.</p>;
  const steps: number[] = [];
  for (let s = trait.scaleMin!; s <= trait.scaleMax!; s++) steps.push(s);
  return (
    <form
      aria-label="Score"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        if (score === null)
          return setError(`Choose a score from ${trait.scaleMin} to ${trait.scaleMax}.`);
        setError(null);
        await onSave(
          [
            newRecord(
              slug,
              'observation',
              'observations',
              {
                plotId: plot.plotId,
                traitId: trait.id,
                observedOn: date,
                value: score,
              },
              `${plotLabel(plot)} · ${date} · ${trait.label}: ${score}`,
            ),
          ],
          submitterNext(e),
        );
        setScore(null);
      }}
    >
      <Field id={`${id}-t`} label="Trait">
        <select
          id={`${id}-t`}
          value={traitId}
          onChange={(e) => {
            setTraitId(e.target.value);
            setScore(null);
          }}
          className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
        >
          {scored.map((t) => (
            <option key={t.id} value={t.id}>
              {t.label} ({t.scaleMin}–{t.scaleMax})
            </option>
          ))}
        </select>
      </Field>
      <fieldset>
        <legend className="mb-1 font-medium">Score</legend>
        <div className="flex flex-wrap gap-2">
          {steps.map((s) => (
            <label
              key={s}
              className={`flex min-h-12 min-w-12 cursor-pointer items-center justify-center rounded-lg border text-lg font-bold ${
                score === s ? 'border-leaf-700 bg-leaf-700 text-white' : 'border-leaf-300 bg-white'
              }`}
            >
              <input
                type="radio"
                name={`${id}-score`}
                value={s}
                checked={score === s}
                onChange={() => setScore(s)}
                className="sr-only"
              />
              {s}
            </label>
          ))}
        </div>
      </fieldset>
      <FieldError id={`${id}-err`} message={error} />
      <SaveButtons />
    </form>
  );
}

export function StandCountForm({ slug, plot, onSave }: FormProps) {
  const id = useId();
  const [count, setCount] = useState('');
  const [error, setError] = useState<string | null>(null);
  return (
    <form
      aria-label="Stand count"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const n = readNumber(count);
        if (n === null || !Number.isInteger(n) || n < 0)
          return setError('Enter the plants standing as a whole number.');
        if (plot.plantsSet !== null && n > plot.plantsSet)
          return setError(
            `The plot was set with ${plot.plantsSet} plants; the stand cannot be more.`,
          );
        setError(null);
        await onSave(
          [
            {
              id: clientId(),
              trialSlug: slug,
              kind: 'stand-count',
              method: 'PUT',
              url: `${base(slug)}/records/plots/${plot.plotId}/stand-count`,
              body: { plantsSurviving: n },
              label: `${plotLabel(plot)} · stand count ${n}`,
            },
          ],
          submitterNext(e),
        );
        setCount('');
      }}
    >
      <Field
        id={`${id}-c`}
        label={<>Plants standing{plot.plantsSet !== null ? ` (of ${plot.plantsSet} set)` : ''}</>}
      >
        <input
          id={`${id}-c`}
          inputMode="numeric"
          pattern="[0-9]*"
          value={count}
          onChange={(e) => setCount(e.target.value)}
          className={inputClass}
        />
      </Field>
      <FieldError id={`${id}-err`} message={error} />
      <SaveButtons />
    </form>
  );
}

export function NoteForm({ slug, plot, date, onSave }: FormProps) {
  const id = useId();
  const [text, setText] = useState('');
  const [error, setError] = useState<string | null>(null);
  return (
    <form
      aria-label="Plot note"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        if (!text.trim()) return setError('Write the note.');
        setError(null);
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
                note: text.trim(),
              },
              `${plotLabel(plot)} · ${date} · note: ${text.trim().slice(0, 60)}`,
            ),
          ],
          submitterNext(e),
        );
        setText('');
      }}
    >
      <Field id={`${id}-t`} label="Note">
        <textarea
          id={`${id}-t`}
          rows={3}
          maxLength={2000}
          value={text}
          onChange={(e) => setText(e.target.value)}
          className="rounded-lg border border-leaf-300 bg-white p-3 text-lg"
        />
      </Field>
      <FieldError id={`${id}-err`} message={error} />
      <SaveButtons />
    </form>
  );
}
