/**
 * The published results sheet's page, drawn on the server: the ranked sheet as HTML (from the
 * client's own `SheetView`, built by `vite build` into dist/sheet-html) and its numbers as JSON
 * for the client to mount over it. A published version never changes, so each is drawn once per
 * process and kept with the version as served (see `frozenVersionOf`; an older version's entry
 * relinked to another variety is served anew, so it is drawn anew).
 */
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { ResultSnapshot } from '../../common/contracts/results';
import type { TrialOffer } from '../../common/contracts/seed';
import { openOffersOf } from '../seed/seed-service';
import type { DB } from '../../db/database';
import { AppError } from '../lib/app-error';
import type { Trial } from '../../db/schema';
import { frozenVersionOf, publishedTrial, type FrozenVersion } from './results-service';
import { shareMeta } from './share-meta';

type RenderSheet = (sheet: ResultSnapshot, offers: readonly TrialOffer[]) => string;

const renderers = new Map<string, Promise<RenderSheet | null>>();
/** Each version drawn once per set of open seed offers (the offers are live, the version frozen). */
const drawn = new WeakMap<FrozenVersion, Map<string, string>>();

/** The renderer built beside the client (dist/client → dist/sheet-html), or null if not built. */
function rendererFor(clientDir: string): Promise<RenderSheet | null> {
  const file = path.join(path.dirname(clientDir), 'sheet-html', 'entry-sheet-html.js');
  let renderer = renderers.get(file);
  if (!renderer) {
    renderer = fs.existsSync(file)
      ? import(pathToFileURL(file).href).then(
          (m: { renderSheetHtml: RenderSheet }) => m.renderSheetHtml,
        )
      : Promise.resolve(null);
    renderers.set(file, renderer);
  }
  return renderer;
}

/** JSON inside a <script> element: `<` escaped so no text in it can close the element. */
const scriptSafe = (json: string) =>
  json
    .replace(/</g, '\\u003c')
    .replace(/\u2028/g, '\\u2028')
    .replace(/\u2029/g, '\\u2029');

/** What the server writes into the app shell for a published sheet's address. */
export interface SheetPage {
  /** Title and link-preview elements for the page's head. */
  meta: string;
  /** The drawn sheet and its numbers, placed after the app's root; null without a renderer or version. */
  markup: string | null;
}

/**
 * For any address under `/r/<slug>` of a published trial, the head elements; for `/r/<slug>` or
 * `/r/<slug>/v/<n>` also the drawn sheet. Null when it is not such an address or not published:
 * then the plain app shell serves. The trial is read once for both.
 */
export async function sheetPage(
  db: DB,
  urlPath: string,
  baseUrl: string,
  clientDir: string,
): Promise<SheetPage | null> {
  const match = /^\/r\/([a-z0-9]+(?:-[a-z0-9]+)*)(?:\/|$)/.exec(urlPath);
  if (!match) return null;
  let trial: Trial;
  try {
    trial = await publishedTrial(db, match[1]!);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) return null;
    throw err;
  }
  const meta = shareMeta(trial, baseUrl);
  const sheet = /^\/r\/[^/]+(?:\/v\/([1-9]\d{0,5}))?\/?$/.exec(urlPath);
  if (!sheet) return { meta, markup: null };
  const render = await rendererFor(clientDir);
  if (!render) return { meta, markup: null };
  let frozen: FrozenVersion;
  let offers: TrialOffer[];
  try {
    // Both need only the trial, already read as published through its entry point, so the
    // version's stamp and the trial's open offers are asked at once, not one after the other.
    [frozen, offers] = await Promise.all([
      frozenVersionOf(db, trial, sheet[1] ? Number(sheet[1]) : undefined),
      openOffersOf(db, trial.id),
    ]);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) return { meta, markup: null };
    throw err;
  }
  const offersKey = JSON.stringify(offers);
  let byOffers = drawn.get(frozen);
  if (!byOffers) {
    byOffers = new Map();
    drawn.set(frozen, byOffers);
  }
  let html = byOffers.get(offersKey);
  if (html === undefined) {
    html = render(frozen.snapshot, offers);
    // Only the latest few sets are kept: packets left change with every request.
    if (byOffers.size >= 8) byOffers.clear();
    byOffers.set(offersKey, html);
  }
  return {
    meta,
    markup:
      `<div id="sheet-prerender" class="mx-auto max-w-6xl px-3 py-4 sm:px-6 sm:py-6">${html}</div>` +
      `<script type="application/json" id="sheet-data">${scriptSafe(frozen.json)}</script>`,
  };
}
