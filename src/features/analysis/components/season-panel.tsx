import type { UnitSystem } from '@common/contracts/me';
import { formatDepth } from '@common/units';
import { useId } from 'react';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useSeason } from '../api/get-season';
import { cToF, formatDegreeDays, formatNumber } from '@common/display-units';
import { WeatherDayForm } from './weather-day-form';
import { WeatherImport } from './weather-import';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { DataTable } from '@/components/ui/data-table';
import type { SeasonSite } from '@common/contracts/weather';
import { createColumnHelper } from '@tanstack/react-table';

const siteCol = createColumnHelper<SeasonSite>();
const harvestCol = createColumnHelper<SeasonSite['harvests'][number]>();

export function SeasonPanel({
  slug,
  system,
  sites,
  canWrite,
}: {
  slug: string;
  system: UnitSystem;
  sites: { id: string; name: string }[];
  canWrite: boolean;
}) {
  const id = useId();
  const { data, error, isPending } = useSeason(slug);
  const t = (c: number) => (system === 'metric' ? `${c} °C` : `${Math.round(cToF(c))} °F`);
  return (
    <section aria-labelledby={`${id}-h`} className="mt-8">
      <h2 id={`${id}-h`} className="text-2xl font-semibold text-leaf-900">
        Season context
      </h2>
      {isPending ? <Spinner label="Adding up the season…" /> : null}
      {error ? <ErrorPanel error={error} /> : null}
      {data ? (
        <>
          <p className="mt-1 max-w-prose text-sm">
            Growing degree days from {data.startsFrom || 'the first weather day'}: {data.method}.
            Base {t(data.thresholds.baseC)}, upper threshold {t(data.thresholds.upperC)} (
            {data.thresholds.source}). Hot day: a high of {t(data.hotDayC)} or more (
            {data.hotDaySource}).
          </p>
          <ScrollRegion
            label="Degree days, hot days and water per site"
            className="mt-2 rounded-lg bg-white shadow-sm"
          >
            <DataTable
              showCaption
              className="min-w-[40rem]"
              caption="Degree days, hot days and water received per site"
              data={data.sites}
              rowId={(s) => s.siteId}
              rowHeader="site"
              columns={[
                siteCol.accessor('siteName', {
                  id: 'site',
                  header: 'Site',
                  cell: ({ row: { original: s } }) => (
                    <>
                      {s.siteName}
                      <span className="block text-xs font-normal text-loam-700">
                        {s.weatherDays} weather days; rain from {s.rainSource}
                      </span>
                    </>
                  ),
                }),
                siteCol.accessor('degreeDays', {
                  header: 'Degree days',
                  cell: (c) => formatDegreeDays(c.getValue(), system),
                  meta: { align: 'right' },
                }),
                siteCol.accessor('hotDays', { header: 'Hot days', meta: { align: 'right' } }),
                ...(
                  [
                    ['rainMm', 'Rain'],
                    ['irrigationMm', 'Irrigation'],
                    ['totalMm', 'Total water'],
                  ] as const
                ).map(([part, header]) =>
                  siteCol.accessor((s) => s.water[part], {
                    id: part,
                    header,
                    cell: (c) => formatDepth(c.getValue(), system),
                    meta: { align: 'right' },
                  }),
                ),
                siteCol.accessor((s) => s.harvests.length, {
                  id: 'harvestDays',
                  header: 'Harvest days',
                  meta: { align: 'right' },
                }),
              ]}
            />
          </ScrollRegion>
          {data.sites.map((s) =>
            s.harvests.length > 0 ? (
              <details key={s.siteId} className="mt-2 rounded-lg bg-white p-2 shadow-sm">
                <summary className="min-h-11 cursor-pointer py-2 font-semibold">
                  {s.siteName}: harvests against degree days and water
                </summary>
                <ScrollRegion label={`${s.siteName}: harvests against degree days and water`}>
                  <DataTable
                    className="min-w-[32rem]"
                    caption={`Harvest dates at ${s.siteName} with degree days and water to date`}
                    data={s.harvests}
                    rowId={(h) => h.date}
                    rowHeader="date"
                    columns={[
                      harvestCol.accessor('date', { header: 'Date' }),
                      harvestCol.accessor((h) => h.daysFromStart ?? undefined, {
                        id: 'daysFromStart',
                        header: 'Days from start',
                        cell: (c) => c.getValue() ?? '—',
                        sortUndefined: 'last',
                        meta: { align: 'right' },
                      }),
                      harvestCol.accessor('plotsHarvested', {
                        header: 'Plots picked',
                        meta: { align: 'right' },
                      }),
                      harvestCol.accessor('degreeDays', {
                        header: 'Degree days to date',
                        cell: (c) => formatDegreeDays(c.getValue(), system),
                        meta: { align: 'right' },
                      }),
                      harvestCol.accessor('sinceLastHarvestMm', {
                        header: 'Water since last pick',
                        cell: (c) => formatDepth(c.getValue(), system),
                        meta: { align: 'right' },
                      }),
                    ]}
                  />
                </ScrollRegion>
                <p className="mt-1 text-xs text-loam-700">
                  {formatNumber(s.weeks.length)} weeks of records.
                </p>
              </details>
            ) : null,
          )}
          <ul
            className="mt-3 list-disc space-y-0.5 rounded-lg border-l-4 border-pod-500 bg-straw-100 p-3 pl-8 text-sm"
            aria-label="Cautions"
          >
            {data.cautions.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
          {canWrite ? (
            <>
              <WeatherDayForm slug={slug} sites={sites} system={system} />
              <WeatherImport slug={slug} sites={sites} />
            </>
          ) : null}
        </>
      ) : null}
    </section>
  );
}
