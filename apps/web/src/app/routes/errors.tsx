import { homeAreaOf } from '@underfoot/core';
import { isRouteErrorResponse, useRevalidator, useRouteError } from 'react-router-dom';
import { ErrorPage } from '@/components/errors/error-page';
import { SimpleLayout } from '@/components/layout/simple-layout';
import { Button, ButtonLink } from '@/components/ui/button';
import { paths, type Area } from '@/config/paths';
import { areaLabels, roleLabels } from '@/config/roles';
import { ApiError } from '@/lib/api-client';
import { homePathOf, useCurrentUser } from '@/lib/auth';
import { isWrongAreaData } from '../guards';

const areaAudience: Record<Area, string> = {
  office: 'the inspection company’s office staff',
  field: 'inspectors working on site',
  portal: 'agents, buyers and sellers',
};

function HomeButton() {
  const user = useCurrentUser();
  return user ? (
    <ButtonLink to={homePathOf(user.role)}>Go to {areaLabels[homeAreaOf[user.role]]}</ButtonLink>
  ) : (
    <ButtonLink to={paths.auth.signIn.getHref()}>Sign in</ButtonLink>
  );
}

export function NotFoundContent() {
  return (
    <ErrorPage eyebrow="Page not found" title="We could not find that page" actions={<HomeButton />}>
      <p>The address may be mistyped, or the page may have moved. Check the link you followed, or start again from your home page.</p>
    </ErrorPage>
  );
}

export function NotAvailableContent({ area }: { area: Area }) {
  const user = useCurrentUser();
  return (
    <ErrorPage eyebrow="Not available for your account" title={`${areaLabels[area]} is not part of your account`} actions={<HomeButton />}>
      <p>
        This part of Underfoot is for {areaAudience[area]}.
        {user ? (
          <>
            {' '}
            You are signed in as {user.name} ({roleLabels[user.role]}, {user.companyName}).
          </>
        ) : null}
      </p>
      <p>If you think you should have access, ask the person who invited you to Underfoot.</p>
    </ErrorPage>
  );
}

function isChunkLoadError(error: unknown): boolean {
  return (
    error instanceof Error &&
    /dynamically imported module|Importing a module script failed|error loading dynamically imported/i.test(error.message)
  );
}

/** Every error a route can end in, as a designed page (never a stack trace). */
export function RouteErrorContent() {
  const error = useRouteError();
  const revalidator = useRevalidator();

  if (isRouteErrorResponse(error)) {
    if (error.status === 404) return <NotFoundContent />;
    if (error.status === 403 && isWrongAreaData(error.data)) return <NotAvailableContent area={error.data.area} />;
  }

  if (isChunkLoadError(error)) {
    return (
      <ErrorPage
        eyebrow="Update available"
        title="Underfoot has been updated"
        actions={<Button onClick={() => window.location.reload()}>Reload the page</Button>}
      >
        <p>A newer version is on the server. Reload the page to continue; nothing you have saved is lost.</p>
      </ErrorPage>
    );
  }

  if (error instanceof ApiError && error.status === 0) {
    return (
      <ErrorPage
        eyebrow="No connection"
        title="We cannot reach Underfoot right now"
        actions={
          <Button onClick={() => void revalidator.revalidate()} pending={revalidator.state === 'loading'}>
            Try again
          </Button>
        }
      >
        <p>Check your internet connection. If you are on site with a weak signal, move to where reception is better and try again.</p>
      </ErrorPage>
    );
  }

  return (
    <ErrorPage
      eyebrow="Something went wrong"
      title="This page could not be shown"
      actions={
        <>
          <Button onClick={() => window.location.reload()}>Reload the page</Button>
          <HomeButton />
        </>
      }
    >
      <p>
        {error instanceof ApiError
          ? error.detail
          : 'An unexpected problem stopped this page from loading. Reloading usually helps; if it keeps happening, let your office know.'}
      </p>
      {import.meta.env.DEV && error instanceof Error && !(error instanceof ApiError) ? (
        <details className="rounded-lg border border-line bg-sand p-3 text-sm">
          <summary className="cursor-pointer font-medium text-ink">Details for developers</summary>
          <pre className="mt-2 overflow-x-auto whitespace-pre-wrap">{error.message}</pre>
        </details>
      ) : null}
    </ErrorPage>
  );
}

/** Top-level boundary: no shell around it, so it brings its own frame. */
export function RootErrorBoundary() {
  return (
    <SimpleLayout>
      <RouteErrorContent />
    </SimpleLayout>
  );
}

/** The catch-all route. */
export function NotFoundRoute() {
  return (
    <SimpleLayout>
      <NotFoundContent />
    </SimpleLayout>
  );
}
