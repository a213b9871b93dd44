import { labelPages, labelSheets, plotAddress } from '@common/plot-labels';
import { useState } from 'react';
import { useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { useTrial } from '@/lib/trial';
import { mySitesOf } from '../api/field-log-memory';
import { useRecordPlots } from '../api/get-record-plots';
import { FieldLogCrumbs } from '../components/field-log-crumbs';
import { QrCode } from '../components/qr-code';

/** Stake labels for a site's plots on a label sheet: plot number, entry code, site, QR code. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const plots = useRecordPlots(slug);
  const [siteChoice, setSiteChoice] = useState<string | null>(null);
  const [sheetId, setSheetId] = useState<string>(
    navigator.language.startsWith('en-US') ? 'letter-30' : 'a4-24',
  );

  if (trial.isPending || plots.isPending) return <Spinner label="Loading the plots…" />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  if (plots.error) return <ErrorPanel error={plots.error} />;
  const t = trial.data;
  const sites = mySitesOf(t);
  const siteId = siteChoice ?? sites[0]?.id ?? '';
  const site = sites.find((s) => s.id === siteId);
  const sheet = labelSheets.find((s) => s.id === sheetId) ?? labelSheets[0]!;
  const u = sheet.unit;
  const sitePlots = plots.data.plots
    .filter((p) => p.siteId === siteId)
    .sort((a, b) => a.plotNumber - b.plotNumber);
  const pages = labelPages(sitePlots, sheet);
  const origin = window.location.origin;

  return (
    <article className="space-y-4">
      {/* The sheet's own size and no margin, for this page only: labels sit where the sheet has them. */}
      <style>{`@page { size: ${sheet.page}; margin: 0; }`}</style>
      <header className="no-print space-y-2">
        <FieldLogCrumbs slug={slug} title={t.title} />
        <h1 className="text-2xl font-semibold text-leaf-900">Plot labels</h1>
        <p className="max-w-prose text-sm">
          One label per plot for its stake. Scanning a label's code with a phone opens the field log
          at that plot. Print at 100 % (no “fit to page”) on the label sheet chosen below.
        </p>
        <div className="flex flex-wrap items-end gap-3">
          <div className="flex flex-col gap-1">
            <label htmlFor="labels-site" className="font-medium">
              Site
            </label>
            <select
              id="labels-site"
              value={siteId}
              onChange={(e) => setSiteChoice(e.target.value)}
              className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
            >
              {sites.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="labels-sheet" className="font-medium">
              Label sheet
            </label>
            <select
              id="labels-sheet"
              value={sheet.id}
              onChange={(e) => setSheetId(e.target.value)}
              className="min-h-11 max-w-full rounded-lg border border-leaf-300 bg-white px-2"
            >
              {labelSheets.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </div>
          <button
            type="button"
            onClick={() => window.print()}
            className="min-h-11 rounded-lg bg-leaf-700 px-4 font-semibold text-white"
          >
            Print labels
          </button>
        </div>
        <p role="status" className="text-sm text-loam-700">
          {sitePlots.length} labels on {pages.length} {pages.length === 1 ? 'sheet' : 'sheets'}
        </p>
      </header>
      <ScrollRegion
        label="Label sheets (scrolls sideways on a narrow screen)"
        className="print:overflow-visible"
      >
        {pages.map((page, i) => (
          <div
            key={i}
            className="label-page mx-auto mb-6 bg-white shadow-sm print:mb-0 print:shadow-none"
            style={{
              width: sheet.page === 'A4' ? '210mm' : '8.5in',
              height: sheet.page === 'A4' ? '297mm' : '11in',
              paddingTop: `${sheet.marginTop}${u}`,
              paddingLeft: `${sheet.marginLeft}${u}`,
              display: 'grid',
              gridTemplateColumns: `repeat(${sheet.columns}, ${sheet.labelWidth}${u})`,
              gridAutoRows: `${sheet.labelHeight}${u}`,
              columnGap: `${sheet.columnGap}${u}`,
              rowGap: `${sheet.rowGap}${u}`,
              alignContent: 'start',
              breakAfter: 'page',
            }}
          >
            {page.map((p) => (
              <div
                key={p.plotId}
                data-testid={`plot-label-${p.plotNumber}`}
                className="flex items-center gap-[4%] overflow-hidden px-[4%] text-ink"
              >
                <QrCode
                  text={plotAddress(origin, slug, p.plotId)}
                  label={`Code for plot ${p.plotNumber}`}
                  className="h-[88%] shrink-0"
                />
                <div className="min-w-0 leading-tight">
                  <p className="font-display text-[20pt] font-bold leading-none">{p.plotNumber}</p>
                  <p className="font-mono text-[11pt] font-semibold">{p.entryCode}</p>
                  <p className="truncate text-[7pt]">{site?.name}</p>
                  <p className="truncate text-[7pt]">Block {p.block}</p>
                </div>
              </div>
            ))}
          </div>
        ))}
      </ScrollRegion>
    </article>
  );
}
