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
            <table className="w-full min-w-[40rem] text-left text-sm">
              <caption className="p-2 text-left font-semibold text-leaf-900">
                Degree days, hot days and water received per site
              </caption>
              <thead className="bg-leaf-50 text-leaf-900">
                <tr>
                  <th scope="col" className="p-2">
                    Site
                  </th>
                  <th scope="col" className="p-2 text-right">
                    Degree days
                  </th>
                  <th scope="col" className="p-2 text-right">
                    Hot days
                  </th>
                  <th scope="col" className="p-2 text-right">
                    Rain
                  </th>
                  <th scope="col" className="p-2 text-right">
                    Irrigation
                  </th>
                  <th scope="col" className="p-2 text-right">
                    Total water
                  </th>
                  <th scope="col" className="p-2 text-right">
                    Harvest days
                  </th>
                </tr>
              </thead>
              <tbody>
                {data.sites.map((s) => (
                  <tr key={s.siteId} className="border-t border-leaf-50">
                    <th scope="row" className="p-2 font-medium">
                      {s.siteName}
                      <span className="block text-xs font-normal text-loam-700">
                        {s.weatherDays} weather days; rain from {s.rainSource}
                      </span>
                    </th>
                    <td className="p-2 text-right tabular-nums">
                      {formatDegreeDays(s.degreeDays, system)}
                    </td>
                    <td className="p-2 text-right tabular-nums">{s.hotDays}</td>
                    <td className="p-2 text-right tabular-nums">
                      {formatDepth(s.water.rainMm, system)}
                    </td>
                    <td className="p-2 text-right tabular-nums">
                      {formatDepth(s.water.irrigationMm, system)}
                    </td>
                    <td className="p-2 text-right tabular-nums">
                      {formatDepth(s.water.totalMm, system)}
                    </td>
                    <td className="p-2 text-right tabular-nums">{s.harvests.length}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
          {data.sites.map((s) =>
            s.harvests.length > 0 ? (
              <details key={s.siteId} className="mt-2 rounded-lg bg-white p-2 shadow-sm">
                <summary className="min-h-11 cursor-pointer py-2 font-semibold">
                  {s.siteName}: harvests against degree days and water
                </summary>
                <ScrollRegion label={`${s.siteName}: harvests against degree days and water`}>
                  <table className="w-full min-w-[32rem] text-left text-sm">
                    <caption className="sr-only">
                      Harvest dates at {s.siteName} with degree days and water to date
                    </caption>
                    <thead className="bg-leaf-50 text-leaf-900">
                      <tr>
                        <th scope="col" className="p-2">
                          Date
                        </th>
                        <th scope="col" className="p-2 text-right">
                          Days from start
                        </th>
                        <th scope="col" className="p-2 text-right">
                          Plots picked
                        </th>
                        <th scope="col" className="p-2 text-right">
                          Degree days to date
                        </th>
                        <th scope="col" className="p-2 text-right">
                          Water since last pick
                        </th>
                      </tr>
                    </thead>
                    <tbody>
                      {s.harvests.map((h) => (
                        <tr key={h.date} className="border-t border-leaf-50">
                          <th scope="row" className="p-2 font-normal">
                            {h.date}
                          </th>
                          <td className="p-2 text-right tabular-nums">{h.daysFromStart ?? '—'}</td>
                          <td className="p-2 text-right tabular-nums">{h.plotsHarvested}</td>
                          <td className="p-2 text-right tabular-nums">
                            {formatDegreeDays(h.degreeDays, system)}
                          </td>
                          <td className="p-2 text-right tabular-nums">
                            {formatDepth(h.sinceLastHarvestMm, system)}
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
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
