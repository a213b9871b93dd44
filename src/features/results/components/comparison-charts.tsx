/** The comparison page's line charts, each drawn from one table (comparison-chart-data.ts). */
import type { EntrySite, HarvestCurve } from '@common/contracts/comparison';
import type { ReactNode } from 'react';
import {
  CartesianGrid,
  Legend,
  Line,
  LineChart,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import type { DisplayUnit } from '@common/display-units';
import { seriesColour, tooltipStyle } from '@/components/ui/chart-palette';
import { entrySiteTable, harvestCurveTable, type ChartTable } from './comparison-chart-data';

/** A fixed size for tests (jsdom has no layout); the page fills its box. */
type Size = { width: number; height: number } | undefined;

function Frame({ size, children }: { size: Size; children: ReactNode }) {
  if (size) return <>{children}</>;
  return (
    <ResponsiveContainer width="100%" height="100%">
      {children as React.ReactElement}
    </ResponsiveContainer>
  );
}

function TableLines({
  table,
  category,
  unit,
  size,
  dots,
}: {
  table: ChartTable;
  category: string;
  unit: DisplayUnit;
  size: Size;
  dots: boolean;
}) {
  return (
    <Frame size={size}>
      <LineChart data={table.rows} margin={{ left: 8, right: 8 }} {...(size ?? {})}>
        <CartesianGrid strokeDasharray="3 3" />
        {/* every site is labelled; dates may thin out, but the first and last always show */}
        <XAxis
          dataKey={category}
          type="category"
          interval={category === 'site' ? 0 : 'preserveStartEnd'}
        />
        <YAxis label={{ value: unit.label, angle: -90, position: 'insideLeft' }} />
        <Tooltip {...tooltipStyle} />
        <Legend />
        {table.series.map((s, i) => (
          <Line
            key={s.key}
            dataKey={s.key}
            name={s.name}
            stroke={seriesColour(i)}
            dot={dots}
            isAnimationActive={false}
          />
        ))}
      </LineChart>
    </Frame>
  );
}

export function HarvestCurveChart({
  curve,
  unit,
  size,
}: {
  curve: HarvestCurve;
  unit: DisplayUnit;
  size?: Size;
}) {
  return (
    <TableLines
      table={harvestCurveTable(curve, unit.factor)}
      category="date"
      unit={unit}
      size={size}
      dots={false}
    />
  );
}

export function EntrySiteChart({
  data,
  unit,
  size,
}: {
  data: EntrySite;
  unit: DisplayUnit;
  size?: Size;
}) {
  return (
    <TableLines
      table={entrySiteTable(data, unit.factor)}
      category="site"
      unit={unit}
      size={size}
      dots
    />
  );
}
