import { useState } from 'react';
import type { UnitSystem } from '@common/contracts/me';
import { MM_PER_INCH } from '@common/units';
import { Button } from '@/components/ui/button';
import { ApiError } from '@/lib/api-client';
import { usePutWeatherDay } from '../api/put-weather-day';

const field = 'mt-1 min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3';

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
  const [siteId, setSiteId] = useState(sites[0]?.id ?? '');
  const [date, setDate] = useState(() => new Date().toISOString().slice(0, 10));
  const [low, setLow] = useState('');
  const [high, setHigh] = useState('');
  const [rain, setRain] = useState('');
  const deg = system === 'metric' ? '°C' : '°F';
  const depth = system === 'metric' ? 'mm' : 'in';
  const toC = (v: string) =>
    v.trim() === '' ? null : system === 'metric' ? Number(v) : ((Number(v) - 32) * 5) / 9;
  const toMm = (v: string) =>
    v.trim() === '' ? null : system === 'metric' ? Number(v) : Number(v) * MM_PER_INCH;
  const fieldError = (name: string) =>
    save.error instanceof ApiError
      ? save.error.fields.find((f) => f.path === `body.${name}`)?.message
      : undefined;

  return (
    <form
      className="mt-4 rounded-lg border border-leaf-100 p-3"
      aria-labelledby="weather-day-heading"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate({ siteId, date, tminC: toC(low), tmaxC: toC(high), rainMm: toMm(rain) });
      }}
    >
      <h3 id="weather-day-heading" className="font-semibold text-leaf-900">
        Type in one day
      </h3>
      <div className="mt-2 grid gap-2 sm:grid-cols-5">
        <label className="text-sm font-medium">
          Site
          <select className={field} value={siteId} onChange={(e) => setSiteId(e.target.value)}>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Date
          <input
            type="date"
            className={field}
            value={date}
            required
            onChange={(e) => setDate(e.target.value)}
          />
        </label>
        {(
          [
            ['tminC', `Low (${deg})`, low, setLow],
            ['tmaxC', `High (${deg})`, high, setHigh],
            ['rainMm', `Rain (${depth})`, rain, setRain],
          ] as const
        ).map(([name, label, value, set]) => (
          <label key={name} className="text-sm font-medium">
            {label}
            <input
              type="number"
              inputMode="decimal"
              step="any"
              className={field}
              value={value}
              onChange={(e) => set(e.target.value)}
              aria-invalid={fieldError(name) ? true : undefined}
            />
            {fieldError(name) ? (
              <span className="text-xs text-frost-600">{fieldError(name)}</span>
            ) : null}
          </label>
        ))}
      </div>
      {save.error && !(save.error instanceof ApiError && save.error.fields.length) ? (
        <p role="alert" className="mt-2 text-sm text-frost-600">
          {save.error.message}
        </p>
      ) : null}
      <div className="mt-2 flex items-center gap-3">
        <Button type="submit" disabled={save.isPending || !siteId}>
          {save.isPending ? 'Saving…' : 'Save the day'}
        </Button>
        {save.isSuccess ? (
          <p role="status" className="text-sm text-leaf-700">
            Saved {save.variables?.date}.
          </p>
        ) : null}
      </div>
    </form>
  );
}
