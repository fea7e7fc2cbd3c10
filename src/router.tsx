import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router';
import { paths } from './lib/paths';
import { AccountPage } from './routes/account/account-page';
import { AppLayout, layoutLoader } from './routes/app/layout';
import { NotFoundPage, RootError, RouteError } from './routes/errors/error-page';
import { HomePage } from './routes/home/home-page';
import { LoadingScreen } from './routes/app/loading-screen';
import { SignInPage, signInLoader } from './routes/sign-in/sign-in-page';

/**
 * Loaders fill the query cache with the same queryOptions the pages read, so nothing waterfalls.
 * The office areas load their code on first visit: a floor tablet never downloads the admin screens.
 */
export function appRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: paths.signIn,
      element: <SignInPage />,
      loader: signInLoader(queryClient),
      errorElement: <RootError />,
      hydrateFallbackElement: <LoadingScreen />,
    },
    {
      id: 'app',
      element: <AppLayout />,
      loader: layoutLoader(queryClient),
      errorElement: <RootError />,
      hydrateFallbackElement: <LoadingScreen />,
      children: [
        {
          errorElement: <RouteError />,
          children: [
            { index: true, element: <HomePage /> },
            { path: paths.account, element: <AccountPage /> },
            {
              path: paths.people,
              lazy: async () => {
                const m = await import('./routes/admin/people/people-page');
                return { Component: m.PeoplePage, loader: m.peopleLoader(queryClient) };
              },
            },
            {
              path: paths.stations,
              lazy: async () => {
                const m = await import('./routes/admin/stations/stations-page');
                return { Component: m.StationsPage, loader: m.stationsLoader(queryClient) };
              },
            },
            {
              path: paths.families,
              lazy: async () => {
                const m = await import('./routes/admin/families/families-page');
                return { Component: m.FamiliesPage, loader: m.familiesLoader(queryClient) };
              },
            },
            {
              path: paths.audit,
              lazy: async () => {
                const m = await import('./routes/admin/audit/audit-page');
                return { Component: m.AuditPage, loader: m.auditLoader(queryClient) };
              },
            },
            { path: '*', element: <NotFoundPage /> },
          ],
        },
      ],
    },
  ];
}

/** Tests build the same routes with createMemoryRouter(appRoutes(makeQueryClient({ retry: false }))). */
export const createRouter = (queryClient: QueryClient) => createBrowserRouter(appRoutes(queryClient));
