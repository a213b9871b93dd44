/**
 * Chart tooltips are read as text: every line of one, whatever the series' colour, has a contrast
 * ratio of at least 4.5:1 with the tooltip's background (WCAG 2.2 success criterion 1.4.3
 * Contrast (Minimum); contrast ratio and relative luminance as WCAG 2.2 defines them). The
 * tooltip is recharts' own content drawn with the style every chart passes it.
 */
import { render } from '@testing-library/react';
import { DefaultTooltipContent } from 'recharts';
import { describe, expect, it } from 'vitest';
import { chartPalette, tooltipStyle } from '../../src/components/ui/chart-palette';

/** `#rrggbb` or `rgb(r, g, b)` → [r, g, b] in 0–255. */
function channels(colour: string): number[] {
  const hex = /^#([0-9a-f]{6})$/i.exec(colour);
  if (hex) return [0, 2, 4].map((i) => parseInt(hex[1]!.slice(i, i + 2), 16));
  const rgb = /^rgb\((\d+), (\d+), (\d+)\)$/.exec(colour);
  if (!rgb) throw new Error(`not a colour: ${colour}`);
  return rgb.slice(1, 4).map(Number);
}

/** WCAG 2.2 relative luminance (sRGB, linearised with the 0.04045 threshold). */
function luminance(colour: string): number {
  const [r, g, b] = channels(colour).map((c) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}

/** WCAG 2.2 contrast ratio, (L1 + 0.05) / (L2 + 0.05) with L1 the lighter. */
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

describe('the contrast ratio itself', () => {
  it('matches WCAG’s end points and a well-known grey', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrast('#ffffff', '#ffffff')).toBeCloseTo(1, 5);
    // #767676 is the lightest grey that passes 4.5:1 on white, #777777 just fails (from memory).
    expect(contrast('#767676', '#ffffff')).toBeGreaterThanOrEqual(4.5);
    expect(contrast('#777777', '#ffffff')).toBeLessThan(4.5);
  });
});

describe('a chart tooltip', () => {
  it('reads at 4.5:1 or more for every series colour, its label included', () => {
    const payload = chartPalette.map((colour, i) => ({
      name: `Entry ${i + 1}`,
      value: 1234 + i,
      color: colour,
      dataKey: `s${i}`,
      graphicalItemId: `line-${i}`,
    }));
    const { container } = render(
      <DefaultTooltipContent {...tooltipStyle} label="Hollin Yard" payload={payload} />,
    );
    const box = container.querySelector<HTMLElement>('.recharts-default-tooltip')!;
    const background = box.style.backgroundColor;
    const items = [...container.querySelectorAll<HTMLElement>('.recharts-tooltip-item')];
    expect(items).toHaveLength(chartPalette.length);
    for (const item of items)
      expect({ item: item.textContent, ratio: contrast(item.style.color, background) }).toEqual({
        item: item.textContent,
        ratio: expect.toSatisfy((r: number) => r >= 4.5),
      });
    const label = container.querySelector<HTMLElement>('.recharts-tooltip-label')!;
    expect(contrast(label.style.color, background)).toBeGreaterThanOrEqual(4.5);
  });

  it('would not, drawn in the series colours themselves (why the style sets the text colour)', () => {
    const light = chartPalette.filter((c) => contrast(c, '#ffffff') < 4.5);
    expect(light.length).toBeGreaterThan(0);
  });
});
