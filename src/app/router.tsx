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
        {
          path: 't/:slug/photos',
          lazy: () => import('@/features/photos/routes/photo-gallery-route'),
        },
        {
          path: 't/:slug/photos/upload',
          lazy: () => import('@/features/photos/routes/photo-upload-route'),
        },
        {
          path: 't/:slug/photos/compare',
          lazy: () => import('@/features/photos/routes/photo-compare-route'),
        },
        { path: 'trials/new', lazy: () => import('@/features/design/routes/new-trial-route') },
        { path: 't/:slug/settings', lazy: () => import('@/features/design/routes/settings-route') },
        { path: 't/:slug/entries', lazy: () => import('@/features/design/routes/entries-route') },
        { path: 't/:slug/sites', lazy: () => import('@/features/design/routes/sites-route') },
        { path: 't/:slug/traits', lazy: () => import('@/features/design/routes/traits-route') },
        { path: 't/:slug/layout', lazy: () => import('@/features/design/routes/layout-route') },
        { path: 't/:slug/map', lazy: () => import('@/features/design/routes/map-route') },
        {
          path: 't/:slug/field-sheet',
          lazy: () => import('@/features/design/routes/field-sheet-route'),
        },
        { path: 't/:slug/planting', lazy: () => import('@/features/design/routes/planting-route') },
        {
          path: 't/:slug/results',
          lazy: () => import('@/features/results/routes/sheet-editor-route'),
        },
        {
          path: 't/:slug/compare',
          lazy: () => import('@/features/results/routes/comparison-route'),
        },
        { path: 'r/:slug', lazy: () => import('@/features/results/routes/public-sheet-route') },
        {
          path: 'r/:slug/v/:version',
          lazy: () => import('@/features/results/routes/public-sheet-route'),
        },
        {
          path: 'r/:slug/follow',
          lazy: () => import('@/features/results/routes/follow-confirm-route'),
        },
        { path: 'unsubscribe', lazy: () => import('@/features/results/routes/unsubscribe-route') },
        { path: '*', lazy: () => import('./routes/not-found') },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(appRoutes(queryClient));
}
