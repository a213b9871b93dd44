import type { TrialSummary } from '@common/contracts/trials';

/**
 * Where a trial's link leads: its members (and administrators) to the trial's own pages; anyone
 * else, who may only read a published trial, straight to its public results sheet.
 */
export function trialHref(
  trial: Pick<TrialSummary, 'slug' | 'status' | 'myRole'>,
  isAdmin: boolean,
): string {
  if (trial.myRole || isAdmin || trial.status !== 'published') return `/t/${trial.slug}`;
  return `/r/${trial.slug}`;
}
