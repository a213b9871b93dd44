import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ApiError } from '@/lib/api-client';
import { useImportWeather } from '../api/import-weather';

/** A home station's daily CSV: preview every row and problem first, then import all or none. */
export function WeatherImport({
  slug,
  sites,
}: {
  slug: string;
  sites: { id: string; name: string }[];
}) {
  const id = useId();
  const [siteId, setSiteId] = useState(sites[0]?.id ?? '');
  const [csv, setCsv] = useState('');
  const [temperatureUnit, setTemperatureUnit] = useState<'C' | 'F'>('C');
  const [rainUnit, setRainUnit] = useState<'mm' | 'in'>('mm');
  const mutation = useImportWeather(slug);
  const preview = mutation.data;
  const send = (dryRun: boolean) =>
    mutation.mutate({ siteId, csv, temperatureUnit, rainUnit, dryRun });
  const rowErrors =
    mutation.error instanceof ApiError
      ? ((mutation.error.details as { rows?: { row: number; message: string }[] })?.rows ?? [])
      : (preview?.errors ?? []);
  const select = 'mt-1 min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-2';
  return (
    <details className="mt-4 rounded-lg bg-white p-3 shadow-sm">
      <summary className="min-h-11 cursor-pointer py-2 font-semibold">
        Import daily weather from a home station (CSV)
      </summary>
      <p className="text-sm">
        Columns: date (2026-06-01), tmin, tmax, rain. A day already stored is replaced.
      </p>
      <div className="mt-2 grid gap-2 sm:grid-cols-3">
        <label className="text-sm">
          Site
          <select className={select} value={siteId} onChange={(e) => setSiteId(e.target.value)}>
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          Temperatures in
          <select
            className={select}
            value={temperatureUnit}
            onChange={(e) => setTemperatureUnit(e.target.value as 'C' | 'F')}
          >
            <option value="C">°C</option>
            <option value="F">°F</option>
          </select>
        </label>
        <label className="text-sm">
          Rain in
          <select
            className={select}
            value={rainUnit}
            onChange={(e) => setRainUnit(e.target.value as 'mm' | 'in')}
          >
            <option value="mm">mm</option>
            <option value="in">inches</option>
          </select>
        </label>
      </div>
      <label htmlFor={`${id}-csv`} className="mt-2 block text-sm">
        Station file
      </label>
      <textarea
        id={`${id}-csv`}
        className="mt-1 h-28 w-full rounded-lg border border-leaf-300 p-2 font-mono text-xs"
        value={csv}
        onChange={(e) => {
          setCsv(e.target.value);
          mutation.reset();
        }}
      />
      <input
        type="file"
        accept=".csv,text/csv,text/plain"
        aria-label="Or choose the station file"
        className="mt-1 block min-h-11 text-sm"
        onChange={async (e) => {
          const f = e.target.files?.[0];
          if (f) {
            setCsv(await f.text());
            mutation.reset();
          }
        }}
      />
      <div className="mt-2 flex flex-wrap gap-2">
        <Button
          type="button"
          variant="secondary"
          disabled={!csv || mutation.isPending}
          onClick={() => send(true)}
        >
          Check the file
        </Button>
        <Button
          type="button"
          disabled={!preview || !preview.dryRun || preview.errors.length > 0 || mutation.isPending}
          onClick={() => send(false)}
        >
          Import {preview?.rows.length ?? ''} days
        </Button>
      </div>
      <div aria-live="polite" className="mt-2 text-sm">
        {mutation.isPending ? <p role="status">Working…</p> : null}
        {preview && preview.dryRun ? (
          <p>
            {preview.rows.length} days ready ({preview.rows.filter((r) => r.replaces).length}{' '}
            replace stored days); {preview.errors.length} problems.
          </p>
        ) : null}
        {preview && !preview.dryRun ? <p role="status">{preview.written} days imported.</p> : null}
        {mutation.error && rowErrors.length === 0 ? <ErrorPanel error={mutation.error} /> : null}
        {rowErrors.length > 0 ? (
          <ul className="mt-1 list-disc pl-5 text-frost-600">
            {rowErrors.map((e, i) => (
              <li key={i}>
                Line {e.row}: {e.message}
              </li>
            ))}
          </ul>
        ) : null}
      </div>
    </details>
  );
}
