import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Wordmark } from '@/components/brand/wordmark';
import { Card, CardBody } from '@/components/ui/card';
import { paths } from '@/config/paths';
import { useDemoMailboxAvailable } from '@/lib/demo-mode';
import { useDocumentTitle } from '@/lib/use-document-title';

/** The frame of the signed-out pages: the wordmark, one card, a quiet footer. */
export function AuthLayout({
  title,
  description,
  children,
  footer,
}: {
  title: string;
  description?: ReactNode;
  children: ReactNode;
  footer?: ReactNode;
}) {
  useDocumentTitle(title);
  const mailboxAvailable = useDemoMailboxAvailable();

  return (
    <div className="flex min-h-dvh flex-col items-center px-4 py-10 sm:py-16">
      <Link to={paths.home.getHref()} className="mb-8 rounded-lg no-underline" aria-label="Underfoot home">
        <Wordmark />
      </Link>
      <main id="main" className="w-full max-w-md">
        <Card>
          <CardBody className="space-y-6">
            <div>
              <h1 className="text-2xl font-bold tracking-tight">{title}</h1>
              {description ? <div className="mt-1.5 text-ink-muted">{description}</div> : null}
            </div>
            {children}
          </CardBody>
        </Card>
        {footer ? <div className="mt-6 text-center text-sm text-ink-muted">{footer}</div> : null}
      </main>
      <footer className="mt-auto pt-12 text-center text-sm text-ink-muted">
        <p>Sewer-lateral camera inspections for home sales.</p>
        {mailboxAvailable ? (
          <p className="mt-2">
            <Link to={paths.mailbox.getHref()} className="font-medium underline underline-offset-2">
              Open the demo mailbox
            </Link>
          </p>
        ) : null}
      </footer>
    </div>
  );
}
