import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { FullPageLoading } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { reportQueryOptions, revisionParam } from '@/features/reports/api';
import { loadCurrentUser } from '@/lib/auth';
import { homeLoader, requireAreaLoader, requireUserLoader, signedOutOnlyLoader } from './guards';
import { NotFoundRoute, RootErrorBoundary } from './routes/errors';
import { RootLayout } from './routes/root';
import { SignedInErrorBoundary, SignedInLayout } from './routes/signed-in-layout';

/*
 * Each area is its own lazy module, so an inspector's phone never downloads the
 * office screens. Guards are plain loaders here, outside the lazy modules, so
 * the check runs before (and instead of) downloading another role's area.
 */
export function createAppRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      id: 'root',
      Component: RootLayout,
      ErrorBoundary: RootErrorBoundary,
      HydrateFallback: FullPageLoading,
      loader: async () => {
        await loadCurrentUser(queryClient);
        return null;
      },
      children: [
        // The loader always redirects; the component only covers the moment before.
        { index: true, loader: homeLoader(queryClient), Component: FullPageLoading },

        // Signed-out pages.
        {
          path: paths.auth.signIn.path,
          loader: signedOutOnlyLoader(queryClient),
          lazy: async () => ({ Component: (await import('@/features/auth/routes/sign-in')).SignInRoute }),
        },
        {
          path: paths.auth.forgotPassword.path,
          loader: signedOutOnlyLoader(queryClient),
          lazy: async () => ({
            Component: (await import('@/features/auth/routes/forgot-password')).ForgotPasswordRoute,
          }),
        },
        {
          path: paths.auth.resetPassword.path,
          lazy: async () => ({ Component: (await import('@/features/auth/routes/reset-password')).ResetPasswordRoute }),
        },
        {
          path: paths.auth.invitation.path,
          lazy: async () => ({
            Component: (await import('@/features/auth/routes/accept-invitation')).AcceptInvitationRoute,
          }),
        },

        // Agents joining a company that allows it, and e-mail links that work signed in or not.
        {
          path: paths.signUp.verify.path,
          lazy: async () => ({ Component: (await import('@/features/account/routes/verify-sign-up')).VerifySignUpRoute }),
        },
        {
          path: paths.signUp.form.path,
          lazy: async () => ({ Component: (await import('@/features/account/routes/agent-sign-up')).AgentSignUpRoute }),
        },
        {
          path: paths.confirmEmail.path,
          lazy: async () => ({ Component: (await import('@/features/account/routes/confirm-email')).ConfirmEmailRoute }),
        },

        // A report opened through a share link: no account, so outside the signed-in layout.
        {
          path: paths.reports.shared.path,
          lazy: async () => ({ Component: (await import('@/features/reports/routes/shared-report')).SharedReportRoute }),
        },

        // Development and demo tool: open to anyone, so an invitee can click their link.
        {
          path: paths.mailbox.path,
          lazy: async () => ({ Component: (await import('@/features/mailbox/routes/mailbox')).MailboxRoute }),
        },

        // Signed-in pages.
        {
          id: 'signed-in',
          Component: SignedInLayout,
          ErrorBoundary: SignedInErrorBoundary,
          loader: requireUserLoader(queryClient),
          children: [
            // The area homes are the orders lists (the office queue, the inspector's day, the portal dashboard).
            {
              path: paths.office.home.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/office-queue')).OfficeQueueRoute }),
            },
            {
              path: paths.office.orders.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/office-orders')).OfficeOrdersRoute }),
            },
            {
              path: paths.office.newOrder.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/new-order')).NewOrderRoute }),
            },
            {
              path: paths.office.order.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/order-detail')).OrderDetailRoute }),
            },
            {
              path: paths.field.home.path,
              loader: requireAreaLoader(queryClient, 'field'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/field-day')).FieldDayRoute }),
            },
            {
              path: paths.field.order.path,
              loader: requireAreaLoader(queryClient, 'field'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/order-detail')).OrderDetailRoute }),
            },
            {
              path: paths.portal.home.path,
              loader: requireAreaLoader(queryClient, 'portal'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/portal-home')).PortalHomeRoute }),
            },
            {
              path: paths.portal.newOrder.path,
              loader: requireAreaLoader(queryClient, 'portal'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/new-order')).NewOrderRoute }),
            },
            {
              path: paths.portal.order.path,
              loader: requireAreaLoader(queryClient, 'portal'),
              lazy: async () => ({ Component: (await import('@/features/orders/routes/order-detail')).OrderDetailRoute }),
            },
            // The office running the company: one lazy module per section.
            {
              path: paths.company.profile.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/company/routes/company-profile')).CompanyProfileRoute }),
            },
            {
              path: paths.company.people.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/company/routes/people')).PeopleRoute }),
            },
            {
              path: paths.company.fees.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/company/routes/fee-list')).FeeListRoute }),
            },
            {
              path: paths.company.priceBook.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/company/routes/price-book')).PriceBookRoute }),
            },
            {
              path: paths.company.settings.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/company/routes/report-settings')).ReportSettingsRoute }),
            },
            {
              path: paths.company.audit.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/company/routes/audit-trail')).AuditTrailRoute }),
            },
            // Recording the line: the field app's editor, and the same screen in the office's area.
            {
              path: paths.inspection.field.path,
              loader: requireAreaLoader(queryClient, 'field'),
              lazy: async () => ({
                Component: (await import('@/features/field-editor/routes/inspection-editor')).InspectionEditorRoute,
              }),
            },
            {
              path: paths.inspection.office.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({
                Component: (await import('@/features/field-editor/routes/inspection-editor')).InspectionEditorRoute,
              }),
            },
            // Published reports: the reader's page in the portal; review, publish and the report for the company.
            {
              path: paths.reports.portal.path,
              loader: async (args) => {
                const allowed = await requireAreaLoader(queryClient, 'portal')(args);
                // Read the report alongside the page's code, so the page draws whole at once (over the server's first view).
                await queryClient.prefetchQuery(
                  reportQueryOptions(args.params.orderId ?? '', revisionParam(new URL(args.request.url).searchParams)),
                );
                return allowed;
              },
              lazy: async () => ({ Component: (await import('@/features/reports/routes/report')).ReportRoute }),
            },
            {
              path: paths.reports.office.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/reports/routes/staff-report')).StaffReportRoute }),
            },
            {
              path: paths.reports.field.path,
              loader: requireAreaLoader(queryClient, 'field'),
              lazy: async () => ({ Component: (await import('@/features/reports/routes/staff-report')).StaffReportRoute }),
            },
            {
              path: paths.account.path,
              lazy: async () => ({ Component: (await import('@/features/account/routes/account')).AccountRoute }),
            },
          ],
        },

        { path: '*', Component: NotFoundRoute },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createAppRoutes(queryClient));
}
