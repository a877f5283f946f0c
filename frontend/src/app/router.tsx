import { useState } from 'react';
import { Navigate, RouterProvider, createBrowserRouter, type RouteObject } from 'react-router-dom';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { paths } from '@/config/paths';
import { PageLoader } from '@/components/feedback/page-loader';
import { RouteError } from '@/components/feedback/route-error';
import { campaignLoader, sheetLoader, signedInLoader } from './route-data';

// Pages load on demand so the sign-in page does not wait for the whole app. Loaders sit outside
// `lazy` so the router starts a page's requests while its code is still loading (route-data.ts).

/** The pages a reader, checker or engineer moves between most: a run, its sheets, the entry screen. */
const runPage = () => import('./routes/app/run');
const sheetPage = () => import('./routes/app/sheet');
const sheetEntryPage = () => import('./routes/app/sheet-entry');

/**
 * Fetches and runs the code of those pages ahead of need (call it when the browser is idle), so
 * following a link to one waits for no download or compile, only for its data. Any failure is
 * left for the navigation itself to meet and report.
 */
export function warmPageCode(): void {
  for (const load of [runPage, sheetPage, sheetEntryPage]) load().catch(() => undefined);
}

export function createAppRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: '/',
      HydrateFallback: () => <PageLoader />,
      ErrorBoundary: RouteError,
      children: [
        { index: true, element: <Navigate to={paths.campaigns.getHref()} replace /> },
        { path: paths.signIn.path, lazy: () => import('./routes/sign-in').then((m) => ({ Component: m.SignInRoute })) },
        {
          path: paths.resetPassword.path,
          lazy: () => import('./routes/reset-password').then((m) => ({ Component: m.ResetPasswordRoute })),
        },
        {
          path: paths.resetPasswordConfirm.path,
          lazy: () => import('./routes/reset-password-confirm').then((m) => ({ Component: m.ResetPasswordConfirmRoute })),
        },
        {
          path: paths.acceptInvitation.path,
          lazy: () => import('./routes/accept-invitation').then((m) => ({ Component: m.AcceptInvitationRoute })),
        },
        {
          loader: signedInLoader(queryClient),
          lazy: () => import('./routes/app/root').then((m) => ({ Component: m.AppRoot })),
          children: [
            {
              path: paths.campaigns.path,
              lazy: () => import('./routes/app/campaigns').then((m) => ({ Component: m.CampaignsRoute })),
            },
            {
              path: paths.campaign.path,
              loader: campaignLoader(queryClient),
              lazy: () => import('./routes/app/campaign-layout').then((m) => ({ Component: m.CampaignLayout })),
              children: [
                {
                  index: true,
                  lazy: () => import('./routes/app/campaign-overview').then((m) => ({ Component: m.CampaignOverviewRoute })),
                },
                {
                  path: 'runs',
                  lazy: () => import('./routes/app/campaign-runs').then((m) => ({ Component: m.CampaignRunsRoute })),
                },
                {
                  path: 'runs/:runId',
                  lazy: () => runPage().then((m) => ({ Component: m.RunRoute })),
                },
                {
                  path: 'runs/:runId/analysis',
                  lazy: () => import('./routes/app/run-analysis').then((m) => ({ Component: m.RunAnalysisRoute })),
                },
                {
                  path: 'analysis',
                  lazy: () => import('./routes/app/campaign-analysis').then((m) => ({ Component: m.CampaignAnalysisRoute })),
                },
                {
                  path: 'balance',
                  lazy: () => import('./routes/app/campaign-balance').then((m) => ({ Component: m.CampaignBalanceRoute })),
                },
                {
                  path: 'dashboard',
                  lazy: () => import('./routes/app/campaign-dashboard').then((m) => ({ Component: m.CampaignDashboardRoute })),
                },
                {
                  path: 'releases',
                  lazy: () => import('./routes/app/campaign-releases').then((m) => ({ Component: m.CampaignReleasesRoute })),
                },
                {
                  path: 'releases/:releaseId/report',
                  lazy: () => import('./routes/app/release-report').then((m) => ({ Component: m.ReleaseReportRoute })),
                },
                {
                  path: 'sheets/:sheetId',
                  loader: sheetLoader(queryClient),
                  lazy: () => sheetPage().then((m) => ({ Component: m.SheetRoute })),
                },
                {
                  path: 'sheets/:sheetId/entry',
                  lazy: () => sheetEntryPage().then((m) => ({ Component: m.SheetEntryRoute })),
                },
                {
                  path: 'channels',
                  lazy: () => import('./routes/app/campaign-channels').then((m) => ({ Component: m.CampaignChannelsRoute })),
                },
                {
                  path: 'members',
                  lazy: () => import('./routes/app/campaign-members').then((m) => ({ Component: m.CampaignMembersRoute })),
                },
                {
                  path: 'audit',
                  lazy: () => import('./routes/app/campaign-audit').then((m) => ({ Component: m.CampaignAuditRoute })),
                },
                {
                  path: '*',
                  lazy: () => import('./routes/not-found').then((m) => ({ Component: m.NotFoundRoute })),
                },
              ],
            },
            { path: paths.account.path, lazy: () => import('./routes/app/account').then((m) => ({ Component: m.AccountRoute })) },
            {
              path: paths.adminMail.path,
              lazy: () => import('./routes/app/admin-mail').then((m) => ({ Component: m.AdminMailRoute })),
            },
            {
              path: paths.adminUsers.path,
              lazy: () => import('./routes/app/admin-users').then((m) => ({ Component: m.AdminUsersRoute })),
            },
          ],
        },
        { path: '*', lazy: () => import('./routes/not-found').then((m) => ({ Component: m.NotFoundRoute })) },
      ],
    },
  ];
}

export function AppRouter() {
  const queryClient = useQueryClient();
  const [router] = useState(() => createBrowserRouter(createAppRoutes(queryClient)));
  return <RouterProvider router={router} />;
}
