/**
 * Title and description for a shared link to a published sheet, written into the app shell on
 * the server, so link previews show the trial without running the client.
 */
import type { DB } from '../../db/database';

const escape = (s: string) =>
  s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );

export async function shareMeta(db: DB, path: string, baseUrl: string): Promise<string | null> {
  const match = /^\/r\/([a-z0-9]+(?:-[a-z0-9]+)*)(?:\/|$)/.exec(path);
  if (!match) return null;
  const trial = await db
    .selectFrom('trials')
    .select(['title', 'crop', 'season', 'description', 'status', 'slug'])
    .where('slug', '=', match[1]!)
    .executeTakeFirst();
  if (!trial || trial.status !== 'published') return null;
  const title = `${trial.title} — results`;
  const description = (
    trial.description || `${trial.crop} variety trial, ${trial.season}: ranked results.`
  ).slice(0, 300);
  const url = `${baseUrl}/r/${trial.slug}`;
  return [
    `<title>${escape(title)} · Rowtally</title>`,
    `<meta name="description" content="${escape(description)}" />`,
    `<meta property="og:type" content="article" />`,
    `<meta property="og:title" content="${escape(title)}" />`,
    `<meta property="og:description" content="${escape(description)}" />`,
    `<meta property="og:url" content="${escape(url)}" />`,
    `<meta name="twitter:card" content="summary" />`,
  ].join('\n    ');
}
