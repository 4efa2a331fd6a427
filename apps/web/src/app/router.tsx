import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useMemo } from 'react';
import { createBrowserRouter, type RouteObject } from 'react-router';
import { RouterProvider } from 'react-router/dom';
import { PageSpinner } from '../components/ui/page-status';
import { paths } from '../config/paths';
import { meQueryKey } from '../features/auth/api/get-me';
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
