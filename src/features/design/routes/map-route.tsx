import type { Design } from '@common/contracts/design';
import { fitToPage, type PaperSize } from '@common/layout';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { useUnitSystem } from '@/lib/session';
import { DesignPage } from '../components/design-page';
import { entryFill, mapExtent, PlantingMap } from '../components/planting-map';
import { defaultPaper, PaperPicker, PrintPageStyle } from '../components/print-page';
import { firstSiteWithPlots, SitePicker } from '../components/site-picker';
import { ScrollRegion } from '@/components/ui/scroll-region';

function MapView({ design, slug }: { design: Design; slug: string }) {
  const system = useUnitSystem();
  const [paper, setPaper] = useState<PaperSize>(defaultPaper(system));
  const [siteId, setSiteId] = useState(firstSiteWithPlots(design));
  if (design.plots.length === 0)
    return (
      <p className="rounded-lg bg-white p-4 shadow-sm">
        No plots yet.{' '}
        <Link to={`/t/${slug}/layout`} className="font-semibold text-leaf-700 underline">
          Generate the layout
        </Link>{' '}
        first.
      </p>
    );
  const { viewBox } = mapExtent(design, siteId);
  const fit = fitToPage(viewBox.width, viewBox.height, paper);
  const site = design.sites.find((s) => s.id === siteId);
  const used = new Set(design.plots.filter((p) => p.siteId === siteId).map((p) => p.entryId));
  return (
    <div className="print-sheet space-y-3">
      <PrintPageStyle paper={paper} orientation={fit.orientation} fit={fit} />
      <div className="no-print flex flex-wrap items-center gap-3">
        <SitePicker design={design} value={siteId} onChange={setSiteId} />
        <PaperPicker value={paper} onChange={setPaper} />
        <Button onClick={() => window.print()}>Print map</Button>
        <p className="text-sm text-loam-700">
          Prints on one {paper === 'a4' ? 'A4' : 'Letter'} sheet, {fit.orientation}, at about 1 :{' '}
          {Math.round(fit.scale)}.
        </p>
      </div>
      <header>
        <h2 className="text-xl font-semibold text-leaf-900">
          {design.title} — {site?.name}
        </h2>
        <p className="text-sm">
          {design.season} · seed {design.layout.seed ?? '—'} · {design.layout.rowsPerPlot}{' '}
          {design.layout.rowsPerPlot === 1 ? 'row' : 'rows'} per plot · plot numbers: block, then
          position from the left
        </p>
      </header>
      <ScrollRegion label="Planting map" className="print-map-frame">
        <PlantingMap design={design} siteId={siteId} system={system} paper={paper} />
      </ScrollRegion>
      <section aria-labelledby="legend-heading">
        <h3 id="legend-heading" className="font-semibold text-leaf-900">
          Legend
        </h3>
        <ul className="mt-1 grid grid-cols-1 gap-x-4 gap-y-1 text-sm sm:grid-cols-3 print:grid-cols-3">
          {design.entries
            .map((e, i) => ({ e, i }))
            .filter(({ e }) => used.has(e.id))
            .map(({ e, i }) => (
              <li key={e.id} className="flex items-center gap-2">
                <span
                  aria-hidden
                  className="inline-block h-4 w-4 shrink-0 rounded-sm border border-leaf-700"
                  style={{ background: entryFill(i) }}
                />
                <span className="font-mono font-semibold">{e.code}</span> {e.name}
              </li>
            ))}
        </ul>
      </section>
    </div>
  );
}

export function Component() {
  return (
    <DesignPage title="Planting map">
      {(design, slug) => <MapView design={design} slug={slug} />}
    </DesignPage>
  );
}
