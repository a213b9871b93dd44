// Ranks within a trait follow its direction. Expected ranks are standard competition ranks
// ("1224": tied values share the best rank; from memory, the usual definition), worked by hand.
import { describe, expect, it } from 'vitest';
import { rankByDirection, rankMeans } from '../../common/ranking';

describe('ranks by direction', () => {
  const heights = [920, 1010, 870, 1010];
  it('higher is better: the largest value is 1, ties share the best rank', () => {
    expect(rankByDirection(heights, 'higher')).toEqual([3, 1, 4, 1]);
  });
  it('lower is better: the smallest value is 1, ties share the best rank', () => {
    expect(rankByDirection(heights, 'lower')).toEqual([2, 3, 1, 3]);
  });
  it('no preferred direction: no ranks at all', () => {
    expect(rankByDirection(heights, 'none')).toEqual([null, null, null, null]);
  });
  it('means come back best first; with no direction, highest first and unranked', () => {
    const means = [
      { variety: 'Ashgrove', mean: 920 },
      { variety: 'Brindle', mean: 1010 },
      { variety: 'Corvel', mean: 870 },
    ];
    expect(rankMeans(means, 'lower').map((m) => [m.variety, m.rank])).toEqual([
      ['Corvel', 1],
      ['Ashgrove', 2],
      ['Brindle', 3],
    ]);
    expect(rankMeans(means, 'higher').map((m) => [m.variety, m.rank])).toEqual([
      ['Brindle', 1],
      ['Ashgrove', 2],
      ['Corvel', 3],
    ]);
    expect(rankMeans(means, 'none').map((m) => [m.variety, m.rank])).toEqual([
      ['Brindle', null],
      ['Ashgrove', null],
      ['Corvel', null],
    ]);
  });
});
