import { weatherImportForm, type WeatherImportRowError } from '@common/contracts/weather';
import { Button } from '@/components/ui/button';
import { FormMessage, SelectField, TextArea } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-client';
import { formRefusal, submitTo, useContractForm } from '@/lib/contract-form';
import { useImportWeather } from '../api/import-weather';

/** A home station's daily CSV: preview every row and problem first, then import all or none. */
export function WeatherImport({
  slug,
  sites,
}: {
  slug: string;
  sites: { id: string; name: string }[];
}) {
  const mutation = useImportWeather(slug);
  const form = useContractForm(weatherImportForm, {
    siteId: sites[0]?.id ?? '',
    csv: '',
    temperatureUnit: 'C',
    rainUnit: 'mm',
  });
  const { errors, isSubmitting } = form.formState;
  const check = submitTo(form, (body) => mutation.mutateAsync({ ...body, dryRun: true }));
  const importAll = submitTo(form, (body) => mutation.mutateAsync({ ...body, dryRun: false }));
  const preview = mutation.data;
  const rowErrors: WeatherImportRowError[] =
    mutation.error instanceof ApiError
      ? ((mutation.error.details as { rows?: WeatherImportRowError[] })?.rows ?? [])
      : (preview?.errors ?? []);
  const refusal = formRefusal(form);
  // A changed file or setting needs a new check before it can be imported.
  const changed = () => mutation.reset();
  const csv = form.register('csv', { onChange: changed });
  return (
    <details className="mt-4 rounded-lg bg-white p-3 shadow-sm">
      <summary className="min-h-11 cursor-pointer py-2 font-semibold">
        Import daily weather from a home station (CSV)
      </summary>
      <form noValidate onSubmit={check} aria-label="Import daily weather">
        <p className="text-sm">
          Columns: date (2026-06-01), tmin, tmax, rain. A day already stored is replaced.
        </p>
        <div className="mt-2 grid gap-2 text-sm sm:grid-cols-3">
          <SelectField
            label="Site"
            error={errors.siteId?.message}
            options={sites.map((s) => [s.id, s.name] as const)}
            {...form.register('siteId', { onChange: changed })}
          />
          <SelectField
            label="Temperatures in"
            options={[
              ['C', '°C'],
              ['F', '°F'],
            ]}
            {...form.register('temperatureUnit', { onChange: changed })}
          />
          <SelectField
            label="Rain in"
            options={[
              ['mm', 'mm'],
              ['in', 'inches'],
            ]}
            {...form.register('rainUnit', { onChange: changed })}
          />
        </div>
        <TextArea
          className="mt-2 text-sm"
          label="Station file"
          rows={6}
          error={errors.csv?.message}
          {...csv}
        />
        <input
          type="file"
          accept=".csv,text/csv,text/plain"
          aria-label="Or choose the station file"
          className="mt-1 block min-h-11 text-sm"
          onChange={async (e) => {
            const f = e.target.files?.[0];
            if (f) {
              form.setValue('csv', await f.text(), { shouldValidate: form.formState.isSubmitted });
              changed();
            }
          }}
        />
        <div className="mt-2 flex flex-wrap gap-2">
          <Button type="submit" variant="secondary" disabled={isSubmitting}>
            Check the file
          </Button>
          <Button
            type="button"
            disabled={!preview || !preview.dryRun || preview.errors.length > 0 || isSubmitting}
            onClick={importAll}
          >
            Import {preview?.rows.length ?? ''} days
          </Button>
        </div>
        <div aria-live="polite" className="mt-2 text-sm">
          {isSubmitting ? <p role="status">Working…</p> : null}
          {preview && preview.dryRun ? (
            <p>
              {preview.rows.length} days ready ({preview.rows.filter((r) => r.replaces).length}{' '}
              replace stored days); {preview.errors.length} problems.
            </p>
          ) : null}
          {preview && !preview.dryRun ? (
            <p role="status">{preview.written} days imported.</p>
          ) : null}
          {refusal && rowErrors.length === 0 ? (
            <FormMessage tone="error">{refusal}</FormMessage>
          ) : null}
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
      </form>
    </details>
  );
}
