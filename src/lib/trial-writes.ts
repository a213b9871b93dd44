/**
 * When this device last wrote to each view of a trial. Kept in localStorage beside the
 * on-device query cache (and shared by the tabs), so a copy read before the write is never
 * restored after it, even when another tab saved that copy later.
 */
import { CACHE_MAX_AGE_MS } from './query-client';

const KEY = 'rowtally-trial-writes';

/** slug -> view -> time of the last write (ms since the epoch, this device's clock) */
export type TrialWrites = Record<string, Record<string, number>>;

const storage = (): Storage | null => {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    return null; // storage refused (private mode): nothing is persisted either
  }
};

export function readTrialWrites(from: Storage | null = storage()): TrialWrites {
  try {
    const parsed: unknown = JSON.parse(from?.getItem(KEY) ?? '{}');
    return parsed && typeof parsed === 'object' ? (parsed as TrialWrites) : {};
  } catch {
    return {};
  }
}

export function markTrialWritten(
  slug: string,
  views: readonly string[],
  now = Date.now(),
  to: Storage | null = storage(),
): void {
  if (!to) return;
  const writes = readTrialWrites(to);
  const trial = (writes[slug] ??= {});
  for (const v of views) trial[v] = now;
  // Older marks than the cache can hold protect nothing.
  for (const [s, byView] of Object.entries(writes)) {
    for (const [v, at] of Object.entries(byView)) if (now - at > CACHE_MAX_AGE_MS) delete byView[v];
    if (Object.keys(byView).length === 0) delete writes[s];
  }
  try {
    to.setItem(KEY, JSON.stringify(writes));
  } catch {
    // storage full: the restore then has no mark, and a reload still asks the server
  }
}

/** True when a copy of `queryKey` read at `readAt` predates this device's last write to it. */
export function readBeforeWrite(
  queryKey: readonly unknown[],
  readAt: number,
  writes: TrialWrites,
): boolean {
  if (queryKey[0] !== 'trial' || typeof queryKey[1] !== 'string') return false;
  const at = writes[queryKey[1]]?.[String(queryKey[2])];
  return at !== undefined && readAt <= at;
}
