import { createSyncStoragePersister } from '@tanstack/query-sync-storage-persister';
import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import { useState } from 'react';
import { RouterProvider } from 'react-router-dom';
import { CACHE_MAX_AGE_MS, CACHE_STORAGE_KEY, createQueryClient } from '@/lib/query-client';
import { createAppRouter } from './router';

/**
 * What the app last read (trial, plots, traits) is kept on the device, so the field log opens
 * and works with no signal; it is cleared when someone signs in or out.
 */
const persister = createSyncStoragePersister({
  storage: window.localStorage,
  key: CACHE_STORAGE_KEY,
});

export function App() {
  const [queryClient] = useState(createQueryClient);
  const [router] = useState(() => createAppRouter(queryClient));
  return (
    <PersistQueryClientProvider
      client={queryClient}
      persistOptions={{ persister, maxAge: CACHE_MAX_AGE_MS, buster: __APP_VERSION__ }}
    >
      <RouterProvider router={router} />
    </PersistQueryClientProvider>
  );
}
