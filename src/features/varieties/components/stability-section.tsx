/**
 * Stability across environments for a crop of one register: the environment index, each
 * variety's regression on it (Finlay and Wilkinson), the deviation mean square (Eberhart and
 * Russell) and ecovalence (Wricke), on the balanced subset the server names.
 */
import type { GroupList, Stability } from '@common/contracts/varieties';
import {
  displayUnit,
  type DisplayUnit,
  formatInUnit,
  formatNumber,
  formatP,
} from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';
import { useState } from 'react';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useStability } from '../api/get-stability';

type EnvRow = Stability['environments'][number] & { id: string };
type VarietyRow = Stability['varieties'][number];
const envColumn = createColumnHelper<EnvRow>();
const varietyColumn = createColumnHelper<VarietyRow>();

/** A mean square or ecovalence is in the trait's unit squared: it scales by the factor squared. */
const squared = (value: number, unit: DisplayUnit) =>
  `${formatNumber(value * unit.factor * unit.factor)}${unit.label ? ` ${unit.label}²` : ''}`;

function environmentColumns(unit: DisplayUnit, decimals: number) {
  return [
    envColumn.accessor('season', { header: 'Season' }),
    envColumn.accessor('trialTitle', { header: 'Trial' }),
    envColumn.accessor('site', { header: 'Site' }),
    envColumn.accessor('mean', {
      header: 'Mean',
      sortUndefined: 'last',
      cell: (c) => formatInUnit(c.getValue(), unit, decimals),
    }),
    envColumn.accessor('index', {
      header: 'Environment index',
      sortUndefined: 'last',
      cell: (c) => formatInUnit(c.getValue(), unit, decimals),
    }),
    envColumn.accessor((r) => (r.used ? 'Used' : `Left out: ${r.reason ?? ''}`), {
      id: 'used',
      header: 'In the subset',
    }),
  ];
}

function varietyColumns(unit: DisplayUnit, decimals: number) {
  const figure = (r: VarietyRow) => r.figures;
  return [
    varietyColumn.accessor('name', { header: 'Variety' }),
    varietyColumn.accessor('environmentCount', { header: 'Environments' }),
    varietyColumn.accessor((r) => figure(r)?.mean, {
      id: 'mean',
      header: 'Mean',
      sortUndefined: 'last',
      cell: (c) => formatInUnit(c.getValue(), unit, decimals),
    }),
    varietyColumn.accessor((r) => figure(r)?.slope, {
      id: 'slope',
      header: 'Slope ± SE',
      sortUndefined: 'last',
      cell: (c) => {
        const f = figure(c.row.original);
        return f ? `${formatNumber(f.slope, 3)} ± ${formatNumber(f.slopeSe, 2)}` : '—';
      },
    }),
    varietyColumn.accessor((r) => figure(r)?.slopeVersusOneP, {
      id: 'p',
      header: 'p (slope = 1)',
      sortUndefined: 'last',
      cell: (c) => (c.getValue() === undefined ? '—' : formatP(c.getValue()!)),
    }),
    varietyColumn.accessor((r) => figure(r)?.rSquared, {
      id: 'r2',
      header: 'R²',
      sortUndefined: 'last',
      cell: (c) => (c.getValue() === undefined ? '—' : formatNumber(c.getValue(), 2)),
    }),
    varietyColumn.accessor((r) => figure(r)?.deviationMs, {
      id: 'deviation',
      header: 'Deviation mean square',
      sortUndefined: 'last',
      cell: (c) => {
        const f = figure(c.row.original);
        return f ? `${squared(f.deviationMs, unit)} (${f.deviationDf} df)` : '—';
      },
    }),
    varietyColumn.accessor((r) => figure(r)?.ecovalence, {
      id: 'ecovalence',
      header: 'Ecovalence',
      sortUndefined: 'last',
      cell: (c) => {
        const f = figure(c.row.original);
        return f
          ? `${squared(f.ecovalence, unit)} (${formatNumber(f.ecovalenceShare * 100, 3)} %)`
          : '—';
      },
    }),
    varietyColumn.accessor((r) => (r.used ? 'Used' : `Left out: ${r.reason ?? ''}`), {
      id: 'used',
      header: 'In the subset',
    }),
  ];
}

export function StabilitySection({
  groups,
  initialGroup,
  initialCrop,
}: {
  groups: GroupList['groups'];
  initialGroup: string;
  initialCrop: string;
}) {
  const system = useUnitSystem();
  const [group, setGroup] = useState(initialGroup);
  const [crop, setCrop] = useState(initialCrop);
  const [trait, setTrait] = useState<string | undefined>(undefined);
  const stability = useStability(group, crop, trait);
  const data = stability.data;
  const unit = displayUnit(data?.trait?.unit ?? '', system, data?.grandMean ?? 0);
  const decimals = data?.trait?.decimals ?? 1;
  const environments: EnvRow[] = (data?.environments ?? []).map((e) => ({
    ...e,
    id: `${e.trialSlug}/${e.site}`,
  }));

  return (
    <section className="mt-8" aria-labelledby="stability-heading">
      <h2 id="stability-heading" className="text-xl font-semibold text-leaf-900">
        Stability across environments
      </h2>
      <p className="mt-1 max-w-prose text-sm">
        Each site of each trial is an environment; its index is its mean minus the mean of all
        environments. A variety’s <strong>slope</strong> on that index says how it responds: above
        1, it gains more than the average variety where conditions are good and loses more where
        they are poor (it suits good conditions); below 1, it changes less than the average (it
        holds up in poor ones); about 1, it follows the average. The{' '}
        <strong>deviation mean square</strong> says how far the variety strays from its own line
        (small: its response is predictable), and the <strong>ecovalence</strong> is its share of
        the variety × environment interaction (small: stable). Figures are computed only on
        varieties grown in every environment of the subset, and need at least 3 environments.
      </p>
      <div className="mt-3 flex flex-wrap items-end gap-3">
        {groups.length > 1 ? (
          <label className="text-sm">
            Register{' '}
            <select
              className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
              value={group}
              onChange={(e) => {
                setGroup(e.target.value);
                setTrait(undefined);
              }}
            >
              {groups.map((g) => (
                <option key={g.id} value={g.id}>
                  {g.name}
                </option>
              ))}
            </select>
          </label>
        ) : null}
        <label className="text-sm">
          Crop{' '}
          <select
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
            value={crop}
            onChange={(e) => {
              setCrop(e.target.value);
              setTrait(undefined);
            }}
          >
            {(data?.crops ?? [crop]).map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          Stability trait{' '}
          <select
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
            value={data?.trait?.key ?? trait ?? ''}
            onChange={(e) => setTrait(e.target.value)}
          >
            {(data?.traits ?? []).map((t) => (
              <option key={t.key} value={t.key}>
                {t.label}
              </option>
            ))}
          </select>
        </label>
      </div>
      {stability.isPending ? <Spinner label="Computing stability…" /> : null}
      {stability.error ? <ErrorPanel error={stability.error} /> : null}
      {data ? (
        <div aria-busy={stability.isFetching}>
          {data.notice ? (
            <p className="mt-3 max-w-prose rounded-lg border border-leaf-100 bg-white p-3">
              No stability figures for {data.crop}
              {data.trait ? ` (${data.trait.label})` : ''}: {data.notice}
            </p>
          ) : null}
          <h3 className="mt-4 font-semibold">
            Varieties{data.trait ? ` · ${data.trait.label}` : ''}
            {unit.label ? ` (${unit.label})` : ''}
          </h3>
          <ScrollRegion
            label="Stability of each variety"
            hint="The table scrolls sideways."
            className="mt-1 rounded-lg bg-white shadow-sm"
          >
            <div className="min-w-[52rem]">
              <DataTable
                caption="Stability of each variety"
                data={data.varieties}
                columns={varietyColumns(unit, decimals)}
                rowId={(r) => r.slug}
                rowHeader="name"
              />
            </div>
          </ScrollRegion>
          <h3 className="mt-4 font-semibold">Environments</h3>
          <ScrollRegion
            label="Environments and their index"
            hint="The table scrolls sideways."
            className="mt-1 rounded-lg bg-white shadow-sm"
          >
            <div className="min-w-[40rem]">
              <DataTable
                caption="Environments and their index"
                data={environments}
                columns={environmentColumns(unit, decimals)}
                rowId={(r) => r.id}
              />
            </div>
          </ScrollRegion>
        </div>
      ) : null}
    </section>
  );
}
