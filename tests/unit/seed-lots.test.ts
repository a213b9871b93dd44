/**
 * When a lot's germination needs testing again and how well its plots stood. A germination
 * result trusted for one year is common practice (no source); the stand is plants surviving
 * over plants set, summed over plots with both counts (arithmetic, checked by hand below).
 */
import { describe, expect, it } from 'vitest';
import { formatPercent, lotWarnings, standPercent, testIsOld } from '../../common/seed-lots';

describe('a lot’s warnings', () => {
  it('calls a test old only when it is more than a year before today', () => {
    expect(testIsOld('2025-06-01', '2026-06-01')).toBe(false);
    expect(testIsOld('2025-05-31', '2026-06-01')).toBe(true);
    // A year before 29 February is 28 February of the year before.
    expect(testIsOld('2023-02-28', '2024-02-29')).toBe(false);
    expect(testIsOld('2023-02-27', '2024-02-29')).toBe(true);
  });

  it('reads only the newest test against the threshold', () => {
    expect(lotWarnings([], 80, '2026-06-01').map((w) => w.kind)).toEqual(['untested']);
    const tests = [
      { testedOn: '2026-03-01', percent: 79.5 },
      { testedOn: '2025-03-01', percent: 95 },
    ];
    const [w] = lotWarnings(tests, 80, '2026-06-01');
    expect(w).toEqual({
      kind: 'below_threshold',
      message: 'The last test germinated 79.5 %, below the group’s 80 %.',
    });
    expect(lotWarnings(tests, 79.5, '2026-06-01')).toEqual([]);
    expect(lotWarnings(tests, 70, '2027-03-02').map((x) => x.kind)).toEqual(['test_old']);
  });

  it('writes percentages without float noise', () => {
    expect(formatPercent((100 * 15) / 148)).toBe('10.1 %');
    expect(formatPercent(94)).toBe('94 %');
  });
});

describe('the stand of plots sown from a lot', () => {
  it('sums surviving over set across plots with both counts', () => {
    // (18 + 9) / (20 + 10) = 90 %; the plot without a stand count and the empty plot are left out.
    expect(
      standPercent([
        { plantsSet: 20, plantsSurviving: 18 },
        { plantsSet: 10, plantsSurviving: 9 },
        { plantsSet: 12, plantsSurviving: null },
        { plantsSet: 0, plantsSurviving: 0 },
      ]),
    ).toBe(90);
    expect(standPercent([{ plantsSet: null, plantsSurviving: 4 }])).toBeNull();
  });
});
