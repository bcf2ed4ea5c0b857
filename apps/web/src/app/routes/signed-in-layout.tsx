import { useEffect } from 'react';
import { Outlet, useRevalidator } from 'react-router-dom';
import { AppShell } from '@/components/layout/app-shell';
import { SimpleLayout } from '@/components/layout/simple-layout';
import { FullPageLoading } from '@/components/ui/spinner';
import { useCurrentUser } from '@/lib/auth';
import { RouteErrorContent } from './errors';

/** The shell around every signed-in page; the loader has already checked the session. */
export function SignedInLayout() {
  const user = useCurrentUser();
  const revalidator = useRevalidator();

  // The session ended while the page was open (signed out, or expired on the server):
  // re-running the guards sends the person to sign-in, remembering where they were.
  useEffect(() => {
    if (!user) void revalidator.revalidate();
  }, [user, revalidator]);

  if (!user) return <FullPageLoading />;
  return (
    <AppShell user={user}>
      <Outlet />
    </AppShell>
  );
}

/** Errors inside the signed-in area keep the header, so the way out stays visible. */
export function SignedInErrorBoundary() {
  const user = useCurrentUser();
  if (!user) {
    return (
      <SimpleLayout>
        <RouteErrorContent />
      </SimpleLayout>
    );
  }
  return (
    <AppShell user={user}>
      <RouteErrorContent />
    </AppShell>
  );
}
