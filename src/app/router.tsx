import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { Spinner } from '@/components/ui/spinner';
import { requireSignIn } from '@/lib/require-sign-in';
import { RootErrorBoundary } from './routes/root-error-boundary';
import { AppShell } from './routes/app-shell';

/** Route modules load on demand; each exports `Component` (and may export `loader`). */
export function appRoutes(queryClient: QueryClient): RouteObject[] {
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
        { path: 'r', lazy: () => import('@/features/results/routes/published-index-route') },
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
        // A variety and the cross-season table are public for what published versions show.
        {
          path: 'varieties/compare',
          lazy: () => import('@/features/varieties/routes/compare-route'),
        },
        {
          path: 'varieties/:variety',
          lazy: () => import('@/features/varieties/routes/variety-route'),
        },
        // An open offer of seed is public: a published sheet links to it.
        { path: 'offers/:offerId', lazy: () => import('@/features/seed/routes/offer-route') },
        {
          // Pages that need a signed-in user: signed-out visitors go to sign in and come back.
          loader: requireSignIn(queryClient),
          children: [
            { path: 'trials/new', lazy: () => import('@/features/design/routes/new-trial-route') },
            {
              path: 'varieties/:slug/seed',
              lazy: () => import('@/features/seed/routes/variety-seed-route'),
            },
            {
              path: 't/:slug/settings',
              lazy: () => import('@/features/design/routes/settings-route'),
            },
            {
              path: 't/:slug/entries',
              lazy: () => import('@/features/design/routes/entries-route'),
            },
            { path: 't/:slug/sites', lazy: () => import('@/features/design/routes/sites-route') },
            { path: 't/:slug/traits', lazy: () => import('@/features/design/routes/traits-route') },
            { path: 't/:slug/layout', lazy: () => import('@/features/design/routes/layout-route') },
            { path: 't/:slug/map', lazy: () => import('@/features/design/routes/map-route') },
            {
              path: 't/:slug/field-sheet',
              lazy: () => import('@/features/design/routes/field-sheet-route'),
            },
            {
              path: 't/:slug/planting',
              lazy: () => import('@/features/design/routes/planting-route'),
            },
            {
              path: 't/:slug/results',
              lazy: () => import('@/features/results/routes/sheet-editor-route'),
            },
            {
              path: 't/:slug/compare',
              lazy: () => import('@/features/results/routes/comparison-route'),
            },
            { path: 'account', lazy: () => import('@/features/account/routes/account-route') },
            {
              path: 'varieties',
              lazy: () => import('@/features/varieties/routes/register-route'),
            },
            {
              path: 'analyze',
              lazy: () => import('@/features/analysis/routes/analyze-spreadsheet-route'),
            },
            {
              path: 't/:slug/members',
              lazy: () => import('@/features/members/routes/members-route'),
            },
          ],
        },
        { path: 'sign-in', lazy: () => import('@/features/auth/routes/sign-in-route') },
        { path: 'sign-up', lazy: () => import('@/features/auth/routes/sign-up-route') },
        { path: 'check-email', lazy: () => import('@/features/auth/routes/check-email-route') },
        {
          path: 'email-verified',
          lazy: () => import('@/features/auth/routes/email-verified-route'),
        },
        {
          path: 'forgot-password',
          lazy: () => import('@/features/auth/routes/forgot-password-route'),
        },
        {
          path: 'reset-password',
          lazy: () => import('@/features/auth/routes/reset-password-route'),
        },
        { path: 'sign-out', lazy: () => import('@/features/auth/routes/sign-out-route') },
        {
          path: 'invitations/accept',
          lazy: () => import('@/features/invitations/routes/accept-invitation-route'),
        },
        { path: 'dev/mailbox', lazy: () => import('@/features/mailbox/routes/mailbox-route') },
        {
          path: 't/:slug/analysis',
          lazy: () => import('@/features/analysis/routes/trial-analysis-route'),
        },
        { path: 't/:slug/log', lazy: () => import('@/features/field-log/routes/field-log-route') },
        {
          path: 't/:slug/log/events',
          lazy: () => import('@/features/field-log/routes/field-events-route'),
        },
        {
          path: 't/:slug/log/labels',
          lazy: () => import('@/features/field-log/routes/plot-labels-route'),
        },
        {
          path: 't/:slug/log/sheet',
          lazy: () => import('@/features/field-log/routes/recording-sheet-route'),
        },
        {
          path: 't/:slug/records/harvests',
          lazy: () => import('@/features/records/routes/harvest-log-route'),
        },
        {
          path: 't/:slug/records/observations',
          lazy: () => import('@/features/records/routes/observation-log-route'),
        },
        {
          path: 't/:slug/records/completeness',
          lazy: () => import('@/features/records/routes/completeness-route'),
        },
        {
          path: 't/:slug/records/files',
          lazy: () => import('@/features/records/routes/import-export-route'),
        },
        {
          path: 't/:slug/records/audit',
          lazy: () => import('@/features/records/routes/audit-route'),
        },
        { path: '*', lazy: () => import('./routes/not-found') },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(appRoutes(queryClient));
}
