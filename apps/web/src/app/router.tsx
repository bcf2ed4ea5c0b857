import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { FullPageLoading } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
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
            {
              path: paths.office.home.path,
              loader: requireAreaLoader(queryClient, 'office'),
              lazy: async () => ({ Component: (await import('@/features/office/routes/office-home')).OfficeHomeRoute }),
            },
            {
              path: paths.field.home.path,
              loader: requireAreaLoader(queryClient, 'field'),
              lazy: async () => ({ Component: (await import('@/features/field/routes/field-home')).FieldHomeRoute }),
            },
            {
              path: paths.portal.home.path,
              loader: requireAreaLoader(queryClient, 'portal'),
              lazy: async () => ({ Component: (await import('@/features/portal/routes/portal-home')).PortalHomeRoute }),
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
