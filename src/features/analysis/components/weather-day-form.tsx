import type { UnitSystem } from '@common/contracts/me';
import { weatherDayForm } from '@common/contracts/weather';
import { localToday } from '@common/calendar-date';
import { Button } from '@/components/ui/button';
import { TODAY_HINT } from '@/components/ui/field-date';
import { FormMessage, SelectField, TextField } from '@/components/ui/text-field';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { usePutWeatherDay } from '../api/put-weather-day';

/** A reading from a home station typed in for one day: low, high and rain, in the reader's units. */
export function WeatherDayForm({
  slug,
  sites,
  system,
}: {
  slug: string;
  sites: { id: string; name: string }[];
  system: UnitSystem;
}) {
  const save = usePutWeatherDay(slug);
  const form = useContractForm(weatherDayForm(system), {
    siteId: sites[0]?.id ?? '',
    date: localToday(),
    tminC: '',
    tmaxC: '',
    rainMm: '',
  });
  const { errors, isSubmitting, isSubmitSuccessful } = form.formState;
  const onSubmit = submitTo(form, (day) => save.mutateAsync(day));
  const refusal = formRefusal(form);
  const deg = system === 'metric' ? '°C' : '°F';
  const depth = system === 'metric' ? 'mm' : 'in';

  return (
    <form
      className="mt-4 rounded-lg border border-leaf-100 p-3"
      aria-labelledby="weather-day-heading"
      noValidate
      onSubmit={onSubmit}
    >
      <h3 id="weather-day-heading" className="font-semibold text-leaf-900">
        Type in one day
      </h3>
      <div className="mt-2 grid gap-2 text-sm sm:grid-cols-5">
        <SelectField
          label="Site"
          error={errors.siteId?.message}
          options={sites.map((s) => [s.id, s.name] as const)}
          {...form.register('siteId')}
        />
        <TextField
          label="Date"
          type="date"
          hint={TODAY_HINT}
          required
          error={errors.date?.message}
          {...form.register('date')}
        />
        <TextField
          label={`Low (${deg})`}
          inputMode="decimal"
          error={errors.tminC?.message}
          {...form.register('tminC')}
        />
        <TextField
          label={`High (${deg})`}
          inputMode="decimal"
          error={errors.tmaxC?.message}
          {...form.register('tmaxC')}
        />
        <TextField
          label={`Rain (${depth})`}
          inputMode="decimal"
          error={errors.rainMm?.message}
          {...form.register('rainMm')}
        />
      </div>
      {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
      <div className="mt-2 flex items-center gap-3">
        <Button type="submit" disabled={isSubmitting || sites.length === 0}>
          {isSubmitting ? 'Saving…' : 'Save the day'}
        </Button>
        {isSubmitSuccessful && save.variables ? (
          <p role="status" className="text-sm text-leaf-700">
            Saved {save.variables.date}.
          </p>
        ) : null}
      </div>
    </form>
  );
}
