import type { FieldEvent } from '@common/contracts/records';
import { formatDepth, formatLength } from '@common/units';
import { type WaterWeek, weeklyWaterSummary } from '@common/water';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { useState } from 'react';
import { useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { localToday } from '@common/calendar-date';
import { FieldDate } from '@/components/ui/field-date';
import { useFieldEvents } from '../api/get-field-events';
import { useOutbox } from '../api/use-outbox';
import { FieldEventForm } from '../components/field-event-form';
import { FieldLogCrumbs } from '../components/field-log-crumbs';
import { DeviceOutbox } from '../components/outbox-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { SiteChooser } from '../components/site-chooser';
import { mySitesOf, useRoundSite } from '../api/field-log-memory';

const weekCol = createColumnHelper<WaterWeek>();
const kindWord: Record<FieldEvent['kind'], string> = {
  irrigation: 'Irrigation',
  rainfall: 'Rain',
  fertilizer: 'Fertilizer',
  thinning: 'Thinning',
  pruning: 'Pruning',
  transplanting: 'Transplanting',
  note: 'Note',
};

/** Field events at a site: the form, the weekly water summary and the season's timeline. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const units = useUnitSystem();
  const outbox = useOutbox(slug);
  const mySites = trial.data ? mySitesOf(trial.data) : undefined;
  const [siteId, setSiteId] = useRoundSite(slug, mySites);
  const [date, setDate] = useState(localToday);
  const events = useFieldEvents(slug, siteId ?? undefined);

  if (trial.isPending) return <Spinner label="Loading the trial…" />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const t = trial.data;
  const canWrite = t.permissions['records.write'];
  const list = events.data?.events ?? [];
  const weeks = weeklyWaterSummary(list);
  const detail = (e: FieldEvent) => {
    switch (e.kind) {
      case 'irrigation':
        return `${e.irrigationMethod ?? ''}, ${e.runTimeMin ?? '?'} min, ${e.waterDepthMm !== null ? formatDepth(e.waterDepthMm, units) : 'depth unknown'}`;
      case 'rainfall':
        return e.rainMm !== null ? formatDepth(e.rainMm, units) : '';
      case 'fertilizer':
        return e.noneApplied
          ? 'none applied'
          : `${e.amendmentKind ?? ''}, ${e.rateGPerM2 ?? '?'} g/m²`;
      case 'thinning':
        return e.targetSpacingMm !== null ? `to ${formatLength(e.targetSpacingMm, units)}` : '';
      case 'pruning':
      case 'transplanting':
      case 'note':
        return '';
      default: {
        // Every kind is handled above; a new kind in fieldEventKinds stops the build here.
        const unhandled: never = e.kind;
        return String(unhandled);
      }
    }
  };

  return (
    <article className="mx-auto max-w-3xl space-y-4">
      <header>
        <FieldLogCrumbs slug={slug} title={t.title} />
        <h1 className="text-2xl font-semibold text-leaf-900">Field events and water</h1>
      </header>
      <SiteChooser sites={mySites ?? []} siteId={siteId} onChoose={setSiteId} />

      {siteId && canWrite ? (
        <section aria-labelledby="event-heading" className="rounded-xl bg-white p-3 shadow-sm">
          <h2 id="event-heading" className="text-lg font-semibold text-leaf-900">
            Record an event
          </h2>
          <FieldDate date={date} onChange={setDate} className="my-2 w-56" />
          <FieldEventForm
            key={siteId}
            slug={slug}
            siteId={siteId}
            date={date}
            units={units}
            onSave={(entries) => outbox.add(entries)}
          />
        </section>
      ) : null}

      {siteId ? (
        <>
          <section aria-labelledby="water-heading" className="rounded-xl bg-white p-3 shadow-sm">
            <h2 id="water-heading" className="text-lg font-semibold text-leaf-900">
              Water by week
            </h2>
            {events.isPending ? (
              <Spinner label="Loading events…" />
            ) : weeks.length === 0 ? (
              <p className="text-sm text-loam-700">
                No rain or irrigation recorded at this site yet.
              </p>
            ) : (
              <ScrollRegion label="Water received per week">
                <DataTable
                  className="mt-2"
                  caption="Rain plus irrigation depth per week (weeks start on Monday)"
                  data={weeks}
                  rowId={(w) => w.weekStart}
                  rowHeader="weekStart"
                  columns={[
                    weekCol.accessor('weekStart', { header: 'Week of' }),
                    weekCol.accessor('rainMm', {
                      header: 'Rain',
                      cell: (c) => formatDepth(c.getValue(), units),
                      meta: { align: 'right' },
                    }),
                    weekCol.accessor('irrigationMm', {
                      header: 'Irrigation',
                      cell: (c) => formatDepth(c.getValue(), units),
                      meta: { align: 'right' },
                    }),
                    weekCol.accessor('totalMm', {
                      header: 'Total',
                      cell: (c) => formatDepth(c.getValue(), units),
                      meta: { align: 'right', cellClassName: () => 'font-semibold' },
                    }),
                  ]}
                />
              </ScrollRegion>
            )}
          </section>
          <section aria-labelledby="timeline-heading" className="rounded-xl bg-white p-3 shadow-sm">
            <h2 id="timeline-heading" className="text-lg font-semibold text-leaf-900">
              Season timeline
            </h2>
            <ol className="mt-2 space-y-2 border-l-2 border-leaf-300 pl-4">
              {[...list]
                .sort((a, b) => a.occurredOn.localeCompare(b.occurredOn))
                .map((e) => (
                  <li key={e.id} className="text-sm">
                    <span className="font-semibold">{e.occurredOn}</span> · {kindWord[e.kind]}
                    {e.plotNumber !== null ? ` (plot ${e.plotNumber})` : ''} {detail(e)}
                    {e.note ? <span className="block text-loam-700">{e.note}</span> : null}
                  </li>
                ))}
            </ol>
          </section>
        </>
      ) : (
        <p>Choose a site to record events and see its water.</p>
      )}

      <DeviceOutbox outbox={outbox} />
    </article>
  );
}
