import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useMemo } from 'react';
import { createBrowserRouter, type RouteObject } from 'react-router';
import { RouterProvider } from 'react-router/dom';
import { PageSpinner } from '../components/ui/page-status';
import { paths } from '../config/paths';
import { meQueryKey } from '../lib/session/get-me';
import { setUnauthorizedHandler } from '../lib/api-client';
import { RouteErrorBoundary } from './routes/route-error';

// Each page is its own chunk: the sign-in page never loads the signed-in area's code, and
// each area loads only when someone opens it.
export const routes: RouteObject[] = [
  {
    id: 'root',
    HydrateFallback: () => <PageSpinner />,
    ErrorBoundary: RouteErrorBoundary,
    children: [
      {
        path: paths.signIn.path,
        lazy: () => import('./routes/sign-in'),
      },
      {
        lazy: () => import('./routes/signed-in'),
        children: [
          {
            index: true,
            lazy: () => import('./routes/home'),
          },
          {
            path: paths.codes.record.path,
            lazy: () => import('./routes/codes/record'),
          },
          {
            path: paths.codes.review.path,
            lazy: () => import('./routes/codes/review'),
          },
          {
            path: paths.records.list.path,
            lazy: () => import('./routes/records/list'),
          },
          {
            path: paths.records.verify.path,
            lazy: () => import('./routes/records/verify'),
          },
          {
            path: paths.admin.protocol.path,
            lazy: () => import('./routes/admin/protocol'),
          },
          {
            path: paths.admin.area.path,
            lazy: () => import('./routes/admin/admin-area'),
            children: [
              { path: paths.admin.people.path, lazy: () => import('./routes/admin/people') },
              { path: paths.admin.places.path, lazy: () => import('./routes/admin/places') },
              { path: paths.admin.sessions.path, lazy: () => import('./routes/admin/sessions') },
              { path: paths.admin.audit.path, lazy: () => import('./routes/admin/audit') },
              { path: paths.admin.backups.path, lazy: () => import('./routes/admin/backups') },
              { path: paths.admin.outbox.path, lazy: () => import('./routes/admin/outbox') },
            ],
          },
          {
            path: paths.account.home.path,
            lazy: () => import('./routes/account/account'),
          },
          {
            path: paths.account.password.path,
            lazy: () => import('./routes/account/password'),
          },
          {
            path: paths.account.secondFactor.path,
            lazy: () => import('./routes/account/second-factor'),
          },
          {
            path: paths.pharmacy.worklist.path,
            lazy: () => import('./routes/pharmacy/worklist'),
          },
          {
            path: paths.pharmacy.code.path,
            lazy: () => import('./routes/pharmacy/code'),
          },
          {
            path: paths.pharmacy.trays.path,
            lazy: () => import('./routes/pharmacy/trays'),
          },
          {
            path: paths.quality.list.path,
            lazy: () => import('./routes/quality/list'),
          },
          {
            path: paths.quality.stats.path,
            lazy: () => import('./routes/quality/stats'),
          },
          {
            path: paths.quality.code.path,
            lazy: () => import('./routes/quality/code'),
          },
          {
            path: paths.quality.followUp.path,
            lazy: () => import('./routes/quality/follow-up'),
          },
        ],
      },
      {
        // The walls fill the screen: signed in, but without the app frame.
        lazy: () => import('./routes/wall-frame'),
        children: [
          { path: paths.codes.wall.path, lazy: () => import('./routes/codes/wall') },
          { path: paths.wallBoard.path, lazy: () => import('./routes/wall-board') },
        ],
      },
      {
        path: '*',
        lazy: () => import('./routes/not-found'),
      },
    ],
  },
];

/**
 * A 401 from any data call means the session ended. Forgetting the user is enough: the
 * signed-in area's guard then sends the person to sign in, with the page to come back to.
 */
export function useUnauthorizedRedirect() {
  const queryClient = useQueryClient();
  useEffect(() => {
    setUnauthorizedHandler(() => {
      queryClient.setQueryData(meQueryKey, null);
    });
    return () => {
      setUnauthorizedHandler(null);
    };
  }, [queryClient]);
}

export function AppRouter() {
  const router = useMemo(() => createBrowserRouter(routes), []);
  useUnauthorizedRedirect();
  return <RouterProvider router={router} />;
}
