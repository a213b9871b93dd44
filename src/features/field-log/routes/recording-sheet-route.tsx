import { isSpinyCrop } from '@common/cautions';
import { writeCsv } from '@common/csv';
import {
  defaultSheetUnits,
  headingWithUnit,
  MAX_SHEET_PLANTS,
  sheetColumns,
  sheetLeadColumns,
  sheetLengthUnits,
  sheetMassUnits,
  sheetNoteColumn,
  sheetTraitsOf,
  type SheetLengthUnit,
  type SheetMassUnit,
} from '@common/recording-sheet';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { CautionNote } from '@/components/ui/caution-note';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { SelectField } from '@/components/ui/text-field';
import { saveText } from '@/lib/save-text';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { mySitesOf } from '../api/field-log-memory';
import { useRecordPlots } from '../api/get-record-plots';
import { FieldLogCrumbs } from '../components/field-log-crumbs';

const selectClass = 'min-h-11 rounded-lg border border-leaf-300 bg-white px-2';

/**
 * The paper backup of a round: one site's plots in field order with blank columns for the
 * harvest and the chosen traits, printed, or downloaded as the CSV to type it back in.
 */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const plots = useRecordPlots(slug);
  const system = useUnitSystem();
  const [siteChoice, setSiteChoice] = useState<string | null>(null);
  const [roundDate, setRoundDate] = useState('');
  const [harvest, setHarvest] = useState(true);
  const [traitChoice, setTraitChoice] = useState<string[] | null>(null);
  const [plants, setPlants] = useState(3);
  const [massUnit, setMassUnit] = useState<SheetMassUnit>(defaultSheetUnits(system).massUnit);
  const [lengthUnit, setLengthUnit] = useState<SheetLengthUnit>(
    defaultSheetUnits(system).lengthUnit,
  );

  if (trial.isPending || plots.isPending) return <Spinner label="Loading the plots…" />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  if (plots.error) return <ErrorPanel error={plots.error} />;
  const t = trial.data;
  const sites = mySitesOf(t);
  const siteId = siteChoice ?? sites[0]?.id ?? '';
  const site = sites.find((s) => s.id === siteId);
  const recordable = sheetTraitsOf(t.traits);
  const traitIds = traitChoice ?? recordable.map((tr) => tr.id);
  const columns = sheetColumns(t.traits, { harvest, traitIds, plants, massUnit, lengthUnit });
  const sitePlots = plots.data.plots
    .filter((p) => p.siteId === siteId)
    .sort((a, b) => a.block - b.block || a.position - b.position);
  const spiny = isSpinyCrop(t.crop) || t.traits.some((tr) => tr.key === 'spines');
  const weighs =
    harvest || columns.some((c) => c.kind === 'trait' && c.trait.quantityKind === 'mass');
  const measures = columns.some((c) => c.kind === 'trait' && c.trait.quantityKind === 'length');

  const template = () =>
    writeCsv(
      [...sheetLeadColumns, ...columns.map((c) => c.name), sheetNoteColumn],
      sitePlots.map((p) => [
        site?.name ?? '',
        p.plotNumber,
        p.entryCode,
        roundDate,
        ...columns.map(() => ''),
        '',
      ]),
    );
  const fileName = `${slug}-${(site?.name ?? 'site').toLowerCase().replace(/[^a-z0-9]+/g, '-')}-recording-sheet${roundDate ? `-${roundDate}` : ''}.csv`;

  return (
    <article className="space-y-4">
      <style>{'@page { size: landscape; }'}</style>
      <header className="no-print space-y-2">
        <FieldLogCrumbs slug={slug} title={t.title} />
        <h1 className="text-2xl font-semibold text-leaf-900">Recording sheet</h1>
        <p className="max-w-prose text-sm">
          The paper backup for a round when a phone dies or has no signal: one row per plot in field
          order, blank columns for what the round records. Type it back in later with the same
          columns: download the CSV below, fill it in, and import it as a recording sheet on{' '}
          <Link to={`/t/${slug}/records/files`} className="underline">
            Import and export
          </Link>
          . A sheet imported twice is recorded once.
        </p>
      </header>

      <form
        aria-label="What the sheet records"
        className="no-print grid gap-3 rounded-xl bg-white p-3 shadow-sm sm:grid-cols-2"
        onSubmit={(e) => e.preventDefault()}
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="sheet-site" className="font-medium">
            Site
          </label>
          <select
            id="sheet-site"
            value={siteId}
            onChange={(e) => setSiteChoice(e.target.value)}
            className={selectClass}
          >
            {sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="sheet-date" className="font-medium">
            Round date (optional; blank to write it by hand)
          </label>
          <input
            id="sheet-date"
            type="date"
            value={roundDate}
            onChange={(e) => setRoundDate(e.target.value)}
            className={`${selectClass} w-48`}
          />
        </div>
        <fieldset className="sm:col-span-2">
          <legend className="mb-1 font-medium">Columns</legend>
          <div className="flex flex-wrap gap-x-4">
            <label className="flex min-h-11 items-center gap-2">
              <input
                type="checkbox"
                checked={harvest}
                onChange={(e) => setHarvest(e.target.checked)}
                className="h-5 w-5"
              />
              Harvest (marketable and cull, count and mass)
            </label>
            {recordable.map((tr) => (
              <label key={tr.id} className="flex min-h-11 items-center gap-2">
                <input
                  type="checkbox"
                  checked={traitIds.includes(tr.id)}
                  onChange={(e) =>
                    setTraitChoice(
                      e.target.checked
                        ? recordable
                            .map((r) => r.id)
                            .filter((id) => id === tr.id || traitIds.includes(id))
                        : traitIds.filter((id) => id !== tr.id),
                    )
                  }
                  className="h-5 w-5"
                />
                {tr.label}
                {tr.basis === 'plant' ? ' (per plant)' : ''}
              </label>
            ))}
          </div>
        </fieldset>
        {recordable.some((tr) => tr.basis === 'plant' && traitIds.includes(tr.id)) ? (
          <div className="flex flex-col gap-1">
            <label htmlFor="sheet-plants" className="font-medium">
              Sample plants per plot
            </label>
            <input
              id="sheet-plants"
              type="number"
              inputMode="numeric"
              min={1}
              max={MAX_SHEET_PLANTS}
              value={plants}
              onChange={(e) =>
                setPlants(Math.max(1, Math.min(MAX_SHEET_PLANTS, Number(e.target.value) || 1)))
              }
              className={`${selectClass} w-24`}
            />
          </div>
        ) : null}
        <div className="flex flex-wrap gap-3">
          {weighs ? (
            <SelectField
              label="Mass unit"
              value={massUnit}
              onChange={(e) => setMassUnit(e.target.value as SheetMassUnit)}
              options={sheetMassUnits.map((u) => [u, u] as const)}
            />
          ) : null}
          {measures ? (
            <SelectField
              label="Length unit"
              value={lengthUnit}
              onChange={(e) => setLengthUnit(e.target.value as SheetLengthUnit)}
              options={sheetLengthUnits.map((u) => [u, u] as const)}
            />
          ) : null}
        </div>
        <div className="flex flex-wrap gap-2 sm:col-span-2">
          <button
            type="button"
            onClick={() => window.print()}
            disabled={columns.length === 0}
            className="min-h-11 rounded-lg bg-leaf-700 px-4 font-semibold text-white disabled:bg-leaf-300"
          >
            Print recording sheet
          </button>
          <button
            type="button"
            onClick={() => saveText(fileName, 'text/csv;charset=utf-8', template())}
            disabled={columns.length === 0}
            className="min-h-11 rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700 disabled:opacity-50"
          >
            Download CSV to type in
          </button>
        </div>
        {columns.length === 0 ? (
          <p role="status" className="text-sm font-medium text-frost-600 sm:col-span-2">
            Choose at least one column to record.
          </p>
        ) : null}
      </form>

      <section aria-labelledby="sheet-heading" className="space-y-2 bg-white p-2 print:p-0">
        <h2 id="sheet-heading" className="text-xl font-semibold text-leaf-900">
          {t.title} — {site?.name} · recording sheet
        </h2>
        <p className="text-sm">
          Date: {roundDate || '____________'} · Recorder: ____________________ · {sitePlots.length}{' '}
          plots in field order · leave a cell blank when nothing was recorded
        </p>
        <ScrollRegion label="Recording sheet (scrolls sideways on a narrow screen)">
          {/* A form printed to be written on in the field (blank cells, field order, fixed
              columns), not rows a reader sorts: a plain table, not DataTable. */}
          <table className="w-full border-collapse text-left text-sm" data-testid="recording-sheet">
            <thead>
              <tr className="border-b-2 border-ink align-bottom">
                <th scope="col" className="p-1">
                  Plot
                  <span className="block font-mono text-[0.65rem] font-normal">plot_number</span>
                </th>
                <th scope="col" className="p-1">
                  Entry
                  <span className="block font-mono text-[0.65rem] font-normal">entry_code</span>
                </th>
                {columns.map((c) => (
                  <th key={c.name} scope="col" className="min-w-16 border-l border-loam-300 p-1">
                    {headingWithUnit(c)}
                    <span className="block font-mono text-[0.65rem] font-normal">{c.name}</span>
                  </th>
                ))}
                <th scope="col" className="min-w-32 border-l border-loam-300 p-1">
                  Note
                  <span className="block font-mono text-[0.65rem] font-normal">note</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {sitePlots.map((p) => (
                <tr key={p.plotId} className="h-10 border-b border-loam-300">
                  <th scope="row" className="p-1 font-semibold">
                    {p.plotNumber}
                  </th>
                  <td className="p-1 font-mono font-semibold">{p.entryCode}</td>
                  {columns.map((c) => (
                    <td key={c.name} className="border-l border-loam-300 p-1" />
                  ))}
                  <td className="border-l border-loam-300 p-1" />
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
        <div className="grid gap-2 sm:grid-cols-2 print:grid-cols-2">
          <CautionNote id="field-heat" />
          {spiny ? <CautionNote id="spiny-crop" /> : null}
        </div>
      </section>
    </article>
  );
}
