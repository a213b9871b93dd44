/**
 * A published results sheet's page arrives with the sheet already drawn by the server (after the
 * app's root) and its numbers embedded as JSON, so a reader sees it before any script runs. While
 * the client's own drawing loads, the sheet's route moves the server's into the page's main
 * region (where the app's header and menu would otherwise push it below the screen), then mounts
 * over it with those same numbers; any other page takes it away.
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

/**
 * Moves the server's drawing into `holder` (the place the client's sheet will take), as it is:
 * one copy of the sheet on the page at every moment, inside the page's main region.
 */
export function keepPrerenderedSheetIn(holder: HTMLElement): void {
  const drawn = document.getElementById(DRAWN);
  if (!drawn || drawn.parentElement === holder) return;
  // The page's main region already sets the width and margins.
  drawn.removeAttribute('class');
  holder.appendChild(drawn);
}
