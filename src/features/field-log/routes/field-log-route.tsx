import { isSpinyCrop } from '@common/cautions';
import { useCallback, useEffect, useState } from 'react';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { CautionNote } from '@/components/ui/caution-note';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { localToday } from '@common/calendar-date';
import { FieldDate } from '@/components/ui/field-date';
import { useRecordPlots } from '../api/get-record-plots';
import { useOutbox } from '../api/use-outbox';
import {
  HarvestForm,
  MeasureForm,
  NoteForm,
  type QueuedEntry,
  ScoreForm,
  StandCountForm,
} from '../components/entry-forms';
import { DeviceOutbox } from '../components/outbox-panel';
import { CautionOnce } from '../components/caution-once';
import { LabelScanner } from '../components/label-scanner';
import { PlotPhoto } from '../components/plot-photo';
import { PlotPicker, plotTreatment } from '../components/plot-picker';
import { SiteChooser } from '../components/site-chooser';
import { mySitesOf, useCautionSeen, useRoundSite } from '../api/field-log-memory';

const forms = {
  harvest: { label: 'Harvest', Form: HarvestForm },
  measure: { label: 'Measure', Form: MeasureForm },
  score: { label: 'Score', Form: ScoreForm },
  stand: { label: 'Stand count', Form: StandCountForm },
  note: { label: 'Note', Form: NoteForm },
} as const;
type FormKey = keyof typeof forms;

/** The grower's field log: a site, a plot, a quick form; "next plot" keeps date and form. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const plots = useRecordPlots(slug);
  const units = useUnitSystem();
  const outbox = useOutbox(slug);
  const [search, setSearch] = useSearchParams();
  const navigate = useNavigate();
  const onScanned = useCallback((path: string) => navigate(path), [navigate]);
  const mySites = trial.data ? mySitesOf(trial.data) : undefined;
  const [siteId, setSiteId] = useRoundSite(slug, mySites);
  const [plotId, setPlotId] = useState<string | null>(null);
  const [spinySeen, markSpinySeen] = useCautionSeen(slug, 'spiny-crop');
  const [date, setDate] = useState(localToday);
  const [form, setForm] = useState<FormKey>('harvest');
  const [saved, setSaved] = useState<string | null>(null);

  // A scanned plot label opens the log at that plot (?plot=<id>), at the plot's own site.
  const wantedPlot = search.get('plot');
  const scanned = wantedPlot ? plots.data?.plots.find((p) => p.plotId === wantedPlot) : undefined;
  useEffect(() => {
    if (!scanned) return;
    setSiteId(scanned.siteId);
    setPlotId(scanned.plotId);
    setSearch({}, { replace: true });
  }, [scanned, setSearch, setSiteId]);

  if (trial.isPending || plots.isPending) return <Spinner label="Loading the field log…" />;
  // A refetch that fails (the signal dropping again as it returns) leaves the log on screen with
  // what the device already has; only a log with nothing to show says it could not be loaded.
  if (!trial.data) return <ErrorPanel error={trial.error} />;
  if (!plots.data) return <ErrorPanel error={plots.error} />;
  const t = trial.data;
  const firstPlotOf = (id: string) => plots.data.plots.find((p) => p.siteId === id)?.plotId ?? null;
  const canWrite = t.permissions['records.write'];
  const canNote = t.permissions['notes.write'];
  const sitePlots = plots.data.plots.filter((p) => p.siteId === siteId);
  const plot =
    sitePlots.find((p) => p.plotId === plotId) ??
    (plotId === null && siteId ? (sitePlots[0] ?? null) : null);
  // A two-factor trial's plot is named with its level of the treatment ("Fertilizer: none").
  const level = plot ? plotTreatment(t.factor?.name, plot) : null;
  const spiny = isSpinyCrop(t.crop) || t.traits.some((tr) => tr.key === 'spines');
  const available = (Object.keys(forms) as FormKey[]).filter((k) =>
    k === 'note' ? canNote : canWrite,
  );
  const activeForm = available.includes(form) ? form : available[0];

  const onSave = async (entries: QueuedEntry[], next: boolean) => {
    try {
      await outbox.add(entries);
    } catch (err) {
      setSaved(err instanceof Error ? err.message : 'Not kept: try again.');
      return;
    }
    if (activeForm === 'harvest' && spiny) markSpinySeen();
    setSaved(`Kept on this device: ${entries.map((e) => e.label).join('; ')}`);
    if (next && plot) {
      const i = sitePlots.findIndex((p) => p.plotId === plot.plotId);
      const following = sitePlots[i + 1];
      if (following) setPlotId(following.plotId);
      else setSaved((s) => `${s}. That was the last plot at this site.`);
    }
  };

  if (!canWrite && !canNote)
    return (
      <ErrorPanel
        title="Field log"
        error={new Error('Your role in this trial does not include field records.')}
      />
    );

  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <header>
        <p className="text-sm uppercase tracking-wide text-loam-700">
          <Link to={`/t/${slug}`} className="underline">
            {t.title}
          </Link>
        </p>
        <h1 className="text-2xl font-semibold text-leaf-900">Field log</h1>
        <p className="text-sm">
          <Link
            to={`/t/${slug}/log/events`}
            className="inline-flex min-h-11 items-center underline"
          >
            Irrigation, rain and other field events
          </Link>
          {' · '}
          <Link
            to={`/t/${slug}/log/labels`}
            className="inline-flex min-h-11 items-center underline"
          >
            Plot labels
          </Link>
          {' · '}
          <Link to={`/t/${slug}/log/sheet`} className="inline-flex min-h-11 items-center underline">
            Recording sheet
          </Link>
        </p>
      </header>

      <details className="rounded-lg bg-white p-2 shadow-sm">
        <summary className="min-h-11 cursor-pointer content-center font-semibold text-loam-700">
          Working in heat
        </summary>
        <CautionNote id="field-heat" />
      </details>

      <SiteChooser
        sites={mySites ?? []}
        siteId={siteId}
        onChoose={(id) => {
          setSiteId(id);
          setPlotId(firstPlotOf(id));
        }}
      />

      {siteId ? (
        <section aria-labelledby="plot-heading" className="rounded-xl bg-white p-3 shadow-sm">
          <h2 id="plot-heading" className="text-lg font-semibold text-leaf-900">
            Plot
          </h2>
          <div className="my-2">
            <LabelScanner onFound={onScanned} />
          </div>
          <PlotPicker
            plots={sitePlots}
            currentId={plot?.plotId ?? null}
            onPick={setPlotId}
            factorName={t.factor?.name}
          />
        </section>
      ) : null}

      {plot ? (
        <section aria-labelledby="entry-heading" className="rounded-xl bg-white p-3 shadow-sm">
          <h2
            id="entry-heading"
            className="font-display text-xl font-semibold text-leaf-900"
            aria-live="polite"
          >
            Plot {plot.plotNumber} · {plot.entryName}{' '}
            <span className="text-base font-normal text-loam-700">
              ({plot.entryCode}, block {plot.block}
              {level ? `, ${level}` : ''})
            </span>
          </h2>
          <FieldDate date={date} onChange={setDate} className="mt-2 w-56" />
          <div role="tablist" aria-label="What to record" className="mt-3 flex flex-wrap gap-1">
            {available.map((k) => (
              <button
                key={k}
                type="button"
                role="tab"
                aria-selected={k === activeForm}
                onClick={() => setForm(k)}
                className={`min-h-11 rounded-lg px-3 font-semibold ${
                  k === activeForm ? 'bg-leaf-100 text-leaf-900' : 'text-leaf-700'
                }`}
              >
                {forms[k].label}
              </button>
            ))}
          </div>
          <div role="tabpanel" className="mt-3">
            {activeForm === 'harvest' && spiny ? (
              <CautionOnce id="spiny-crop" seen={spinySeen} />
            ) : null}
            {activeForm
              ? (() => {
                  const { Form } = forms[activeForm];
                  return (
                    <Form
                      key={`${activeForm}`}
                      slug={slug}
                      plot={plot}
                      date={date}
                      units={units}
                      traits={t.traits}
                      onSave={onSave}
                    />
                  );
                })()
              : null}
          </div>
          {saved ? (
            <p role="status" className="mt-2 text-sm text-leaf-900">
              {saved}
            </p>
          ) : null}
          {t.permissions['photos.upload'] ? (
            <PlotPhoto
              key={plot.plotId}
              slug={slug}
              plot={plot}
              date={date}
              onQueue={async (items) => {
                try {
                  await outbox.add(items);
                  setSaved(`Photo kept on this device: ${items.map((i) => i.label).join('; ')}`);
                } catch (err) {
                  setSaved(err instanceof Error ? err.message : 'Not kept: try again.');
                }
              }}
            />
          ) : null}
        </section>
      ) : null}

      <DeviceOutbox outbox={outbox} />
    </article>
  );
}
