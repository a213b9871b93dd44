/**
 * The published results sheet's page, drawn on the server: the ranked sheet as HTML (from the
 * client's own `SheetView`, built by `vite build` into dist/sheet-html) and its numbers as JSON
 * for the client to mount over it. A published version never changes, so each is drawn once per
 * process and kept with the version (see `frozenVersion`).
 */
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { ResultSnapshot } from '../../common/contracts/results';
import type { DB } from '../../db/database';
import { AppError } from '../lib/app-error';
import { frozenVersion, type FrozenVersion } from './results-service';

type RenderSheet = (sheet: ResultSnapshot) => string;

const renderers = new Map<string, Promise<RenderSheet | null>>();
const drawn = new WeakMap<FrozenVersion, string>();

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

/**
 * The markup to place after the app's root for `/r/<slug>` or `/r/<slug>/v/<n>`, or null (not a
 * sheet's address, not published, or the renderer not built): then the plain app shell serves.
 */
export async function sheetPageMarkup(
  db: DB,
  urlPath: string,
  clientDir: string,
): Promise<string | null> {
  const match = /^\/r\/([a-z0-9]+(?:-[a-z0-9]+)*)(?:\/v\/([1-9]\d{0,5}))?\/?$/.exec(urlPath);
  if (!match) return null;
  const render = await rendererFor(clientDir);
  if (!render) return null;
  let frozen: FrozenVersion;
  try {
    frozen = await frozenVersion(db, match[1]!, match[2] ? Number(match[2]) : undefined);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) return null;
    throw err;
  }
  let html = drawn.get(frozen);
  if (html === undefined) {
    html = render(frozen.snapshot);
    drawn.set(frozen, html);
  }
  return (
    `<div id="sheet-prerender" class="mx-auto max-w-6xl px-3 py-4 sm:px-6 sm:py-6">${html}</div>` +
    `<script type="application/json" id="sheet-data">${scriptSafe(frozen.json)}</script>`
  );
}
