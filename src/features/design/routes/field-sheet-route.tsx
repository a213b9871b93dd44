import { isSpinyCrop } from '@common/cautions';
import type { Design } from '@common/contracts/design';
import type { PaperSize } from '@common/layout';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { CautionNote } from '@/components/ui/caution-note';
import { useUnitSystem } from '@/lib/session';
import { DesignPage } from '../components/design-page';
import { defaultPaper, PaperPicker, PrintPageStyle } from '../components/print-page';
import { firstSiteWithPlots, SitePicker } from '../components/site-picker';
import { ScrollRegion } from '@/components/ui/scroll-region';

function FieldSheet({ design }: { design: Design }) {
  const system = useUnitSystem();
  const [paper, setPaper] = useState<PaperSize>(defaultPaper(system));
  const [siteId, setSiteId] = useState(firstSiteWithPlots(design));
  const plots = design.plots.filter((p) => p.siteId === siteId);
  const entry = new Map(design.entries.map((e) => [e.id, e]));
  const site = design.sites.find((s) => s.id === siteId);
  const spiny = isSpinyCrop(design.crop) || design.traits.some((t) => t.key === 'spines');
  if (plots.length === 0) return <p className="rounded-lg bg-white p-4 shadow-sm">No plots yet.</p>;
  return (
    <div className="print-sheet space-y-3">
      <PrintPageStyle paper={paper} orientation="portrait" />
      <div className="no-print flex flex-wrap items-center gap-3">
        <SitePicker design={design} value={siteId} onChange={setSiteId} />
        <PaperPicker value={paper} onChange={setPaper} />
        <Button onClick={() => window.print()}>Print field sheet</Button>
      </div>
      <header>
        <h2 className="text-xl font-semibold text-leaf-900">
          {design.title} — {site?.name}
        </h2>
        <p className="text-sm">
          Recorder: ____________________ Date: ____________ · {plots.length} plots in field order
        </p>
      </header>
      <ScrollRegion label="Field sheet">
        {/* A sheet printed to be written on, in walking order: the order is the point and the
            blank cells are for a pencil, so it stays a plain table rather than DataTable. */}
        <table className="field-sheet w-full min-w-[40rem] border-collapse text-left text-sm">
          <thead>
            <tr className="border-b-2 border-ink">
              <th className="p-1">Plot</th>
              <th className="p-1">Block</th>
              <th className="p-1">Code</th>
              <th className="p-1">Variety</th>
              <th className="p-1">Plants planned</th>
              <th className="w-16 p-1">Plants set</th>
              <th className="w-16 p-1">Survivors</th>
              <th className="w-20 p-1">Date</th>
              <th className="w-1/4 p-1">Notes</th>
            </tr>
          </thead>
          <tbody>
            {plots.map((p) => (
              <tr key={p.id} className="h-10 border-b border-loam-300">
                <td className="p-1 font-semibold">{p.plotNumber}</td>
                <td className="p-1">{p.block}</td>
                <td className="p-1 font-mono font-semibold">{entry.get(p.entryId)?.code}</td>
                <td className="p-1">{entry.get(p.entryId)?.name}</td>
                <td className="p-1">{p.plannedPlants ?? ''}</td>
                <td className="border-l border-loam-300 p-1" />
                <td className="border-l border-loam-300 p-1" />
                <td className="border-l border-loam-300 p-1" />
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
    </div>
  );
}

export function Component() {
  return <DesignPage title="Field sheet">{(design) => <FieldSheet design={design} />}</DesignPage>;
}
