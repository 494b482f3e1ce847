import { createBrowserRouter } from 'react-router-dom';
import { RouteError } from '../components/errors/route-error';
import { AppShell, PublicShell } from '../components/layouts/app-shell';
import { AuditPage } from '../features/admin/components/audit-page';
import { OutboxPage } from '../features/admin/components/outbox-page';
import { PeoplePage } from '../features/admin/components/people-page';
import { CheckEmailPage } from '../features/auth/components/check-email-page';
import { InvitationPage } from '../features/auth/components/invitation-page';
import { ResetPasswordPage } from '../features/auth/components/reset-password-page';
import { SignInPage } from '../features/auth/components/sign-in-page';
import { SignUpPage } from '../features/auth/components/sign-up-page';
import { PlumeCalculatorPage } from '../features/calculator/components/plume-calculator-page';
import { ComparePage } from '../features/compare/components/compare-page';
import { ExposureMapPage } from '../features/exposure-map/components/exposure-map-page';
import { LeaseReportPage } from '../features/lease-report/components/lease-report-page';
import { NotFoundPage } from './routes/not-found-page';
import { LeasesRoute } from './routes/leases-route';
import { OverviewPage } from './routes/overview-page';

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
        { path: '/leases/:id', element: <LeaseReportPage />, errorElement: <RouteError /> },
        { path: '/map', element: <ExposureMapPage />, errorElement: <RouteError /> },
        { path: '/compare', element: <ComparePage />, errorElement: <RouteError /> },
        { path: '/plume-calculator', element: <PlumeCalculatorPage />, errorElement: <RouteError /> },
        { path: '/admin/people', element: <PeoplePage />, errorElement: <RouteError /> },
        { path: '/admin/outbox', element: <OutboxPage />, errorElement: <RouteError /> },
        { path: '/admin/audit', element: <AuditPage />, errorElement: <RouteError /> },
        { path: '*', element: <NotFoundPage /> },
      ],
    },
  ]);
}
