import type { ReactNode } from 'react';
import { useDocumentTitle } from '@/lib/use-document-title';

/** The common face of "not found", "not available" and "something went wrong". */
export function ErrorPage({
  eyebrow,
  title,
  children,
  actions,
}: {
  eyebrow?: string;
  title: string;
  children?: ReactNode;
  actions?: ReactNode;
}) {
  useDocumentTitle(title);
  return (
    <section aria-labelledby="error-title" className="mx-auto max-w-xl py-8 sm:py-16">
      <svg aria-hidden="true" viewBox="0 0 120 48" className="mb-6 h-12 w-30 text-line-strong">
        {/* A pipe that stops short of the main: the trade's picture of "could not get through". */}
        <path d="M4 12h112" stroke="currentColor" strokeWidth="2" strokeDasharray="4 5" />
        <rect x="4" y="24" width="64" height="14" rx="7" fill="none" stroke="var(--color-brand)" strokeWidth="3" />
        <path d="M80 24v14M92 24v14" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
      </svg>
      {eyebrow ? <p className="text-sm font-semibold tracking-wide text-brand uppercase">{eyebrow}</p> : null}
      <h1 id="error-title" className="mt-1 text-2xl font-bold tracking-tight sm:text-3xl">
        {title}
      </h1>
      {children ? <div className="mt-3 space-y-3 text-ink-muted">{children}</div> : null}
      {actions ? <div className="mt-8 flex flex-wrap gap-3">{actions}</div> : null}
    </section>
  );
}
