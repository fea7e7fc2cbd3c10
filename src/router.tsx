import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router';
import { paths } from './lib/paths';
import { AppLayout, layoutLoader } from './routes/app/layout';
import { NotFoundPage, RootError, RouteError } from './routes/errors/error-page';
import { LoadingScreen } from './routes/app/loading-screen';

/**
 * Loaders fill the query cache with the same queryOptions the pages read, so nothing waterfalls.
 * Each page, sign-in and home included, loads its code on first visit: a floor tablet opening the
 * station screen never downloads the admin screens or the form library the sign-in form is built
 * on, and the office never downloads the camera reader.
 */
export function appRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: paths.signIn,
      lazy: async () => {
        const m = await import('./routes/sign-in/sign-in-page');
        return { Component: m.SignInPage, loader: m.signInLoader(queryClient) };
      },
      errorElement: <RootError />,
      hydrateFallbackElement: <LoadingScreen />,
    },
    {
      path: paths.secondFactor,
      lazy: async () => {
        const m = await import('./routes/second-factor/second-factor-page');
        return { Component: m.SecondFactorPage, loader: m.secondFactorLoader(queryClient) };
      },
      errorElement: <RootError />,
      hydrateFallbackElement: <LoadingScreen />,
    },
    {
      // a shared station tablet: its own sign-in (a device cookie), no person's session
      path: paths.tablet,
      lazy: async () => ({ Component: (await import('./routes/tablet/tablet-page')).TabletPage }),
      errorElement: <RootError />,
      hydrateFallbackElement: <LoadingScreen />,
    },
    {
      // public: anyone holding a document checks it, no sign-in
      path: paths.verify,
      lazy: async () => ({ Component: (await import('./routes/verify/verify-page')).VerifyPage }),
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
            {
              index: true,
              lazy: async () => {
                const m = await import('./routes/home/home-page');
                return { Component: m.HomePage, loader: m.homeLoader };
              },
            },
            {
              path: paths.account,
              lazy: async () => ({ Component: (await import('./routes/account/account-page')).AccountPage }),
            },
            {
              path: paths.people,
              lazy: async () => {
                const m = await import('./routes/admin/people/people-page');
                return { Component: m.PeoplePage, loader: m.peopleLoader(queryClient) };
              },
            },
            {
              path: paths.qualifications,
              lazy: async () => {
                const m = await import('./routes/admin/qualifications/qualifications-page');
                return { Component: m.QualificationsPage, loader: m.qualificationsLoader(queryClient) };
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
              path: paths.process,
              lazy: async () => {
                const m = await import('./routes/admin/process/process-page');
                return { Component: m.ProcessPage, loader: m.processLoader(queryClient) };
              },
            },
            {
              path: paths.routes,
              lazy: async () => {
                const m = await import('./routes/admin/process/routes-page');
                return { Component: m.RoutesPage, loader: m.routesLoader(queryClient) };
              },
            },
            {
              path: paths.processDocument,
              lazy: async () => {
                const m = await import('./routes/admin/process/document-page');
                return { Component: m.DocumentPage, loader: m.documentLoader(queryClient) };
              },
            },
            {
              path: paths.parties,
              lazy: async () => {
                const m = await import('./routes/admin/parties/parties-page');
                return { Component: m.PartiesPage, loader: m.partiesLoader(queryClient) };
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
            {
              path: paths.receivedLots,
              lazy: async () => {
                const m = await import('./routes/lots/lots-page');
                return { Component: m.LotsPage, loader: m.lotsLoader(queryClient) };
              },
            },
            {
              path: paths.receiveLot,
              lazy: async () => {
                const m = await import('./routes/lots/receive-lot-page');
                return { Component: m.ReceiveLotPage, loader: m.receiveLotLoader(queryClient) };
              },
            },
            {
              path: paths.receivedLot,
              lazy: async () => {
                const m = await import('./routes/lots/lot-page');
                return { Component: m.LotPage, loader: m.lotLoader(queryClient) };
              },
            },
            {
              path: paths.gauges,
              lazy: async () => {
                const m = await import('./routes/gauges/gauges-page');
                return { Component: m.GaugesPage, loader: m.gaugesLoader(queryClient) };
              },
            },
            {
              path: paths.gauge,
              lazy: async () => {
                const m = await import('./routes/gauges/gauge-page');
                return { Component: m.GaugePage, loader: m.gaugeLoader(queryClient) };
              },
            },
            {
              path: paths.gaugeStudies,
              lazy: async () => {
                const m = await import('./routes/gauges/studies-page');
                return { Component: m.StudiesPage, loader: m.studiesLoader(queryClient) };
              },
            },
            {
              path: paths.blastRadius,
              lazy: async () => {
                const m = await import('./routes/gauges/blast-radius-page');
                return { Component: m.BlastRadiusPage, loader: m.blastLoader(queryClient) };
              },
            },
            {
              path: paths.spc,
              lazy: async () => {
                const m = await import('./routes/spc/spc-page');
                return { Component: m.SpcPage, loader: m.spcLoader(queryClient) };
              },
            },
            {
              path: paths.wip,
              lazy: async () => {
                const m = await import('./routes/line/wip-page');
                return { Component: m.WipPage, loader: m.wipLoader(queryClient) };
              },
            },
            {
              path: paths.yields,
              lazy: async () => {
                const m = await import('./routes/line/yields-page');
                return { Component: m.YieldsPage, loader: m.yieldsLoader(queryClient) };
              },
            },
            {
              path: paths.search,
              lazy: async () => {
                const m = await import('./routes/line/search-page');
                return { Component: m.SearchPage, loader: m.searchLoader(queryClient) };
              },
            },
            {
              path: paths.station,
              lazy: async () => {
                const m = await import('./routes/station/station-page');
                return { Component: m.StationPage, loader: m.stationLoader(queryClient) };
              },
            },
            {
              path: paths.specBook,
              lazy: async () => {
                const m = await import('./routes/spec/spec-book-page');
                return { Component: m.SpecBookPage, loader: m.specBookLoader(queryClient) };
              },
            },
            {
              path: paths.specRule,
              lazy: async () => {
                const m = await import('./routes/spec/rule-page');
                return { Component: m.RulePage, loader: m.ruleLoader(queryClient) };
              },
            },
            {
              path: paths.ncrs,
              lazy: async () => {
                const m = await import('./routes/ncrs/ncr-list-page');
                return { Component: m.NcrListPage, loader: m.ncrListLoader(queryClient) };
              },
            },
            {
              path: paths.raiseConcern,
              lazy: async () => {
                const m = await import('./routes/ncrs/raise-concern-page');
                return { Component: m.RaiseConcernPage, loader: m.raiseConcernLoader(queryClient) };
              },
            },
            {
              path: paths.ncr,
              lazy: async () => {
                const m = await import('./routes/ncrs/ncr-page');
                return { Component: m.NcrPage, loader: m.ncrLoader(queryClient) };
              },
            },
            {
              path: paths.defectCodes,
              lazy: async () => {
                const m = await import('./routes/admin/defect-codes/defect-codes-page');
                return { Component: m.DefectCodesPage, loader: m.defectCodesLoader(queryClient) };
              },
            },
            {
              path: paths.mail,
              lazy: async () => {
                const m = await import('./routes/admin/mail/mail-page');
                return { Component: m.MailPage, loader: m.mailLoader(queryClient) };
              },
            },
            {
              path: paths.build,
              lazy: async () => {
                const m = await import('./routes/build/build-page');
                return { Component: m.BuildPage, loader: m.buildLoader(queryClient) };
              },
            },
            {
              path: paths.release,
              lazy: async () => {
                const m = await import('./routes/release/release-page');
                return { Component: m.ReleasePage, loader: m.releaseLoader(queryClient) };
              },
            },
            {
              path: paths.trail,
              lazy: async () => {
                const m = await import('./routes/trail/trail-page');
                return { Component: m.TrailPage, loader: m.trailLoader(queryClient) };
              },
            },
            {
              path: paths.lot,
              lazy: async () => {
                const m = await import('./routes/trail/lot-page');
                return { Component: m.LotPage, loader: m.lotLoader(queryClient) };
              },
            },
            {
              path: paths.fieldActions,
              lazy: async () => {
                const m = await import('./routes/field-actions/field-actions-page');
                return { Component: m.FieldActionsPage, loader: m.fieldActionsLoader(queryClient) };
              },
            },
            {
              path: paths.fieldAction,
              lazy: async () => {
                const m = await import('./routes/field-actions/field-action-page');
                return { Component: m.FieldActionPage, loader: m.fieldActionLoader(queryClient) };
              },
            },
            {
              path: paths.plant,
              lazy: async () => {
                const m = await import('./routes/admin/plant/plant-page');
                return { Component: m.PlantPage, loader: m.plantLoader(queryClient) };
              },
            },
            {
              path: paths.warrantyClaims,
              lazy: async () => {
                const m = await import('./routes/warranty/claims-page');
                return { Component: m.ClaimsPage, loader: m.claimsLoader(queryClient) };
              },
            },
            {
              path: paths.logClaim,
              lazy: async () => {
                const m = await import('./routes/warranty/log-claim-page');
                return { Component: m.LogClaimPage, loader: m.logClaimLoader(queryClient) };
              },
            },
            {
              path: paths.claim,
              lazy: async () => {
                const m = await import('./routes/warranty/claim-page');
                return { Component: m.ClaimPage, loader: m.claimLoader(queryClient) };
              },
            },
            {
              path: paths.warrantyAnalysis,
              lazy: async () => {
                const m = await import('./routes/warranty/analysis-page');
                return { Component: m.AnalysisPage, loader: m.analysisLoader(queryClient) };
              },
            },
            {
              path: paths.weibull,
              lazy: async () => {
                const m = await import('./routes/warranty/weibull-page');
                return { Component: m.WeibullPage, loader: m.weibullLoader(queryClient) };
              },
            },
            {
              path: paths.causeCodes,
              lazy: async () => {
                const m = await import('./routes/warranty/cause-codes-page');
                return { Component: m.CauseCodesPage, loader: m.causeCodesLoader(queryClient) };
              },
            },
            {
              path: paths.correctiveActions,
              lazy: async () => {
                const m = await import('./routes/corrective-actions/list-page');
                return { Component: m.CaListPage, loader: m.caListLoader(queryClient) };
              },
            },
            {
              path: paths.openCa,
              lazy: async () => {
                const m = await import('./routes/corrective-actions/open-page');
                return { Component: m.OpenCaPage, loader: m.openCaLoader(queryClient) };
              },
            },
            {
              path: paths.ca,
              lazy: async () => {
                const m = await import('./routes/corrective-actions/ca-page');
                return { Component: m.CaPage, loader: m.caLoader(queryClient) };
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
