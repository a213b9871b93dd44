import {
  type FieldEventAmount,
  fieldEventForm,
  type FieldEventFormValues,
  fieldEventKinds,
  type FieldEventKind,
  fieldEventUnits,
} from '@common/contracts/records';
import { formatDepth, type UnitSystem } from '@common/units';
import { irrigationInputsOf, waterDepthMm } from '@common/water';
import { useMemo } from 'react';
import { CautionNote } from '@/components/ui/caution-note';
import { FormMessage, SelectField, TextArea, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { newRecord, type QueuedEntry } from './entry-forms';

const kindLabels: Record<FieldEventKind, string> = {
  irrigation: 'Irrigation',
  rainfall: 'Rainfall',
  fertilizer: 'Fertilizer or amendment',
  thinning: 'Thinning',
  pruning: 'Pruning',
  transplanting: 'Transplanting',
  note: 'Note',
};
const amountLabels: Record<FieldEventAmount, string> = {
  runTimeMin: 'Run time',
  dripEmitterFlowLPerH: 'Emitter flow',
  dripEmitterSpacingMm: 'Emitter spacing',
  dripLineFlowLPerHPerM: 'Line flow',
  wettedWidthMm: 'Wetted width',
  sprinklerRateMmPerH: 'Sprinkler precipitation rate',
  handVolumeL: 'Water applied',
  wettedAreaM2: 'Area watered',
  rainMm: 'Rain gauge reading',
  rateGPerM2: 'Rate',
  targetSpacingMm: 'Thinned to a spacing of',
};
const methods = [
  ['drip', 'Drip'],
  ['overhead', 'Overhead sprinkler'],
  ['hand', 'By hand'],
] as const;
const blankAmounts = Object.fromEntries(Object.keys(amountLabels).map((k) => [k, ''])) as Record<
  FieldEventAmount,
  string
>;
const blank: FieldEventFormValues = {
  kind: 'irrigation',
  irrigationMethod: 'drip',
  dripFlowBasis: 'emitters',
  noneApplied: false,
  amendmentKind: '',
  note: '',
  ...blankAmounts,
};

/**
 * A field event at a site, on the field-event form contract: amounts are typed in the reader's
 * units and converted to the stored units by the contract, whose messages show beside the
 * fields. For irrigation the depth of water is computed here, shown before saving, and
 * computed again by the server from the same inputs.
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
  const schema = useMemo(() => fieldEventForm(units), [units]);
  const unitOf = fieldEventUnits(units);
  const form = useContractForm(schema, blank);
  const { errors, isSubmitting } = form.formState;
  const typed = form.watch();
  const { kind, irrigationMethod: method } = typed;

  // What would be saved now, if the form were sent: the depth and the outbox label read it.
  const parsed = schema.safeParse(typed);
  const inputs = parsed.success && kind === 'irrigation' ? irrigationInputsOf(parsed.data) : null;
  const depth = inputs ? waterDepthMm(inputs) : null;

  const amount = (k: FieldEventAmount) => (
    <TextField
      label={`${amountLabels[k]} (${unitOf[k].unit})`}
      error={errors[k]?.message}
      inputMode="decimal"
      autoComplete="off"
      {...form.register(k)}
    />
  );

  const onSubmit = submitTo(form, async (event) => {
    const describe = () => {
      switch (event.kind) {
        case 'irrigation':
          return depth !== null
            ? `${kindLabels.irrigation} (${event.irrigationMethod}) ${formatDepth(depth, units)}`
            : kindLabels.irrigation;
        case 'rainfall':
          return event.rainMm !== null ? `Rain ${formatDepth(event.rainMm, units)}` : 'Rain';
        case 'fertilizer':
          return event.noneApplied
            ? 'Fertilizer: none applied'
            : `Fertilizer: ${event.amendmentKind ?? ''}`;
        case 'thinning':
        case 'pruning':
        case 'transplanting':
        case 'note':
          return kindLabels[event.kind];
        default: {
          // Every kind is handled above; a new kind in fieldEventKinds stops the build here.
          const unhandled: never = event.kind;
          return String(unhandled);
        }
      }
    };
    await onSave([
      newRecord(
        slug,
        'field-event',
        'field-events',
        { siteId, occurredOn: date, ...event },
        `${date} · ${describe()}`,
      ),
    ]);
    // The next event is often of the same kind and method: keep those, clear what was typed.
    const { irrigationMethod, dripFlowBasis } = form.getValues();
    form.reset({ ...blank, kind: event.kind, irrigationMethod, dripFlowBasis });
  });

  return (
    <form aria-label="Field event" className="space-y-3" noValidate onSubmit={onSubmit}>
      <SelectField
        label="What happened"
        error={errors.kind?.message}
        options={fieldEventKinds.map((k) => [k, kindLabels[k]] as const)}
        {...form.register('kind')}
      />

      {kind === 'irrigation' ? (
        <>
          <CautionNote id="irrigation-backflow" />
          <fieldset>
            <legend className="mb-1 font-medium">Method</legend>
            <div className="flex flex-wrap gap-2">
              {methods.map(([m, label]) => (
                <label
                  key={m}
                  className={`flex min-h-11 cursor-pointer items-center rounded-lg border px-3 font-semibold has-[:focus-visible]:ring-2 has-[:focus-visible]:ring-pod-500 ${
                    method === m
                      ? 'border-leaf-700 bg-leaf-700 text-white'
                      : 'border-leaf-300 bg-white'
                  }`}
                >
                  <input
                    type="radio"
                    value={m}
                    className="sr-only"
                    {...form.register('irrigationMethod')}
                  />
                  {label}
                </label>
              ))}
            </div>
          </fieldset>
          {amount('runTimeMin')}
          {method === 'drip' ? (
            <>
              <fieldset className="flex flex-wrap gap-3">
                <legend className="mb-1 font-medium">Drip flow given as</legend>
                <label className="flex min-h-11 items-center gap-2">
                  <input type="radio" value="emitters" {...form.register('dripFlowBasis')} />
                  Emitter flow and spacing
                </label>
                <label className="flex min-h-11 items-center gap-2">
                  <input type="radio" value="line" {...form.register('dripFlowBasis')} />
                  Line flow per length
                </label>
              </fieldset>
              <div className="grid grid-cols-2 gap-3">
                {typed.dripFlowBasis === 'emitters' ? (
                  <>
                    {amount('dripEmitterFlowLPerH')}
                    {amount('dripEmitterSpacingMm')}
                  </>
                ) : (
                  amount('dripLineFlowLPerHPerM')
                )}
                {amount('wettedWidthMm')}
              </div>
            </>
          ) : method === 'overhead' ? (
            amount('sprinklerRateMmPerH')
          ) : (
            <div className="grid grid-cols-2 gap-3">
              {amount('handVolumeL')}
              {amount('wettedAreaM2')}
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

      {kind === 'rainfall' ? amount('rainMm') : null}

      {kind === 'fertilizer' ? (
        <>
          <CautionNote id="fertilizer-handling" />
          <label className="flex min-h-11 items-center gap-2 font-medium">
            <input type="checkbox" className="h-5 w-5" {...form.register('noneApplied')} />
            None applied (recorded on purpose)
          </label>
          {!typed.noneApplied ? (
            <div className="grid grid-cols-2 gap-3">
              <TextField
                label="What was applied"
                error={errors.amendmentKind?.message}
                autoComplete="off"
                {...form.register('amendmentKind')}
              />
              {amount('rateGPerM2')}
            </div>
          ) : null}
        </>
      ) : null}

      {kind === 'thinning' ? amount('targetSpacingMm') : null}

      <TextArea
        label={kind === 'note' ? 'Note' : 'Note (optional)'}
        rows={2}
        error={errors.note?.message}
        {...form.register('note')}
      />
      {formRefusal(form) ? <FormMessage tone="error">{formRefusal(form)}</FormMessage> : null}
      <button
        type="submit"
        disabled={isSubmitting}
        className="min-h-12 w-full rounded-lg bg-leaf-700 px-4 text-lg font-semibold text-white disabled:bg-leaf-300"
      >
        Save event
      </button>
    </form>
  );
}
