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
 * Each area loads its code on first visit: a floor tablet never downloads the admin screens, and
 * the office never downloads the camera reader.
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
            {
              path: paths.intake,
              lazy: async () => {
                const m = await import('./routes/intake/intake-log-page');
                return { Component: m.IntakeLogPage, loader: m.intakeLogLoader(queryClient) };
              },
            },
            {
              path: paths.receiveCore,
              lazy: async () => {
                const m = await import('./routes/intake/receive-page');
                return { Component: m.ReceivePage, loader: m.receiveLoader(queryClient) };
              },
            },
            {
              path: paths.core,
              lazy: async () => {
                const m = await import('./routes/cores/core-page');
                return { Component: m.CorePage, loader: m.coreLoader(queryClient) };
              },
            },
            {
              path: paths.item,
              lazy: async () => {
                const m = await import('./routes/items/item-page');
                return { Component: m.ItemPage, loader: m.itemLoader(queryClient) };
              },
            },
            {
              path: paths.teardown,
              lazy: async () => {
                const m = await import('./routes/teardown/teardown-page');
                return { Component: m.TeardownPage, loader: m.teardownLoader(queryClient) };
              },
            },
            {
              path: paths.labels,
              lazy: async () => {
                const m = await import('./routes/labels/labels-page');
                return { Component: m.LabelsPage, loader: m.labelsLoader(queryClient) };
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
