import type { PageFit, PaperSize } from '@common/layout';
import { paperSizes } from '@common/layout';

/** The sheet for printing: @page size and orientation, and the drawing's size on paper. */
export function PrintPageStyle({
  paper,
  orientation,
  fit,
}: {
  paper: PaperSize;
  orientation: 'portrait' | 'landscape';
  fit?: PageFit;
}) {
  const css = `@page { size: ${paperSizes[paper].css} ${orientation}; margin: 12mm; }
@media print {
  html, body { background: #fff !important; }
  /* a full-screen-height shell would spill onto a blank second sheet */
  .min-h-screen { min-height: 0 !important; }
  main { padding: 0 !important; max-width: none !important; }
  .print-sheet { box-shadow: none !important; padding: 0 !important; }
  ${
    fit
      ? `.planting-map-svg { width: ${fit.drawingWidthMm.toFixed(1)}mm !important; height: ${fit.drawingHeightMm.toFixed(1)}mm !important; max-height: none !important; border-radius: 0; }
  .print-map-frame { break-inside: avoid; page-break-inside: avoid; }`
      : ''
  }
  .field-sheet tr { break-inside: avoid; }
}`;
  return <style>{css}</style>;
}

export function PaperPicker({
  value,
  onChange,
}: {
  value: PaperSize;
  onChange: (p: PaperSize) => void;
}) {
  return (
    <label className="flex items-center gap-2 text-sm font-medium">
      Paper
      <select
        className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
        value={value}
        onChange={(e) => onChange(e.target.value as PaperSize)}
      >
        <option value="letter">US Letter</option>
        <option value="a4">A4</option>
      </select>
    </label>
  );
}

/** Letter in the US, A4 elsewhere, until the reader picks. */
export const defaultPaper = (system: 'metric' | 'us'): PaperSize =>
  system === 'us' ? 'letter' : 'a4';
