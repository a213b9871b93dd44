/**
 * Plot labels: the sheet layouts fit their paper, labels split into whole sheets, and a label's
 * address reads back to the plot while anything else is refused.
 */
import { describe, expect, it } from 'vitest';
import { labelPages, labelSheets, plotAddress, readPlotAddress } from '../../common/plot-labels';

const plotId = '0f8e2a9c-5b1d-4c3e-9a7f-2d6b8e1c4a50';

describe('label sheets', () => {
  it('fit on their paper: A4 is 210 × 297 mm, US Letter 8.5 × 11 in (ISO 216; ANSI/ASME Y14.1)', () => {
    const paper = { A4: [210, 297], letter: [8.5, 11] } as const;
    for (const s of labelSheets) {
      const [w, h] = paper[s.page];
      const width = 2 * s.marginLeft + s.columns * s.labelWidth + (s.columns - 1) * s.columnGap;
      const height = s.marginTop + s.rows * s.labelHeight + (s.rows - 1) * s.rowGap;
      expect(width).toBeLessThanOrEqual(w);
      expect(height).toBeLessThanOrEqual(h);
    }
  });

  it('splits labels into whole sheets, the last one partly used', () => {
    const a4 = labelSheets.find((s) => s.id === 'a4-24')!;
    const pages = labelPages(
      Array.from({ length: 50 }, (_, i) => i),
      a4,
    );
    expect(pages.map((p) => p.length)).toEqual([24, 24, 2]);
    expect(labelPages([], a4)).toEqual([]);
  });
});

describe('the address on a label', () => {
  it('opens the field log at the plot, and reads back to the same path', () => {
    const address = plotAddress('https://rows.example.org/', 'brookfold-okra', plotId);
    expect(address).toBe(`https://rows.example.org/t/brookfold-okra/log?plot=${plotId}`);
    expect(readPlotAddress(address, 'https://rows.example.org')).toEqual({
      path: `/t/brookfold-okra/log?plot=${plotId}`,
      slug: 'brookfold-okra',
      plotId,
    });
  });

  it('refuses codes that are not our plot labels, so a scan never leaves the app', () => {
    const origin = 'https://rows.example.org';
    for (const text of [
      'hello',
      `https://elsewhere.example.net/t/brookfold-okra/log?plot=${plotId}`,
      `https://rows.example.org/t/brookfold-okra/records?plot=${plotId}`,
      'https://rows.example.org/t/brookfold-okra/log?plot=not-a-plot',
      `javascript:alert(1)//t/x/log?plot=${plotId}`,
    ])
      expect(readPlotAddress(text, origin)).toBeNull();
  });
});
