import type { ResultSnapshot } from '@common/contracts/results';
import { Button } from '@/components/ui/button';

const boxed =
  'inline-flex min-h-11 items-center justify-center rounded-lg border border-leaf-700 bg-white px-3 font-semibold text-leaf-700';
const plain =
  'inline-flex min-h-11 items-center rounded-lg px-3 font-semibold text-leaf-700 underline';

/** The published version's files, as the results API serves them (after `/v/<n>/`). */
const downloads = [
  { file: 'sheet.pdf?size=a4', label: 'PDF (A4)', className: boxed },
  { file: 'sheet.pdf?size=letter', label: 'PDF (Letter)', className: boxed },
  { file: 'means.csv', label: 'Means (CSV)', className: plain },
  { file: 'plots.csv', label: 'Plot data (CSV)', className: plain },
  { file: 'results.json', label: 'All numbers (JSON)', className: plain },
] as const;

/**
 * Print and the downloads, above a published sheet on screen and never on paper. The server's
 * drawing of the sheet carries it too, so nothing moves when the client's sheet takes its place.
 * The downloads are plain links and work without any script; Print needs the page's script, so
 * until the client's sheet is in (`printable`) it shows, in the same box, as not working yet.
 */
export function SheetToolbar({
  sheet,
  printable,
}: {
  sheet: Pick<ResultSnapshot, 'trial' | 'version'>;
  printable: boolean;
}) {
  const base = `/api/results/${sheet.trial.slug}/v/${sheet.version}`;
  // Above the sheet's own column: on a phone two to a row (three rows), wider in one row.
  return (
    <div
      role="group"
      aria-label="Print and download"
      className="no-print mx-auto mb-4 grid max-w-4xl grid-cols-2 gap-2 text-sm sm:flex sm:flex-wrap sm:items-center sm:text-base"
    >
      <Button
        type="button"
        variant="secondary"
        disabled={!printable}
        onClick={() => window.print()}
      >
        Print
      </Button>
      {downloads.map((d) => (
        <a key={d.file} className={d.className} href={`${base}/${d.file}`}>
          {d.label}
        </a>
      ))}
    </div>
  );
}
