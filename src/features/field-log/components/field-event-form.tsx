import { fieldEventKinds, type FieldEventKind } from '@common/contracts/records';
import { readNumberField } from '@common/decimal';
import { formatDepth, G_PER_POUND, MM_PER_INCH, type UnitSystem } from '@common/units';
import {
  gallonsToLitres,
  gphPer100FtToLPerHPerM,
  inchesPerHourToMmPerHour,
  squareFeetToSquareMetres,
  waterDepthMm,
  type IrrigationInputs,
} from '@common/water';
import { useId, useState } from 'react';
import { CautionNote } from '@/components/ui/caution-note';
import { clientId } from '@/lib/client-id';
import type { QueuedEntry } from './entry-forms';

const kindLabels: Record<FieldEventKind, string> = {
  irrigation: 'Irrigation',
  rainfall: 'Rainfall',
  fertilizer: 'Fertilizer or amendment',
  thinning: 'Thinning',
  pruning: 'Pruning',
  transplanting: 'Transplanting',
  note: 'Note',
};
const inputClass = 'min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3 text-lg';
const num = readNumberField;

function NumberField({
  label,
  unit,
  value,
  onChange,
}: {
  label: string;
  unit: string;
  value: string;
  onChange: (v: string) => void;
}) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="font-medium">
        {label} ({unit})
      </label>
      <input
        id={id}
        inputMode="decimal"
        autoComplete="off"
        value={value}
        onChange={(e) => onChange(e.target.value)}
        className={inputClass}
      />
    </div>
  );
}

/**
 * A field event at a site: the inputs in the reader's units, converted to SI before queueing.
 * For irrigation the depth of water is computed here, shown before saving, and computed again
 * by the server from the same inputs.
 */
export function FieldEventForm({
  slug,
  siteId,
  date,
  units,
  onSave,
}: {
  slug: string;
  siteId: string;
  date: string;
  units: UnitSystem;
  onSave: (entries: QueuedEntry[]) => Promise<void>;
}) {
  const id = useId();
  const us = units === 'us';
  const [kind, setKind] = useState<FieldEventKind>('irrigation');
  const [method, setMethod] = useState<'drip' | 'overhead' | 'hand'>('drip');
  const [dripMode, setDripMode] = useState<'emitters' | 'line'>('emitters');
  const [v, setV] = useState<Record<string, string>>({});
  const [noneApplied, setNoneApplied] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const set = (k: string) => (value: string) => setV((old) => ({ ...old, [k]: value }));
  const lengthMm = (s: string | undefined) => {
    const n = num(s ?? '');
    return n === null ? null : us ? n * MM_PER_INCH : n * 10; // typed in cm or in
  };

  // SI values the API stores, from what was typed.
  const si = {
    runTimeMin: num(v.runTime ?? ''),
    dripEmitterFlowLPerH: ((n) => (n === null ? null : us ? gallonsToLitres(n) : n))(
      num(v.emitterFlow ?? ''),
    ),
    dripEmitterSpacingMm: lengthMm(v.emitterSpacing),
    dripLineFlowLPerHPerM: ((n) => (n === null ? null : us ? gphPer100FtToLPerHPerM(n) : n))(
      num(v.lineFlow ?? ''),
    ),
    wettedWidthMm: lengthMm(v.wettedWidth),
    sprinklerRateMmPerH: ((n) => (n === null ? null : us ? inchesPerHourToMmPerHour(n) : n))(
      num(v.sprinklerRate ?? ''),
    ),
    handVolumeL: ((n) => (n === null ? null : us ? gallonsToLitres(n) : n))(
      num(v.handVolume ?? ''),
    ),
    wettedAreaM2: ((n) => (n === null ? null : us ? squareFeetToSquareMetres(n) : n))(
      num(v.wettedArea ?? ''),
    ),
    rainMm: ((n) => (n === null ? null : us ? n * MM_PER_INCH : n))(num(v.rain ?? '')),
    rateGPerM2: ((n) =>
      n === null ? null : us ? (n * G_PER_POUND) / squareFeetToSquareMetres(100) : n)(
      num(v.rate ?? ''),
    ),
    targetSpacingMm: lengthMm(v.spacing),
  };

  let depth: number | null = null;
  let depthProblem: string | null = null;
  if (kind === 'irrigation') {
    const inputs: IrrigationInputs =
      method === 'drip'
        ? dripMode === 'line'
          ? {
              method,
              lineFlowLPerHPerM: si.dripLineFlowLPerHPerM ?? NaN,
              wettedWidthMm: si.wettedWidthMm ?? NaN,
              runTimeMin: si.runTimeMin ?? NaN,
            }
          : {
              method,
              emitterFlowLPerH: si.dripEmitterFlowLPerH ?? NaN,
              emitterSpacingMm: si.dripEmitterSpacingMm ?? NaN,
              wettedWidthMm: si.wettedWidthMm ?? NaN,
              runTimeMin: si.runTimeMin ?? NaN,
            }
        : method === 'overhead'
          ? {
              method,
              sprinklerRateMmPerH: si.sprinklerRateMmPerH ?? NaN,
              runTimeMin: si.runTimeMin ?? NaN,
            }
          : {
              method,
              volumeL: si.handVolumeL ?? NaN,
              wettedAreaM2: si.wettedAreaM2 ?? NaN,
              runTimeMin: si.runTimeMin ?? NaN,
            };
    try {
      depth = waterDepthMm(inputs);
    } catch (err) {
      depthProblem = (err as Error).message;
    }
  }

  const body = (): Record<string, unknown> => {
    const common = { siteId, kind, occurredOn: date, note: (v.note ?? '').trim() };
    switch (kind) {
      case 'irrigation':
        return {
          ...common,
          irrigationMethod: method,
          runTimeMin: si.runTimeMin,
          ...(method === 'drip'
            ? dripMode === 'line'
              ? { dripLineFlowLPerHPerM: si.dripLineFlowLPerHPerM, wettedWidthMm: si.wettedWidthMm }
              : {
                  dripEmitterFlowLPerH: si.dripEmitterFlowLPerH,
                  dripEmitterSpacingMm: si.dripEmitterSpacingMm,
                  wettedWidthMm: si.wettedWidthMm,
                }
            : method === 'overhead'
              ? { sprinklerRateMmPerH: si.sprinklerRateMmPerH }
              : { handVolumeL: si.handVolumeL, wettedAreaM2: si.wettedAreaM2 }),
        };
      case 'rainfall':
        return { ...common, rainMm: si.rainMm };
      case 'fertilizer':
        return noneApplied
          ? { ...common, noneApplied: true }
          : {
              ...common,
              amendmentKind: (v.amendment ?? '').trim() || null,
              rateGPerM2: si.rateGPerM2,
            };
      case 'thinning':
        return { ...common, targetSpacingMm: si.targetSpacingMm };
      case 'pruning':
      case 'transplanting':
      case 'note':
        return common;
      default: {
        // Every kind is handled above; a new kind in fieldEventKinds stops the build here.
        const unhandled: never = kind;
        throw new Error(`No body for the field event kind ${String(unhandled)}.`);
      }
    }
  };

  const describe = () => {
    if (kind === 'irrigation' && depth !== null)
      return `${kindLabels[kind]} (${method}) ${formatDepth(depth, units)}`;
    if (kind === 'rainfall' && si.rainMm !== null) return `Rain ${formatDepth(si.rainMm, units)}`;
    if (kind === 'fertilizer')
      return noneApplied ? 'Fertilizer: none applied' : `Fertilizer: ${v.amendment ?? ''}`;
    return kindLabels[kind];
  };

  return (
    <form
      aria-label="Field event"
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        if (kind === 'irrigation' && depth === null)
          return setError(depthProblem ?? 'Complete the irrigation inputs.');
        if (kind === 'rainfall' && (si.rainMm === null || Number.isNaN(si.rainMm) || si.rainMm < 0))
          return setError('Enter the rain gauge reading.');
        if (
          kind === 'fertilizer' &&
          !noneApplied &&
          (!(v.amendment ?? '').trim() || si.rateGPerM2 === null)
        )
          return setError('Enter what was applied and the rate, or mark "none applied".');
        if (kind === 'thinning' && !(si.targetSpacingMm! > 0))
          return setError('Enter the spacing thinned to.');
        if (kind === 'note' && !(v.note ?? '').trim()) return setError('Write the note.');
        setError(null);
        const entryId = clientId();
        await onSave([
          {
            id: entryId,
            trialSlug: slug,
            kind: 'field-event',
            method: 'POST',
            url: `/api/trials/${encodeURIComponent(slug)}/field-events`,
            body: { id: entryId, ...body() },
            label: `${date} · ${describe()}`,
          },
        ]);
        setV({});
        setNoneApplied(false);
      }}
    >
      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-kind`} className="font-medium">
          What happened
        </label>
        <select
          id={`${id}-kind`}
          value={kind}
          onChange={(e) => {
            setKind(e.target.value as FieldEventKind);
            setError(null);
          }}
          className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
        >
          {fieldEventKinds.map((k) => (
            <option key={k} value={k}>
              {kindLabels[k]}
            </option>
          ))}
        </select>
      </div>

      {kind === 'irrigation' ? (
        <>
          <CautionNote id="irrigation-backflow" />
          <fieldset>
            <legend className="mb-1 font-medium">Method</legend>
            <div className="flex flex-wrap gap-2">
              {(
                [
                  ['drip', 'Drip'],
                  ['overhead', 'Overhead sprinkler'],
                  ['hand', 'By hand'],
                ] as const
              ).map(([m, label]) => (
                <label
                  key={m}
                  className={`flex min-h-11 cursor-pointer items-center rounded-lg border px-3 font-semibold ${
                    method === m
                      ? 'border-leaf-700 bg-leaf-700 text-white'
                      : 'border-leaf-300 bg-white'
                  }`}
                >
                  <input
                    type="radio"
                    name={`${id}-m`}
                    checked={method === m}
                    onChange={() => setMethod(m)}
                    className="sr-only"
                  />
                  {label}
                </label>
              ))}
            </div>
          </fieldset>
          <NumberField
            label="Run time"
            unit="min"
            value={v.runTime ?? ''}
            onChange={set('runTime')}
          />
          {method === 'drip' ? (
            <>
              <fieldset className="flex flex-wrap gap-3">
                <legend className="mb-1 font-medium">Drip flow given as</legend>
                <label className="flex min-h-11 items-center gap-2">
                  <input
                    type="radio"
                    name={`${id}-dm`}
                    checked={dripMode === 'emitters'}
                    onChange={() => setDripMode('emitters')}
                  />
                  Emitter flow and spacing
                </label>
                <label className="flex min-h-11 items-center gap-2">
                  <input
                    type="radio"
                    name={`${id}-dm`}
                    checked={dripMode === 'line'}
                    onChange={() => setDripMode('line')}
                  />
                  Line flow per length
                </label>
              </fieldset>
              <div className="grid grid-cols-2 gap-3">
                {dripMode === 'emitters' ? (
                  <>
                    <NumberField
                      label="Emitter flow"
                      unit={us ? 'gal/h' : 'L/h'}
                      value={v.emitterFlow ?? ''}
                      onChange={set('emitterFlow')}
                    />
                    <NumberField
                      label="Emitter spacing"
                      unit={us ? 'in' : 'cm'}
                      value={v.emitterSpacing ?? ''}
                      onChange={set('emitterSpacing')}
                    />
                  </>
                ) : (
                  <NumberField
                    label="Line flow"
                    unit={us ? 'gal/h per 100 ft' : 'L/h per m'}
                    value={v.lineFlow ?? ''}
                    onChange={set('lineFlow')}
                  />
                )}
                <NumberField
                  label="Wetted width"
                  unit={us ? 'in' : 'cm'}
                  value={v.wettedWidth ?? ''}
                  onChange={set('wettedWidth')}
                />
              </div>
            </>
          ) : method === 'overhead' ? (
            <NumberField
              label="Sprinkler precipitation rate"
              unit={us ? 'in/h' : 'mm/h'}
              value={v.sprinklerRate ?? ''}
              onChange={set('sprinklerRate')}
            />
          ) : (
            <div className="grid grid-cols-2 gap-3">
              <NumberField
                label="Water applied"
                unit={us ? 'gal' : 'L'}
                value={v.handVolume ?? ''}
                onChange={set('handVolume')}
              />
              <NumberField
                label="Area watered"
                unit={us ? 'ft²' : 'm²'}
                value={v.wettedArea ?? ''}
                onChange={set('wettedArea')}
              />
            </div>
          )}
          <p
            role="status"
            aria-live="polite"
            className="rounded-lg bg-leaf-50 p-3 font-semibold text-leaf-900"
          >
            Depth of water applied over the wetted area:{' '}
            {depth !== null ? formatDepth(depth, units) : 'complete the inputs above'}
          </p>
        </>
      ) : null}

      {kind === 'rainfall' ? (
        <NumberField
          label="Rain gauge reading"
          unit={us ? 'in' : 'mm'}
          value={v.rain ?? ''}
          onChange={set('rain')}
        />
      ) : null}

      {kind === 'fertilizer' ? (
        <>
          <CautionNote id="fertilizer-handling" />
          <label className="flex min-h-11 items-center gap-2 font-medium">
            <input
              type="checkbox"
              checked={noneApplied}
              onChange={(e) => setNoneApplied(e.target.checked)}
              className="h-5 w-5"
            />
            None applied (recorded on purpose)
          </label>
          {!noneApplied ? (
            <div className="grid grid-cols-2 gap-3">
              <div className="flex flex-col gap-1">
                <label htmlFor={`${id}-am`} className="font-medium">
                  What was applied
                </label>
                <input
                  id={`${id}-am`}
                  value={v.amendment ?? ''}
                  onChange={(e) => set('amendment')(e.target.value)}
                  className={inputClass}
                />
              </div>
              <NumberField
                label="Rate"
                unit={us ? 'lb/100 ft²' : 'g/m²'}
                value={v.rate ?? ''}
                onChange={set('rate')}
              />
            </div>
          ) : null}
        </>
      ) : null}

      {kind === 'thinning' ? (
        <NumberField
          label="Thinned to a spacing of"
          unit={us ? 'in' : 'cm'}
          value={v.spacing ?? ''}
          onChange={set('spacing')}
        />
      ) : null}

      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-note`} className="font-medium">
          {kind === 'note' ? 'Note' : 'Note (optional)'}
        </label>
        <textarea
          id={`${id}-note`}
          rows={2}
          value={v.note ?? ''}
          onChange={(e) => set('note')(e.target.value)}
          className="rounded-lg border border-leaf-300 bg-white p-3"
        />
      </div>
      {error ? (
        <p role="alert" className="text-sm font-medium text-frost-600">
          {error}
        </p>
      ) : null}
      <button
        type="submit"
        className="min-h-12 w-full rounded-lg bg-leaf-700 px-4 text-lg font-semibold text-white"
      >
        Save event
      </button>
    </form>
  );
}
