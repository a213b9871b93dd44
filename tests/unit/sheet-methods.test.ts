// The published methods name the traits analysed by another model than the sheet's, so the
// words never contradict the numbers (a split plot left to the design: traits that lost plots
// go to the mixed model, complete ones keep the classical strata).
import { describe, expect, it } from 'vitest';
import type { SnapshotTrait } from '../../common/contracts/results';
import { mixedTraitsNote } from '../../server/results/snapshot';

const trait = (label: string, model?: 'anova' | 'mixed') =>
  ({ label, ...(model ? { model } : {}) }) as SnapshotTrait;

describe('the methods note on traits analysed by another model', () => {
  it('is empty when every trait used the sheet’s model', () => {
    expect(
      mixedTraitsNote([trait('Days to first pods'), trait('Pod yield', 'anova')], 'anova'),
    ).toBe('');
  });

  it('names the traits that went to the mixed model', () => {
    const note = mixedTraitsNote(
      [trait('Days to first pods', 'mixed'), trait('Pod yield', 'anova')],
      'anova',
    );
    expect(note).toMatch(/^Days to first pods lost plots, so it was analysed by the mixed model/);
    expect(note).not.toContain('Pod yield');
  });
});
