/**
 * What the app last read (trial, plots, traits, analyses) is kept on the device, so the field
 * log opens and works with no signal. The copy is a stand-in, never an answer: a reload shows it
 * only until the server answers (or for as long as there is no signal), and a copy read before
 * this device's last write to that view is not restored at all.
 */
import { createSyncStoragePersister } from '@tanstack/query-sync-storage-persister';
import type { QueryClient } from '@tanstack/react-query';
import type { PersistQueryClientOptions, Persister } from '@tanstack/react-query-persist-client';
import { CACHE_MAX_AGE_MS, CACHE_STORAGE_KEY } from './query-client';
import { readBeforeWrite, readTrialWrites } from './trial-writes';

/** The localStorage persister, leaving out every copy older than a write made on this device. */
export function createCachePersister(storage: Storage): Persister {
  const base = createSyncStoragePersister({ storage, key: CACHE_STORAGE_KEY });
  return {
    persistClient: base.persistClient,
    removeClient: base.removeClient,
    restoreClient: async () => {
      const client = await base.restoreClient();
      if (!client) return client;
      const writes = readTrialWrites(storage);
      const queries = client.clientState.queries.filter(
        (q) => !readBeforeWrite(q.queryKey, q.state.dataUpdatedAt, writes),
      );
      return { ...client, clientState: { ...client.clientState, queries } };
    },
  };
}

export const cachePersistOptions = (
  storage: Storage,
  buster: string,
): Omit<PersistQueryClientOptions, 'queryClient'> => ({
  persister: createCachePersister(storage),
  maxAge: CACHE_MAX_AGE_MS,
  buster,
});

/**
 * Called once the copy is restored: every restored query counts as out of date, so each one on
 * screen asks the server at once (queries wait while offline, and the copy shows meanwhile).
 */
export const afterCacheRestored = (queryClient: QueryClient) =>
  queryClient.invalidateQueries({ refetchType: 'none' });
