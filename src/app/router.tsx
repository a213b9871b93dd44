import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { Spinner } from '@/components/ui/spinner';
import { RootErrorBoundary } from './routes/root-error-boundary';
import { AppShell } from './routes/app-shell';

/** Route modules load on demand; each exports `Component` (and may export `loader`). */
export function appRoutes(_queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: '/',
      element: <AppShell />,
      errorElement: <RootErrorBoundary />,
      hydrateFallbackElement: <Spinner />,
      children: [
        { index: true, lazy: () => import('@/features/trials/routes/trial-list-route') },
        { path: 't/:slug', lazy: () => import('@/features/trials/routes/trial-overview-route') },
        { path: '*', lazy: () => import('./routes/not-found') },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(appRoutes(queryClient));
}
