import type { ImportKind, ImportPreview } from '@common/contracts/records';
import { harvestCsvColumns, observationCsvColumns } from '@common/csv-records';
import { sheetLeadColumns, sheetNoteColumn } from '@common/recording-sheet';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { ApiError } from '@/lib/api-client';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import { exportUrl, previewImport, useCommitImport } from '../api/record-api';
import { ImportProblems, ImportRowsRead } from '../components/import-tables';
import { RecordsNav } from '../components/records-nav';

const downloads = [
  ['harvests', 'Harvests (raw, one row per harvest; mass_g)'],
  [
    'observations',
    'Observations (tidy long format: one row per plot, trait, plant and date; unit column)',
  ],
  ['field-events', 'Field events (water_depth_mm, rain_mm, rate_g_per_m2 …)'],
  ['plot-totals', 'Plot totals (sums of harvests, trait means per plot)'],
] as const;

/** CSV in and out: preview with row-by-row problems, then an all-or-nothing import. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const units = useUnitSystem();
  const [kind, setKind] = useState<ImportKind>('harvests');
  const [csv, setCsv] = useState('');
  const [fileName, setFileName] = useState<string | null>(null);
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [checking, setChecking] = useState(false);
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const commit = useCommitImport(slug);

  if (trial.isPending) return <Spinner />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const canWrite = trial.data.permissions['records.write'];
  const columns =
    kind === 'harvests'
      ? harvestCsvColumns
      : kind === 'observations'
        ? observationCsvColumns
        : [...sheetLeadColumns, '…', sheetNoteColumn];

  const check = async () => {
    setChecking(true);
    setMessage(null);
    try {
      setPreview(await previewImport(slug, kind, csv));
    } catch (err) {
      setPreview(null);
      setMessage({
        tone: 'error',
        text: err instanceof Error ? err.message : 'The file could not be checked.',
      });
    } finally {
      setChecking(false);
    }
  };

  return (
    <article className="space-y-4">
      <h1 className="text-2xl font-semibold text-leaf-900">
        Import and export · {trial.data.title}
      </h1>
      <RecordsNav slug={slug} />
      <section aria-labelledby="export-heading" className="rounded-xl bg-white p-3 shadow-sm">
        <h2 id="export-heading" className="text-lg font-semibold text-leaf-900">
          Export (CSV, SI units named in each column)
        </h2>
        <ul className="mt-2 space-y-1">
          {downloads.map(([dataset, label]) => (
            <li key={dataset}>
              <a
                href={exportUrl(slug, dataset)}
                download
                className="inline-flex min-h-11 items-center text-leaf-700 underline"
              >
                {label}
              </a>
            </li>
          ))}
        </ul>
      </section>

      {canWrite ? (
        <section aria-labelledby="import-heading" className="rounded-xl bg-white p-3 shadow-sm">
          <h2 id="import-heading" className="text-lg font-semibold text-leaf-900">
            Import from a spreadsheet
          </h2>
          <p className="mt-1 text-sm">
            Columns: <code className="break-all">{columns.join(', ')}</code>. Harvest files may give
            mass as mass_kg, mass_oz or mass_lb instead of mass_g; observation files may name a unit
            (mm, cm, in, g, kg, oz, lb). Rows are counted as a spreadsheet shows them, the header
            being row 1. A file with any problem is refused whole. A recording sheet keeps the
            columns it was printed with (download them from the field log&rsquo;s{' '}
            <Link to={`/t/${slug}/log/sheet`} className="underline">
              Recording sheet
            </Link>
            ); plots left blank are skipped.
          </p>
          <div className="mt-2 flex flex-wrap items-end gap-2">
            <label className="flex flex-col gap-1 font-medium">
              Records in the file
              <select
                value={kind}
                onChange={(e) => {
                  setKind(e.target.value as ImportKind);
                  setPreview(null);
                }}
                className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
              >
                <option value="harvests">Harvests</option>
                <option value="observations">Observations</option>
                <option value="sheet">Recording sheet (typed in)</option>
              </select>
            </label>
            <label className="flex flex-col gap-1 font-medium">
              CSV file
              <input
                type="file"
                accept=".csv,text/csv"
                className="min-h-11"
                onChange={async (e) => {
                  const file = e.target.files?.[0];
                  if (!file) return;
                  setFileName(file.name);
                  setCsv(await file.text());
                  setPreview(null);
                }}
              />
            </label>
          </div>
          <label className="mt-2 flex flex-col gap-1 font-medium">
            Or paste the rows
            <textarea
              rows={5}
              value={csv}
              onChange={(e) => {
                setCsv(e.target.value);
                setFileName(null);
                setPreview(null);
              }}
              className="rounded-lg border border-leaf-300 bg-white p-2 font-mono text-sm"
            />
          </label>
          <div className="mt-2 flex flex-wrap gap-2">
            <button
              type="button"
              disabled={!csv || checking}
              onClick={() => void check()}
              className="min-h-11 rounded-lg border border-leaf-700 px-4 font-semibold text-leaf-700 disabled:opacity-50"
            >
              {checking ? 'Checking…' : 'Check the file'}
            </button>
            <button
              type="button"
              disabled={
                !preview || preview.errors.length > 0 || preview.newCount === 0 || commit.isPending
              }
              onClick={async () => {
                try {
                  const r = await commit.mutateAsync({ kind, csv });
                  setMessage({
                    tone: 'ok',
                    text: `Imported ${r.created} records${r.alreadyRecorded ? `; ${r.alreadyRecorded} were already recorded` : ''}.`,
                  });
                  setPreview(null);
                  setCsv('');
                } catch (err) {
                  const rows =
                    err instanceof ApiError
                      ? (err.details as { rows?: unknown[] } | undefined)?.rows
                      : undefined;
                  setMessage({
                    tone: 'error',
                    text: `${err instanceof Error ? err.message : 'Not imported.'}${rows ? ' Check the file again for the rows.' : ''}`,
                  });
                }
              }}
              className="min-h-11 rounded-lg bg-leaf-700 px-4 font-semibold text-white disabled:bg-leaf-300"
            >
              {commit.isPending ? 'Importing…' : `Import ${preview?.newCount ?? ''} records`}
            </button>
          </div>
          {fileName ? <p className="mt-1 text-sm text-loam-700">File: {fileName}</p> : null}
          {message ? (
            <p
              role={message.tone === 'error' ? 'alert' : 'status'}
              className={`mt-2 font-medium ${message.tone === 'error' ? 'text-frost-600' : 'text-leaf-900'}`}
            >
              {message.text}
            </p>
          ) : null}
          {preview ? (
            <div className="mt-3 space-y-2">
              <p role="status">
                {preview.newCount} new · {preview.alreadyRecordedCount} already recorded ·{' '}
                {preview.errors.length} problems
              </p>
              {preview.errors.length ? <ImportProblems errors={preview.errors} /> : null}
              <ImportRowsRead rows={preview.rows} traits={trial.data.traits} units={units} />
            </div>
          ) : null}
        </section>
      ) : null}
    </article>
  );
}
