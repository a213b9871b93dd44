/**
 * A published results sheet's page arrives with the sheet already drawn by the server (after the
 * app's root) and its numbers embedded as JSON, so a reader sees it before any script runs. The
 * sheet's route mounts over it with those same numbers; any other page takes it away.
 */
const DRAWN = 'sheet-prerender';
const DATA = 'sheet-data';

/** The numbers the server embedded, read once (later navigations ask the API as usual). */
export function takeEmbeddedSheet(): unknown {
  const el = document.getElementById(DATA);
  if (!el?.textContent) return undefined;
  el.remove();
  try {
    return JSON.parse(el.textContent) as unknown;
  } catch {
    return undefined;
  }
}

/** Whether the server's drawing of the sheet is still on the page. */
export function hasPrerenderedSheet(): boolean {
  return document.getElementById(DRAWN) !== null;
}

export function removePrerenderedSheet(): void {
  document.getElementById(DRAWN)?.remove();
}
