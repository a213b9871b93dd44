import type { AnalysisResult } from '@common/contracts/analysis';
import { useId, useMemo, useState } from 'react';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { ApiError } from '@/lib/api-client';
import { useAnalyzeSpreadsheet } from '../api/analyze-spreadsheet';
import {
  AnovaTable,
  MeansTable,
  ResultSummary,
  SeparationSummary,
  WarningsList,
} from '../components/analysis-tables';
import { csvHeader, guessColumns } from '../components/csv-header';
import { downloadCsv, downloadJson } from '../components/download';

const MAX_BYTES = 2 * 1024 * 1024;
const roles = [
  ['variety', 'Variety (entry) column', true],
  ['site', 'Site column', false],
  ['block', 'Block (replicate) column', false],
  ['plot', 'Plot column (rows sharing a plot are sub-samples)', false],
  ['value', 'Value column (the trait)', true],
] as const;
type Role = (typeof roles)[number][0];

const field = 'min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3';

export function Component() {
  const id = useId();
  const [csv, setCsv] = useState('');
  const [fileNote, setFileNote] = useState<string | null>(null);
  const [columns, setColumns] = useState<Record<Role, string>>({
    variety: '',
    site: '',
    block: '',
    plot: '',
    value: '',
  });
  const [alpha, setAlpha] = useState('0.05');
  const [design, setDesign] = useState<'' | 'crd' | 'rcbd' | 'multisite'>('');
  const [letters, setLetters] = useState<'hsd' | 'lsd'>('hsd');
  const analyze = useAnalyzeSpreadsheet();
  const header = useMemo(() => (csv.trim() ? csvHeader(csv) : []), [csv]);

  const takeText = (text: string) => {
    setCsv(text);
    setColumns(guessColumns(csvHeader(text)));
    analyze.reset();
  };

  const onFile = async (file: File | undefined) => {
    if (!file) return;
    if (file.size > MAX_BYTES) {
      setFileNote(`${file.name} is larger than 2 MB: split it by trait or site.`);
      return;
    }
    setFileNote(`${file.name} (${Math.ceil(file.size / 1024)} kB) read.`);
    takeText(await file.text());
  };

  const run = () =>
    analyze.mutate({
      csv,
      options: {
        alpha: Number(alpha),
        letters,
        ...(design ? { design } : {}),
        variety: columns.variety || undefined,
        site: columns.site,
        block: columns.block,
        plot: columns.plot,
        value: columns.value || undefined,
      },
    });

  const result: AnalysisResult | undefined = analyze.data;
  const unit = { label: result?.trait ?? '', factor: 1 };
  const fieldErrors = analyze.error instanceof ApiError ? analyze.error.fields : [];

  return (
    <article>
      <h1 className="text-3xl font-semibold text-leaf-900">Analyze a spreadsheet</h1>
      <p className="mt-2 max-w-prose">
        One row per plot (or per sample plant) with the variety, the value, and where the trial has
        them, the site, block and plot. Nothing is stored: download the results to keep them.
      </p>

      <form
        className="mt-4 grid gap-4 rounded-xl bg-white p-4 shadow-sm"
        onSubmit={(e) => {
          e.preventDefault();
          run();
        }}
      >
        <div className="grid gap-4 sm:grid-cols-2">
          <div>
            <label htmlFor={`${id}-file`} className="block font-semibold">
              Upload a CSV file
            </label>
            <input
              id={`${id}-file`}
              type="file"
              accept=".csv,text/csv,text/plain"
              className="mt-1 block min-h-11 w-full text-sm"
              onChange={(e) => void onFile(e.target.files?.[0])}
            />
            {fileNote ? (
              <p className="mt-1 text-sm text-loam-700" role="status">
                {fileNote}
              </p>
            ) : null}
          </div>
          <div>
            <label htmlFor={`${id}-paste`} className="block font-semibold">
              Or paste the spreadsheet (CSV)
            </label>
            <textarea
              id={`${id}-paste`}
              className="mt-1 h-32 w-full rounded-lg border border-leaf-300 p-2 font-mono text-xs"
              value={csv}
              spellCheck={false}
              onChange={(e) => takeText(e.target.value)}
              placeholder={'site,block,variety,value\nNorth bed,1,Example Green,12.4'}
            />
          </div>
        </div>

        {header.length > 0 ? (
          <fieldset className="grid gap-3 sm:grid-cols-3">
            <legend className="mb-1 font-semibold">Columns</legend>
            {roles.map(([role, label, required]) => (
              <label key={role} className="text-sm">
                {label}
                {required ? '' : ' (optional)'}
                <select
                  className={`${field} mt-1`}
                  value={columns[role]}
                  onChange={(e) => setColumns({ ...columns, [role]: e.target.value })}
                >
                  <option value="">{required ? 'Choose…' : 'None'}</option>
                  {header.map((h) => (
                    <option key={h} value={h}>
                      {h}
                    </option>
                  ))}
                </select>
              </label>
            ))}
          </fieldset>
        ) : null}

        <div className="grid gap-3 sm:grid-cols-3">
          <label className="text-sm">
            Significance level (α)
            <input
              className={`${field} mt-1`}
              inputMode="decimal"
              value={alpha}
              onChange={(e) => setAlpha(e.target.value)}
              aria-describedby={`${id}-alpha-help`}
            />
            <span id={`${id}-alpha-help`} className="text-xs text-loam-700">
              0.05 is usual; 0.01 is stricter.
            </span>
          </label>
          <label className="text-sm">
            Design
            <select
              className={`${field} mt-1`}
              value={design}
              onChange={(e) => setDesign(e.target.value as typeof design)}
            >
              <option value="">From the columns (automatic)</option>
              <option value="crd">Completely randomized</option>
              <option value="rcbd">Randomized complete blocks</option>
              <option value="multisite">Blocks at several sites</option>
            </select>
          </label>
          <label className="text-sm">
            Letters from
            <select
              className={`${field} mt-1`}
              value={letters}
              onChange={(e) => setLetters(e.target.value as 'hsd' | 'lsd')}
            >
              <option value="hsd">Tukey HSD</option>
              <option value="lsd">Fisher LSD</option>
            </select>
          </label>
        </div>
        <div>
          <Button type="submit" disabled={csv.trim() === '' || analyze.isPending}>
            Analyze
          </Button>
        </div>
      </form>

      <div aria-live="polite">
        {analyze.isPending ? <Spinner label="Computing the analysis…" /> : null}
        {analyze.error ? (
          <div className="mt-4">
            <ErrorPanel error={analyze.error} title="The spreadsheet could not be analysed" />
            {fieldErrors.length > 0 ? (
              <ul className="mt-2 list-disc pl-5 text-sm text-frost-600">
                {fieldErrors.map((f) => (
                  <li key={f.path}>
                    {f.path}: {f.message}
                  </li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : null}
      </div>

      {result ? (
        <section aria-labelledby={`${id}-results`} className="mt-6">
          <h2 id={`${id}-results`} className="text-2xl font-semibold text-leaf-900">
            Results for {result.trait}
          </h2>
          <ResultSummary result={result} unit={unit} />
          <WarningsList warnings={result.warnings} />
          <AnovaTable result={result} unit={unit} title={result.trait} />
          <MeansTable result={result} unit={unit} title={result.trait} />
          <SeparationSummary result={result} unit={unit} />
          <div className="mt-4 flex flex-wrap gap-2">
            <Button
              variant="secondary"
              type="button"
              onClick={() => downloadJson(`analysis-${result.trait}`, result)}
            >
              Download results (JSON)
            </Button>
            <Button
              variant="secondary"
              type="button"
              onClick={() => downloadCsv(`analysis-${result.trait}`, result)}
            >
              Download results (CSV)
            </Button>
          </div>
        </section>
      ) : null}
    </article>
  );
}
