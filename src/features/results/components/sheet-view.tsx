import { utcDateOf } from '@common/calendar-date';
import {
  interactionNote,
  licenseLabels,
  sheetModel,
  sheetTraitDecimals,
  type ResultSnapshot,
} from '@common/contracts/results';
import { modelNote, varietyTestNote } from '@common/contracts/analysis';
import type { TrialOffer } from '@common/contracts/seed';
import { displayNumber } from '@common/precision';
import { designLabels } from '@common/contracts/trials';
import { formatDepth } from '@common/units';
import {
  displayUnit,
  formatDegreeDays,
  formatInUnit,
  formatScaled,
  formatTemperature,
  withUnit,
  type DisplayUnit,
} from '@common/display-units';
import { useUnitSystem } from '@/lib/session';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { DataTable } from '@/components/ui/data-table';
import { createColumnHelper } from '@tanstack/react-table';
import { directionWords, rankMeans } from '@common/ranking';
import { CellMeansTable } from './cell-means-table';

function photoUrl(s: ResultSnapshot, photoId: string, variant: 'thumb' | 'display') {
  return `/api/results/${s.trial.slug}/v/${s.version}/photos/${photoId}/${variant}`;
}

type SheetTrait = ResultSnapshot['traits'][number];
type RankedEntry = ResultSnapshot['ranking'][number];
type RankedMean = ReturnType<typeof rankMeans<SheetTrait['means'][number]>>[number];

const rankingCol = createColumnHelper<RankedEntry>();
const meanCol = createColumnHelper<RankedMean>();

// Neither table sorts by its headers: the order of the rows is the sheet's finding (rank order),
// the same on screen, on paper and in the server's drawing, and a re-sorted ranking would show
// its ranks out of order. What sorting by a trait's column would give, each trait's own table
// below already shows: its entries best first by that trait.

/** The ranking across traits: rank, variety, index, then each trait's mean and letter group. */
function rankingColumns(
  sheet: ResultSnapshot,
  du: (t: SheetTrait) => DisplayUnit,
  dm: (t: SheetTrait) => number,
) {
  return [
    rankingCol.accessor('rank', {
      header: 'Rank',
      cell: (c) => c.getValue(),
      meta: { cellClassName: () => 'font-semibold' },
    }),
    rankingCol.accessor('variety', {
      header: 'Variety',
      cell: (c) => <VarietyName sheet={sheet} name={c.getValue()} />,
    }),
    rankingCol.accessor('index', {
      header: 'Index',
      cell: (c) => displayNumber(c.getValue(), 2),
      meta: { align: 'right' },
    }),
    ...sheet.traits.map((t) =>
      rankingCol.accessor((r) => t.means.find((m) => m.variety === r.variety), {
        id: `trait-${t.key}`,
        header: withUnit(t.label, du(t)),
        cell: (c) => {
          const m = c.getValue();
          return m ? `${formatScaled(m.mean, du(t), dm(t))} ${m.group}` : '—';
        },
        meta: { align: 'right', cellClassName: () => 'whitespace-nowrap' },
      }),
    ),
  ];
}

/**
 * An entry's name, linked to its register variety's page when the entry names one (readers
 * signed out see there what published versions show). A plain link: the server draws this too.
 */
function VarietyName({ sheet, name }: { sheet: ResultSnapshot; name: string }) {
  const slug = sheet.entries.find((e) => e.name === name)?.varietySlug;
  if (!slug) return <>{name}</>;
  return (
    <a className="text-leaf-800 underline" href={`/varieties/${slug}`}>
      {name}
    </a>
  );
}

/** One trait's entry means, best first: rank (when the trait has a direction), mean ± SE, letters, plots. */
function meansColumns(t: SheetTrait, unit: DisplayUnit, decimals: number) {
  return [
    ...(t.direction === 'none'
      ? []
      : [meanCol.accessor('rank', { header: 'Rank', cell: (c) => c.getValue() })]),
    meanCol.accessor('variety', { header: 'Variety' }),
    meanCol.accessor('mean', {
      header: withUnit('Mean ± SE', unit),
      cell: ({ row: { original: m } }) => (
        <>
          {formatScaled(m.mean, unit, decimals)} ± {formatScaled(m.se, unit, decimals)}
          {m.adjustedMean === undefined ? null : (
            <span className="block text-xs text-loam-700">
              adjusted {formatScaled(m.adjustedMean, unit, decimals)}
              {m.adjustedSe == null ? '' : ` ± ${formatScaled(m.adjustedSe, unit, decimals)}`}
            </span>
          )}
        </>
      ),
      meta: { align: 'right', cellClassName: () => 'whitespace-nowrap' },
    }),
    meanCol.accessor('group', { header: 'Group', meta: { cellClassName: () => 'font-mono' } }),
    meanCol.accessor('n', { header: 'Plots', meta: { align: 'right' } }),
  ];
}

/**
 * A two-factor trait: the entries above are ranked on their means over every level of the
 * treatment; here the strata, the interaction test and the entry × treatment cells.
 */
function TreatmentCells({
  trait: t,
  unit,
  decimals,
}: {
  trait: SheetTrait;
  unit: DisplayUnit;
  decimals: number;
}) {
  const two = t.twoFactor!;
  const factor = two.factor.toLowerCase();
  return (
    <div className="mt-3" data-strata={two.layout}>
      <p className="text-sm text-loam-700">
        Entries are ranked on their means over all levels of {factor} ({two.levels.join(', ')}).{' '}
        {two.strata}
      </p>
      <p className="text-sm font-semibold">{interactionNote(t)}</p>
      <CellMeansTable
        twoFactor={two}
        varieties={rankMeans(t.means, t.direction).map((m) => m.variety)}
        traitLabel={t.label}
        unit={unit}
        decimals={decimals}
      />
    </div>
  );
}

/** The results sheet as readers see it; the lead's preview uses the same view. */
export function SheetView({
  sheet,
  preview = false,
  offers = [],
}: {
  sheet: ResultSnapshot;
  preview?: boolean;
  /** Open offers of seed of the trial's varieties (live, not part of the published version). */
  offers?: readonly TrialOffer[];
}) {
  const units = useUnitSystem();
  // One display unit per trait: the lead's when published with one, else by its grand mean's size.
  const du = (t: ResultSnapshot['traits'][number]) =>
    displayUnit(t.unit, units, t.grandMean, t.displayUnit);
  const dm = (t: ResultSnapshot['traits'][number]) => sheetTraitDecimals(sheet, t).mean;
  const photos = sheet.entries.filter((e) => e.photo);
  return (
    <article className="sheet mx-auto max-w-4xl">
      <header>
        <p className="text-sm uppercase tracking-wide text-loam-700">
          {sheet.trial.crop} · {sheet.trial.season} · {designLabels[sheet.trial.design]}
        </p>
        <h1 className="mt-1 text-3xl font-semibold text-leaf-900">{sheet.trial.title}</h1>
        <p className="mt-1 text-sm text-loam-700">
          {preview
            ? `Preview of version ${sheet.version}`
            : `Version ${sheet.version}, published ${utcDateOf(sheet.publishedAt)}`}{' '}
          · {sheet.plotCount} plots
        </p>
        <p className="mt-1 text-sm text-loam-700" data-model={sheetModel(sheet)}>
          Analysis: {modelNote(sheetModel(sheet))}
        </p>
        {sheet.changeNote ? (
          <p className="mt-2 rounded bg-straw-200 p-2 text-sm">What changed: {sheet.changeNote}</p>
        ) : null}
        {sheet.summary ? <p className="mt-3 whitespace-pre-line text-lg">{sheet.summary}</p> : null}
      </header>

      {sheet.cautions.map((c) => (
        <aside
          key={c}
          role="note"
          className="mt-4 rounded-lg border-l-4 border-frost-600 bg-white p-3 text-sm"
        >
          <strong>Caution.</strong> {c}
        </aside>
      ))}

      <section aria-labelledby="ranking-heading" className="mt-6">
        <h2 id="ranking-heading" className="text-xl font-semibold text-leaf-900">
          Ranking
        </h2>
        <ScrollRegion
          label="Ranking"
          hint="More traits to the side: swipe or scroll sideways"
          className="mt-2 rounded-lg bg-white shadow-sm"
        >
          <DataTable
            caption="Entries ranked by the weighted index across the chosen traits"
            className="min-w-[20rem]"
            data={sheet.ranking}
            columns={rankingColumns(sheet, du, dm)}
            rowId={(r) => r.variety}
            rowHeader="variety"
            sortable={false}
          />
        </ScrollRegion>
        <p className="mt-1 text-xs text-loam-700">
          Index: weighted mean of each trait's standardised entry means, signed so that better is
          higher. Means followed by the same letter are not significantly different (
          {sheet.letters === 'hsd' ? "Tukey's HSD" : "Fisher's LSD"}, α = {sheet.alpha}).
        </p>
      </section>

      {sheet.traits.map((t) => (
        <section key={t.key} aria-labelledby={`trait-${t.key}`} className="trait-section mt-6">
          <h2 id={`trait-${t.key}`} className="text-xl font-semibold text-leaf-900">
            {t.label}
          </h2>
          <p className="text-sm text-loam-700">
            {directionWords[t.direction]} · grand mean {formatInUnit(t.grandMean, du(t), dm(t))} ·
            CV {t.cvPercent === null ? '—' : `${t.cvPercent.toFixed(1)} %`} ·{' '}
            {sheet.letters === 'hsd'
              ? `HSD ${formatInUnit(t.hsd.value, du(t), dm(t))}`
              : `LSD ${formatInUnit(t.lsd.value, du(t), dm(t))}`}
          </p>
          {t.fixedTest ? (
            <p className="text-sm text-loam-700">{varietyTestNote(t.fixedTest)}</p>
          ) : null}
          {t.varianceSummary ? <p className="text-sm text-loam-700">{t.varianceSummary}</p> : null}
          <ScrollRegion
            label={`${t.label}: entry means`}
            className="mt-2 rounded-lg bg-white shadow-sm"
          >
            <DataTable
              caption={`${t.label}: entry means with standard errors and letter groups${
                t.direction === 'none' ? '' : `, ranked best first (${directionWords[t.direction]})`
              }`}
              className="min-w-[20rem]"
              data={rankMeans(t.means, t.direction)}
              columns={meansColumns(t, du(t), dm(t))}
              rowId={(m) => m.variety}
              rowHeader="variety"
              sortable={false}
            />
          </ScrollRegion>
          {t.twoFactor ? <TreatmentCells trait={t} unit={du(t)} decimals={dm(t)} /> : null}
          {t.warnings.length ? (
            <ul className="mt-1 list-disc pl-5 text-xs text-pod-700">
              {t.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          ) : null}
        </section>
      ))}

      {photos.length ? (
        <section aria-labelledby="photos-heading" className="mt-6">
          <h2 id="photos-heading" className="text-xl font-semibold text-leaf-900">
            Photos
          </h2>
          <ul className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-3">
            {photos.map((e) => (
              <li key={e.id}>
                <figure className="overflow-hidden rounded-lg bg-white shadow-sm">
                  <img
                    src={photoUrl(sheet, e.photo!.id, 'thumb')}
                    srcSet={`${photoUrl(sheet, e.photo!.id, 'thumb')} 400w, ${photoUrl(sheet, e.photo!.id, 'display')} 1600w`}
                    sizes="(min-width: 640px) 33vw, 50vw"
                    alt={e.photo!.caption}
                    loading="lazy"
                    className="aspect-[4/3] w-full object-cover"
                  />
                  <figcaption className="p-2 text-sm">
                    <strong>{e.name}</strong> — {e.photo!.caption}
                  </figcaption>
                </figure>
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {sheet.entries.some((e) => e.note) ? (
        <section aria-labelledby="notes-heading" className="mt-6">
          <h2 id="notes-heading" className="text-xl font-semibold text-leaf-900">
            Notes on the entries
          </h2>
          <dl className="mt-2 space-y-2">
            {sheet.entries
              .filter((e) => e.note)
              .map((e) => (
                <div key={e.id} className="rounded-lg bg-white p-3 shadow-sm">
                  <dt className="font-semibold">
                    <VarietyName sheet={sheet} name={e.name} />{' '}
                    <span className="text-sm font-normal text-loam-700">
                      ({e.seedSource || 'seed source not given'})
                    </span>
                  </dt>
                  <dd className="mt-1 whitespace-pre-line">{e.note}</dd>
                  {e.caution ? (
                    <dd className="mt-1 text-sm text-frost-600">Caution: {e.caution}</dd>
                  ) : null}
                </div>
              ))}
          </dl>
        </section>
      ) : null}

      <section aria-labelledby="methods-heading" className="mt-6">
        <h2 id="methods-heading" className="text-xl font-semibold text-leaf-900">
          Methods
        </h2>
        <p className="mt-2 whitespace-pre-line">{sheet.methods}</p>
      </section>

      <section aria-labelledby="conditions-heading" className="mt-6">
        <h2 id="conditions-heading" className="text-xl font-semibold text-leaf-900">
          Growing conditions
        </h2>
        <ul className="mt-2 grid gap-3 sm:grid-cols-3">
          {sheet.sites.map((s) => (
            <li key={s.name} className="rounded-lg bg-white p-3 text-sm shadow-sm">
              <p className="font-semibold">{s.name}</p>
              <p className="text-loam-700">{s.region}</p>
              <p>
                {s.soilTexture ?? 'soil not recorded'} ·{' '}
                {s.irrigationMethod
                  ? `${s.irrigationMethod} irrigation`
                  : 'irrigation not recorded'}
              </p>
              <p>
                Rain {s.rainMm === null ? '—' : formatDepth(s.rainMm, units)} · irrigation{' '}
                {s.irrigationMm === null ? '—' : formatDepth(s.irrigationMm, units)}
              </p>
              <p>
                {s.degreeDays === null
                  ? 'Degree days not recorded'
                  : `${formatDegreeDays(s.degreeDays, units)} above ${formatTemperature(s.degreeDayBaseC, units)}`}
                {s.hotDays === null ? '' : ` · ${s.hotDays} hot days`}
              </p>
            </li>
          ))}
        </ul>
      </section>
      {offers.length ? (
        <section aria-labelledby="seed-offers" className="mt-6 rounded-lg bg-leaf-50 p-3">
          <h2 id="seed-offers" className="text-lg font-semibold text-leaf-900">
            Seed on offer
          </h2>
          <ul className="mt-1 space-y-1">
            {offers.map((o) => (
              <li key={o.id}>
                <a className="font-medium text-leaf-700 underline" href={`/offers/${o.id}`}>
                  Ask for a packet of {o.varietyName}
                </a>{' '}
                ({o.packetsLeft} {o.packetsLeft === 1 ? 'packet' : 'packets'} left)
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <p className="mt-6 text-sm text-loam-700">Licence: {licenseLabels[sheet.license]}.</p>
    </article>
  );
}
