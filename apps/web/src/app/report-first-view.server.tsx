/**
 * Server entry (built with `vite build --ssr`, loaded by the API server): the top of a
 * report page as HTML, so the grade is in the first bytes a slow phone receives.
 * The browser app renders over it once loaded (main.tsx waits until it can draw the whole
 * page), so this is markup only: no hydration, no state carried across.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { CurrentUser } from '@underfoot/core';
import type { ReactNode } from 'react';
import { renderToString } from 'react-dom/server';
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from 'react-router-dom';
import { AppShell } from '@/components/layout/app-shell';
import type { ReportRead, SharedRead } from '@/features/reports/api';
import { ReportFirstViewPage } from '@/features/reports/routes/report';
import { SharedReportFirstViewPage } from '@/features/reports/routes/shared-report';

export interface FirstViewInput {
  /** The page's address, e.g. /portal/reports/…?revision=2 (absolute, for the router). */
  url: string;
  user: CurrentUser;
  /** What GET /api/reports/:id answers this reader. */
  report: ReportRead;
  revision: number | null;
}

export interface SharedFirstViewInput {
  /** The page's address, /shared/… (absolute, for the router). */
  url: string;
  token: string;
  /** What GET /api/shared/:token answers. */
  report: SharedRead;
}

/** One element at the page's address, rendered as the app's router would place it. */
async function renderAt(url: string, element: ReactNode): Promise<string> {
  const handler = createStaticHandler([{ path: '*', element }]);
  const context = await handler.query(new Request(url));
  if (context instanceof Response) throw new Error(`the first view answered ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  // A client of its own for this one render: nothing is fetched on the server.
  const queryClient = new QueryClient({ defaultOptions: { queries: { enabled: false } } });
  return renderToString(
    <QueryClientProvider client={queryClient}>
      <StaticRouterProvider router={router} context={context} hydrate={false} />
    </QueryClientProvider>,
  );
}

/** A signed-in reader's report page (/portal/reports/:orderId). */
export function renderReportFirstView({ url, user, report, revision }: FirstViewInput): Promise<string> {
  return renderAt(
    url,
    <AppShell user={user}>
      <ReportFirstViewPage report={report} revision={revision} />
    </AppShell>,
  );
}

/** A guest's report page behind a share link (/shared/:token). */
export function renderSharedReportFirstView({ url, token, report }: SharedFirstViewInput): Promise<string> {
  return renderAt(url, <SharedReportFirstViewPage report={report} token={token} />);
}
