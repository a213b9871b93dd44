/**
 * Title and description for a shared link to a published sheet, written into the app shell on
 * the server, so link previews show the trial without running the client.
 */
import type { Trial } from '../../db/schema';

const escape = (s: string) =>
  s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );

/** The head elements for a published trial's sheet (the caller has read it as published). */
export function shareMeta(
  trial: Pick<Trial, 'title' | 'crop' | 'season' | 'description' | 'slug'>,
  baseUrl: string,
): string {
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
