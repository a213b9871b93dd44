import type { Design, DesignPlot } from '@common/contracts/design';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { useRecordPlanting } from '../api/layout';
import { DesignPage } from '../components/design-page';
import { fieldErrors, FormError, numberOrNull } from '../components/form-fields';
import { firstSiteWithPlots, SitePicker } from '../components/site-picker';
import { ScrollRegion } from '@/components/ui/scroll-region';

type Row = { plantsSet: string; plantsSurviving: string; gaps: string; note: string };
const rowOf = (p: DesignPlot): Row => ({
  plantsSet: p.plantsSet?.toString() ?? '',
  plantsSurviving: p.plantsSurviving?.toString() ?? '',
  gaps: p.gaps?.toString() ?? '',
  note: p.plantedNote,
});

const cellInput = 'min-h-11 w-20 rounded border border-leaf-300 bg-white px-2';

function PlantingEditor({ design, slug }: { design: Design; slug: string }) {
  const [siteId, setSiteId] = useState(firstSiteWithPlots(design));
  const [rows, setRows] = useState<Record<string, Row>>(() =>
    Object.fromEntries(design.plots.map((p) => [p.id, rowOf(p)])),
  );
  const [saved, setSaved] = useState(false);
  const save = useRecordPlanting(slug);
  const plots = design.plots.filter((p) => p.siteId === siteId);
  const entry = new Map(design.entries.map((e) => [e.id, e]));
  const errors = fieldErrors(save.error);
  if (design.plots.length === 0)
    return <p className="rounded-lg bg-white p-4 shadow-sm">No plots yet.</p>;

  const set = (id: string, key: keyof Row, value: string) => {
    setSaved(false);
    setRows((r) => ({ ...r, [id]: { ...r[id]!, [key]: value } }));
  };
  const body = plots.map((p) => ({
    plotId: p.id,
    plantsSet: numberOrNull(rows[p.id]!.plantsSet),
    plantsSurviving: numberOrNull(rows[p.id]!.plantsSurviving),
    gaps: numberOrNull(rows[p.id]!.gaps),
    note: rows[p.id]!.note,
  }));
  const errorFor = (i: number) =>
    Object.entries(errors)
      .filter(([k]) => k.startsWith(`plots.${i}.`))
      .map(([, m]) => m)
      .join(' ');

  return (
    <form
      noValidate
      aria-label="What was planted"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate({ plots: body }, { onSuccess: () => setSaved(true) });
      }}
      className="space-y-3"
    >
      <div className="flex flex-wrap items-center gap-3">
        <SitePicker design={design} value={siteId} onChange={setSiteId} />
        <Button
          type="button"
          variant="secondary"
          disabled={!design.canEdit}
          onClick={() =>
            plots.forEach((p) => {
              if (p.plannedPlants != null && rows[p.id]!.plantsSet === '')
                set(p.id, 'plantsSet', String(p.plannedPlants));
            })
          }
        >
          Fill plants set from the plan
        </Button>
      </div>
      <p className="text-sm text-loam-700">
        Plants set at planting, survivors after transplant shock, and gaps (empty places in the
        row).
      </p>
      <fieldset disabled={!design.canEdit}>
        <ScrollRegion label="What was planted per plot" className="rounded-lg bg-white shadow-sm">
          <table className="w-full min-w-[40rem] text-left text-sm">
            <thead className="bg-leaf-50 text-leaf-900">
              <tr>
                <th className="p-2">Plot</th>
                <th className="p-2">Entry</th>
                <th className="p-2">Planned</th>
                <th className="p-2">Plants set</th>
                <th className="p-2">Survivors</th>
                <th className="p-2">Gaps</th>
                <th className="p-2">Note</th>
              </tr>
            </thead>
            <tbody>
              {plots.map((p, i) => {
                const r = rows[p.id]!;
                const problem = errorFor(i);
                return (
                  <tr key={p.id} className="border-t border-leaf-50 align-top">
                    <th scope="row" className="p-2">
                      {p.plotNumber}
                    </th>
                    <td className="p-2 font-mono">{entry.get(p.entryId)?.code}</td>
                    <td className="p-2">{p.plannedPlants ?? '—'}</td>
                    {(['plantsSet', 'plantsSurviving', 'gaps'] as const).map((k) => (
                      <td key={k} className="p-2">
                        <input
                          aria-label={`${{ plantsSet: 'Plants set', plantsSurviving: 'Survivors', gaps: 'Gaps' }[k]}, plot ${p.plotNumber}`}
                          type="number"
                          inputMode="numeric"
                          min={0}
                          className={cellInput}
                          value={r[k]}
                          onChange={(e) => set(p.id, k, e.target.value)}
                        />
                      </td>
                    ))}
                    <td className="p-2">
                      <input
                        aria-label={`Note, plot ${p.plotNumber}`}
                        className="min-h-11 w-48 rounded border border-leaf-300 bg-white px-2"
                        value={r.note}
                        onChange={(e) => set(p.id, 'note', e.target.value)}
                      />
                      {problem ? <p className="mt-1 text-frost-600">{problem}</p> : null}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </ScrollRegion>
      </fieldset>
      <FormError
        error={
          Object.keys(errors).length
            ? new Error('Check the marked plots; nothing was saved.')
            : save.error
        }
      />
      {saved ? (
        <p role="status" className="text-leaf-700">
          Saved {plots.length} plots.
        </p>
      ) : null}
      {design.canEdit ? (
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? 'Saving…' : 'Save what was planted'}
        </Button>
      ) : null}
    </form>
  );
}

export function Component() {
  return (
    <DesignPage title="What was planted">
      {(design, slug) => <PlantingEditor design={design} slug={slug} />}
    </DesignPage>
  );
}
