import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import { useState } from 'react';
import { RouterProvider } from 'react-router-dom';
import { afterCacheRestored, cachePersistOptions } from '@/lib/persisted-cache';
import { createQueryClient } from '@/lib/query-client';
import { createAppRouter } from './router';

// The on-device copy of what was read (see src/lib/persisted-cache.ts); cleared when someone
// signs in or out.
const persistOptions = cachePersistOptions(window.localStorage, __APP_VERSION__);

export function App() {
  const [queryClient] = useState(createQueryClient);
  const [router] = useState(() => createAppRouter(queryClient));
  return (
    <PersistQueryClientProvider
      client={queryClient}
      persistOptions={persistOptions}
      onSuccess={() => afterCacheRestored(queryClient)}
    >
      <RouterProvider router={router} />
    </PersistQueryClientProvider>
  );
}
