/**
 * What the permission policy reads of a user's part in a trial, as query columns and as the
 * policy's `TrialAccess`: one reading for `trialForAction` (through `trialWithAccess`) and for
 * lists that check each trial they show something of (`trialAllows`).
 */
import { sql } from 'kysely';
import type { Actor, TrialAccess, TrialRole } from '../../common/policy';
import type { Trial } from '../../db/schema';

type SiteIds = string[] | null;

/**
 * A user's part in the trial whose id is at `trialRef` (its role there; a grower's sites), as
 * columns beside the trial row. No user, or none in the trial: both null.
 */
export function membershipColumns(trialRef: 't.id' | 'ct.id', userId: string | null) {
  const trialId = sql.ref<string>(trialRef);
  const user = userId ?? '';
  return [
    sql<TrialRole | null>`(select m.role from trial_members m
      where m.trial_id = ${trialId} and m.user_id = ${user})`.as('member_role'),
    sql<SiteIds>`(select array_agg(ms.site_id order by ms.site_id)
      from trial_member_sites ms
      where ms.trial_id = ${trialId} and ms.user_id = ${user})`.as('member_site_ids'),
  ];
}

/** A trial's status and the actor's membership columns (`membershipColumns`) as the policy reads them. */
export interface TrialMembership {
  status: Trial['status'];
  member_role: TrialRole | null;
  member_site_ids: SiteIds;
}

export function membershipAccess(row: TrialMembership, actor: Actor | null): TrialAccess {
  const role = actor ? (row.member_role ?? null) : null;
  const growerSiteIds =
    role === 'grower' && row.member_site_ids && row.member_site_ids.length
      ? row.member_site_ids
      : null;
  return { status: row.status, role, growerSiteIds };
}
