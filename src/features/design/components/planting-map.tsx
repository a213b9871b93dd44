import type { Design } from '@common/contracts/design';
import { fitToPage, mapGeometry, type PageFit, type PaperSize } from '@common/layout';
import { formatSpacing } from '@common/display-units';
import { formatLength, MM_PER_FOOT, type UnitSystem } from '@common/units';

/** Light fills that stay apart in print and on a phone; past twelve entries they repeat and the code tells plots apart. */
const fills = [
  '#d6e8d9',
  '#f3d9a8',
  '#c9dbef',
  '#efc9c3',
  '#e3e0a2',
  '#d9cdea',
  '#bfe3dc',
  '#efd4e6',
  '#d8c7b0',
  '#cfe6b8',
  '#f0e2c8',
  '#c7d0d8',
];
export const entryFill = (index: number) => fills[index % fills.length]!;

/** A round length for the scale bar: 1, 2 or 5 × 10ⁿ metres, or feet. */
function scaleBar(widthMm: number, system: UnitSystem): { mm: number; label: string } {
  const unitMm = system === 'metric' ? 1000 : MM_PER_FOOT;
  const target = widthMm / 4 / unitMm;
  const power = 10 ** Math.floor(Math.log10(Math.max(target, 1e-3)));
  const step =
    [1, 2, 5, 10]
      .map((f) => f * power)
      .filter((v) => v <= target)
      .pop() ?? power;
  return { mm: step * unitMm, label: `${step} ${system === 'metric' ? 'm' : 'ft'}` };
}

export interface MapDrawing {
  viewBox: { x: number; y: number; width: number; height: number };
  fit: PageFit;
}

export function mapExtent(design: Design, siteId: string) {
  const plots = design.plots.filter((p) => p.siteId === siteId);
  // Plots laid out before the trial stored its plot size carry their own.
  const rowLengthMm = design.layout.rowLengthMm ?? plots[0]?.rowLengthMm ?? 3000;
  const rowSpacingMm = design.layout.rowSpacingMm ?? plots[0]?.rowSpacingMm ?? 900;
  const alleyMm = Math.max(600, Math.min(1500, rowLengthMm / 3));
  const geometry = mapGeometry(plots, {
    plotsPerRange: design.entries.length,
    rowLengthMm,
    rowSpacingMm,
    rowsPerPlot: design.layout.rowsPerPlot,
    alleyMm,
    wrapSingleBlock: design.design === 'crd',
  });
  const pad = Math.max(geometry.widthMm, geometry.heightMm) * 0.03;
  const viewBox = {
    x: -pad,
    y: -alleyMm,
    width: geometry.widthMm + 2 * pad,
    height: geometry.heightMm + alleyMm * 2.2,
  };
  return { plots, geometry, alleyMm, viewBox, rowLengthMm, rowSpacingMm };
}

/**
 * The layout to scale: one rectangle per plot (rows as lines, plants as dots where they fit),
 * plot numbers and entry codes, block labels in the alleys, a scale bar.
 */
export function PlantingMap({
  design,
  siteId,
  system,
  paper,
}: {
  design: Design;
  siteId: string;
  system: UnitSystem;
  paper: PaperSize;
}) {
  const { plots, geometry, alleyMm, viewBox, rowLengthMm, rowSpacingMm } = mapExtent(
    design,
    siteId,
  );
  const fit = fitToPage(viewBox.width, viewBox.height, paper);
  const entryIndex = new Map(design.entries.map((e, i) => [e.id, i]));
  const byId = new Map(plots.map((p) => [p.id, p]));
  const plotWidth = design.layout.rowsPerPlot * rowSpacingMm;
  const rowLength = rowLengthMm;
  const font = Math.min(plotWidth * 0.32, rowLength * 0.12, alleyMm * 0.45);
  const bar = scaleBar(geometry.widthMm, system);
  const site = design.sites.find((s) => s.id === siteId);
  const rect = new Map(geometry.plots.map((g) => [g.plotNumber, g]));
  return (
    <svg
      role="img"
      aria-labelledby="map-title"
      data-testid="planting-map"
      data-print-width-mm={fit.drawingWidthMm.toFixed(1)}
      data-print-height-mm={fit.drawingHeightMm.toFixed(1)}
      viewBox={`${viewBox.x} ${viewBox.y} ${viewBox.width} ${viewBox.height}`}
      className="planting-map-svg block h-auto w-full max-h-[80vh] rounded-lg bg-white"
      preserveAspectRatio="xMidYMid meet"
      fontFamily="'Public Sans Variable', sans-serif"
    >
      <title id="map-title">
        Planting map of {site?.name ?? 'the site'}: {plots.length} plots drawn to scale
      </title>
      {geometry.ranges.map((r) => (
        <text
          key={r.range}
          x={0}
          y={r.y - alleyMm * 0.25}
          fontSize={Math.min(alleyMm * 0.45, font * 1.2)}
          fontWeight={700}
          fill="#1b3822"
        >
          {r.block === null ? `Range ${r.range}` : `Block ${r.block}`}
        </text>
      ))}
      {plots.map((p) => {
        const g = rect.get(p.plotNumber)!;
        const entry = design.entries[entryIndex.get(p.entryId) ?? 0];
        const spacing = byId.get(p.id)?.inRowSpacingMm ?? null;
        const rows = design.layout.rowsPerPlot;
        const rowGap = g.width / rows;
        const plantsPerRow = spacing ? Math.floor(g.height / spacing + 1e-9) : 0;
        return (
          <g key={p.id}>
            <rect
              data-plot={p.plotNumber}
              x={g.x}
              y={g.y}
              width={g.width}
              height={g.height}
              fill={entryFill(entryIndex.get(p.entryId) ?? 0)}
              stroke="#2f5d3a"
              strokeWidth={Math.max(g.width, g.height) * 0.008}
            />
            {Array.from({ length: rows }, (_, r) => {
              const x = g.x + (r + 0.5) * rowGap;
              return (
                <g key={r}>
                  <line
                    x1={x}
                    x2={x}
                    y1={g.y + g.height * 0.02}
                    y2={g.y + g.height * 0.98}
                    stroke="#6b4f36"
                    strokeOpacity={0.35}
                    strokeWidth={rowGap * 0.04}
                  />
                  {plantsPerRow > 0 && plantsPerRow <= 80
                    ? Array.from({ length: plantsPerRow }, (_, k) => (
                        <circle
                          key={k}
                          cx={x}
                          cy={g.y + (k + 0.5) * (spacing ?? 0)}
                          r={Math.min(rowGap * 0.12, (spacing ?? 0) * 0.25)}
                          fill="#2f5d3a"
                          fillOpacity={0.45}
                        />
                      ))
                    : null}
                </g>
              );
            })}
            <text
              x={g.x + g.width / 2}
              y={g.y + font * 1.1}
              fontSize={font}
              textAnchor="middle"
              fontWeight={700}
              fill="#1f2a1c"
              paintOrder="stroke"
              stroke="#ffffff"
              strokeWidth={font * 0.12}
            >
              {p.plotNumber}
            </text>
            <text
              x={g.x + g.width / 2}
              y={g.y + g.height / 2 + font * 0.4}
              fontSize={font * 1.1}
              textAnchor="middle"
              fontFamily="ui-monospace, monospace"
              fontWeight={700}
              fill="#1b3822"
              paintOrder="stroke"
              stroke="#ffffff"
              strokeWidth={font * 0.12}
            >
              {entry?.code}
            </text>
          </g>
        );
      })}
      <g transform={`translate(0 ${geometry.heightMm + alleyMm * 0.5})`}>
        <rect x={0} y={0} width={bar.mm} height={alleyMm * 0.15} fill="#1f2a1c" />
        <text
          x={bar.mm + font * 0.3}
          y={alleyMm * 0.2}
          fontSize={Math.min(font, alleyMm * 0.4)}
          fill="#1f2a1c"
        >
          {bar.label} · rows {formatLength(rowLength, system)} long,{' '}
          {formatSpacing(rowSpacingMm, system)} apart
        </text>
      </g>
    </svg>
  );
}
