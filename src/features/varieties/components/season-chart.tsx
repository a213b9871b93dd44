/** A trait of one variety over the seasons: one line per site (recharts, as elsewhere). */
import type { DisplayUnit } from '@common/display-units';
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
import type { SeasonChartTable } from './season-chart-data';
import { seriesColour, tooltipStyle } from '@/components/ui/chart-palette';

export function SeasonChart({ table, unit }: { table: SeasonChartTable; unit: DisplayUnit }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={table.rows} margin={{ left: 8, right: 16, top: 8 }}>
        <CartesianGrid strokeDasharray="3 3" />
        <XAxis dataKey="label" type="category" interval={0} />
        <YAxis
          label={unit.label ? { value: unit.label, angle: -90, position: 'insideLeft' } : undefined}
        />
        <Tooltip {...tooltipStyle} />
        <Legend />
        {table.series.map((s, i) => (
          <Line
            key={s.key}
            dataKey={s.key}
            name={s.name}
            stroke={seriesColour(i)}
            connectNulls
            dot
            isAnimationActive={false}
          />
        ))}
      </LineChart>
    </ResponsiveContainer>
  );
}
