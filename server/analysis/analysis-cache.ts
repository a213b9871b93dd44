/**
 * Analyses kept per trial data version. The version (trials.data_version) is moved on by the
 * database at every change to a trial's records, design, weather, photos or sheet, and is read
 * with the trial on every request, so an entry can only be found while its data is unchanged:
 * nothing stale is served, in this process or any other. Requests that arrive together for the
 * same analysis share one computation.
 */
import type { Trial } from '../../db/schema';

/** Enough for the traits of the few trials being read at once; the oldest goes first. */
const MAX_ENTRIES = 64;

const entries = new Map<string, Promise<unknown>>();

export function cachedForTrialData<T>(
  trial: Pick<Trial, 'id' | 'data_version'>,
  question: unknown,
  compute: () => Promise<T>,
): Promise<T> {
  const key = `${trial.id}\u0000${trial.data_version}\u0000${JSON.stringify(question)}`;
  const hit = entries.get(key) as Promise<T> | undefined;
  if (hit) {
    // Most recently used moves to the end.
    entries.delete(key);
    entries.set(key, hit);
    return hit;
  }
  const pending = compute();
  entries.set(key, pending);
  // A refusal (no records yet, too large) is not kept: the next request asks again.
  pending.catch(() => entries.delete(key));
  while (entries.size > MAX_ENTRIES) entries.delete(entries.keys().next().value!);
  return pending;
}
