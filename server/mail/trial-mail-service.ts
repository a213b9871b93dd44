import type { TrialMailResponse } from '../../common/contracts/mail';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import { trialForAction } from '../trials/trials-service';
import * as repo from './mail-repository';

/** The newest messages shown; the counts cover all of them. */
const LISTED = 100;

/** What the trial's mail did (invitations, follow confirmations, results notices): for its lead. */
export async function trialMail(
  db: DB,
  slug: string,
  actor: Actor | null,
  query: { status?: TrialMailResponse['mail'][number]['status'] },
): Promise<TrialMailResponse> {
  const { trial } = await trialForAction(db, slug, actor, 'members.manage');
  const [rows, counts] = await Promise.all([
    repo.trialMail(db, trial.id, { status: query.status, limit: LISTED }),
    repo.trialMailCounts(db, trial.id),
  ]);
  return {
    mail: rows.map((r) => ({
      id: r.id,
      kind: r.kind,
      recipient: r.recipient,
      subject: r.subject,
      status: r.status,
      attempts: r.attempts,
      lastError: r.last_error,
      createdAt: r.created_at.toISOString(),
      sentAt: r.sent_at?.toISOString() ?? null,
    })),
    counts,
  };
}
