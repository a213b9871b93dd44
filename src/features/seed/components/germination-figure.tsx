import type { GerminationTest } from '@common/contracts/seed';
import { formatPercent } from '@common/seed-lots';

/** A germination percentage with its 95 % Wilson interval, one decimal at most. */
export function GerminationFigure({
  test,
}: {
  test: Pick<GerminationTest, 'percent' | 'lowerPercent' | 'upperPercent'>;
}) {
  return (
    <>
      <strong>{formatPercent(test.percent)}</strong>{' '}
      <span className="text-loam-700">
        ({formatPercent(test.lowerPercent).replace(' %', '')}–{formatPercent(test.upperPercent)})
      </span>
    </>
  );
}
