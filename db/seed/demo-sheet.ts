/**
 * The demo's published results sheet: the lead of the bean trial writes a summary and publishes
 * version 1 through the same service the results editor uses, so a fresh install has a real
 * frozen sheet at /r. The okra trial stays unpublished for the lead to publish.
 */
import { saveSheetBody } from '../../common/contracts/results';
import type { MailQueue } from '../../server/mail/mail-queue';
import { getDraft, publish, saveDraft } from '../../server/results/results-service';
import type { DB } from '../database';
import { demoLeadActor } from './demo-lead';
import { demoTrials } from './demo-season';

export const DEMO_PUBLISHED_SLUG = 'fennick-bush-beans-2026';
export const DEMO_VERSION_NOTE =
  'First results of the season: all four blocks picked through late August.';
const DEMO_SUMMARY =
  'Marrowfield Flat gave the heaviest marketable harvest in the schoolyard beds this summer and tops the ranking across traits. Inkdrop Black stayed the shortest, which suits the low beds along the fence. The pod counts differed no more than the blocks alone would explain.';

/** A fresh demo has nobody following its sheet, so publishing it has nobody to write to. */
const nobodyToTell: MailQueue = {
  enqueue: () => Promise.reject(new Error('The demo sheet has no followers to write to.')),
  stop: () => Promise.resolve(),
};

export async function publishDemoSheet(db: DB): Promise<number> {
  const trial = demoTrials.find((t) => t.slug === DEMO_PUBLISHED_SLUG)!;
  const actor = await demoLeadActor(db);
  const deps = { db, mail: nobodyToTell, baseUrl: '' };
  // The default sheet (every trait with a direction, alpha 0.05, HSD letters) with the lead's words.
  const draft = await getDraft(deps, trial.slug, actor);
  const sheet = saveSheetBody.parse({ ...draft, summary: DEMO_SUMMARY });
  await saveDraft(deps, trial.slug, actor, sheet);
  const { version } = await publish(deps, trial.slug, actor, DEMO_VERSION_NOTE);
  return version;
}
