import { createBrowserRouter } from 'react-router-dom';
import { RouteError } from '../components/errors/route-error';
import { AppShell, PublicShell } from '../components/layouts/app-shell';
import { CheckEmailPage } from '../features/auth/components/check-email-page';
import { InvitationPage } from '../features/auth/components/invitation-page';
import { ResetPasswordPage } from '../features/auth/components/reset-password-page';
import { SignInPage } from '../features/auth/components/sign-in-page';
import { SignUpPage } from '../features/auth/components/sign-up-page';
import { NotFoundPage } from './routes/not-found-page';
import { LeasesRoute } from './routes/leases-route';
import { OverviewPage } from './routes/overview-page';

/**
 * Heavy pages (charts, maps, PDF, admin) load their code when first visited, so the first
 * route's JavaScript stays small (measured by npm run bench).
 */
export function createRouter() {
  return createBrowserRouter([
    {
      element: <PublicShell />,
      errorElement: <RouteError />,
      children: [
        { path: '/sign-in', element: <SignInPage /> },
        { path: '/sign-in/check-email', element: <CheckEmailPage /> },
        { path: '/sign-up', element: <SignUpPage /> },
        { path: '/reset-password', element: <ResetPasswordPage /> },
        { path: '/invitation', element: <InvitationPage /> },
      ],
    },
    {
      element: <AppShell />,
      errorElement: <RouteError />,
      children: [
        { path: '/', element: <OverviewPage />, errorElement: <RouteError /> },
        { path: '/leases', element: <LeasesRoute />, errorElement: <RouteError /> },
        { path: '/leases/:id', lazy: () => import('../features/lease-report/components/lease-report-page').then((m) => ({ Component: m.LeaseReportPage })), errorElement: <RouteError /> },
        { path: '/map', lazy: () => import('../features/exposure-map/components/exposure-map-page').then((m) => ({ Component: m.ExposureMapPage })), errorElement: <RouteError /> },
        { path: '/compare', lazy: () => import('../features/compare/components/compare-page').then((m) => ({ Component: m.ComparePage })), errorElement: <RouteError /> },
        { path: '/plume-calculator', lazy: () => import('../features/calculator/components/plume-calculator-page').then((m) => ({ Component: m.PlumeCalculatorPage })), errorElement: <RouteError /> },
        { path: '/account', lazy: () => import('./routes/account-route').then((m) => ({ Component: m.AccountRoute })), errorElement: <RouteError /> },
        { path: '/inbox', lazy: () => import('../features/inbox/components/inbox-page').then((m) => ({ Component: m.InboxPage })), errorElement: <RouteError /> },
        { path: '/monitoring', lazy: () => import('../features/calibration/components/monitoring-page').then((m) => ({ Component: m.MonitoringPage })), errorElement: <RouteError /> },
        { path: '/admin/people', lazy: () => import('../features/admin/components/people-page').then((m) => ({ Component: m.PeoplePage })), errorElement: <RouteError /> },
        { path: '/admin/outbox', lazy: () => import('../features/admin/components/outbox-page').then((m) => ({ Component: m.OutboxPage })), errorElement: <RouteError /> },
        { path: '/admin/audit', lazy: () => import('../features/admin/components/audit-page').then((m) => ({ Component: m.AuditPage })), errorElement: <RouteError /> },
        { path: '/rivers', lazy: () => import('../features/rivers/components/rivers-page').then((m) => ({ Component: m.RiversPage })), errorElement: <RouteError /> },
        { path: '/rivers/:id', lazy: () => import('../features/rivers/components/river-page').then((m) => ({ Component: m.RiverPage })), errorElement: <RouteError /> },
        { path: '/clients', lazy: () => import('../features/clients/components/clients-page').then((m) => ({ Component: m.ClientsPage })), errorElement: <RouteError /> },
        { path: '/advisers', lazy: () => import('../features/clients/components/advisers-page').then((m) => ({ Component: m.AdvisersPage })), errorElement: <RouteError /> },
        { path: '/plan', lazy: () => import('../features/billing/components/plan-page').then((m) => ({ Component: m.PlanPage })), errorElement: <RouteError /> },
        { path: '/alerts', lazy: () => import('../features/alerts/components/alerts-page').then((m) => ({ Component: m.AlertsPage })), errorElement: <RouteError /> },
        { path: '/zones', lazy: () => import('./routes/zones-route').then((m) => ({ Component: m.ZonesRoute })), errorElement: <RouteError /> },
        { path: '/zones/:id', lazy: () => import('../features/regulator/components/zone-page').then((m) => ({ Component: m.ZonePage })), errorElement: <RouteError /> },
        { path: '/closure-check', lazy: () => import('../features/regulator/components/closure-check-page').then((m) => ({ Component: m.ClosureCheckPage })), errorElement: <RouteError /> },
        { path: '/notices', lazy: () => import('../features/regulator/components/notices-page').then((m) => ({ Component: m.NoticesPage })), errorElement: <RouteError /> },
        { path: '/audit-log', lazy: () => import('../features/regulator/components/audit-log-page').then((m) => ({ Component: m.AuditLogPage })), errorElement: <RouteError /> },
        { path: '*', element: <NotFoundPage /> },
      ],
    },
    // The public status page: no sign-in, no app shell, printable.
    {
      path: '/status/:jurisdiction',
      errorElement: <RouteError />,
      lazy: () => import('../features/public-status/components/public-status-page').then((m) => ({ Component: m.PublicStatusPage })),
    },
  ]);
}
