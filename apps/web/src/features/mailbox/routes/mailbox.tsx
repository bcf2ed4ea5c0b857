import { useQuery } from '@tanstack/react-query';
import { homeAreaOf } from '@underfoot/core';
import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { SimpleLayout } from '@/components/layout/simple-layout';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { EnvelopeIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { SectionLoading } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { areaLabels } from '@/config/roles';
import { errorMessage, isApiError } from '@/lib/api-client';
import { homePathOf, useCurrentUser } from '@/lib/auth';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';
import { mailboxQueryOptions } from '../api';
import { MessageList } from '../components/message-list';
import { MessageView } from '../components/message-view';

function HeaderLinks() {
  const user = useCurrentUser();
  return user ? (
    <ButtonLink to={homePathOf(user.role)} variant="secondary" size="sm">
      {areaLabels[homeAreaOf[user.role]]}
    </ButtonLink>
  ) : (
    <ButtonLink to={paths.auth.signIn.getHref()} variant="secondary" size="sm">
      Sign in
    </ButtonLink>
  );
}

export function MailboxRoute() {
  useDocumentTitle('Demo mailbox');
  const [searchParams] = useSearchParams();
  const selectedId = searchParams.get('message');
  const mailbox = useQuery(mailboxQueryOptions());
  const notDemo = isApiError(mailbox.error, 404);
  // Only a click shows the busy state; the background polling stays quiet.
  const [refreshing, setRefreshing] = useState(false);
  const refresh = () => {
    setRefreshing(true);
    void mailbox.refetch().finally(() => setRefreshing(false));
  };

  let body;
  if (mailbox.isPending) {
    body = <SectionLoading label="Opening the mailbox…" />;
  } else if (notDemo) {
    body = (
      <EmptyState icon={<EnvelopeIcon />} title="The mailbox is only available in demo mode">
        <p>This server sends e-mail to real addresses, so there is nothing to show here. Check your own inbox instead.</p>
      </EmptyState>
    );
  } else if (mailbox.isError && !mailbox.data) {
    body = (
      <Alert tone="danger" title="The mailbox could not be opened">
        {errorMessage(mailbox.error)}
      </Alert>
    );
  } else if (mailbox.data && mailbox.data.length === 0) {
    body = (
      <EmptyState icon={<EnvelopeIcon />} title="No e-mails yet">
        <p>
          Invitations, password-reset links and order e-mails appear here a moment after Underfoot sends them. This page checks for new mail
          every few seconds.
        </p>
      </EmptyState>
    );
  } else if (mailbox.data) {
    body = (
      <div className="grid gap-6 md:grid-cols-[minmax(16rem,22rem)_1fr]">
        <nav aria-label="Messages" className={cn(selectedId ? 'hidden md:block' : undefined)}>
          <MessageList messages={mailbox.data} selectedId={selectedId} />
        </nav>
        <div className={cn('min-w-0', selectedId ? undefined : 'hidden md:block')}>
          {selectedId ? (
            <>
              <p className="mb-3 md:hidden">
                <Link to={paths.mailbox.getHref()} className="inline-flex min-h-11 items-center font-medium">
                  ← All messages
                </Link>
              </p>
              <MessageView key={selectedId} id={selectedId} />
            </>
          ) : (
            <p className="rounded-card border border-dashed border-line-strong px-6 py-12 text-center text-ink-muted">
              Choose a message to read it.
            </p>
          )}
        </div>
      </div>
    );
  }

  return (
    <SimpleLayout wide headerEnd={<HeaderLinks />}>
      <PageHeader
        title="Demo mailbox"
        description="In demo mode, every e-mail Underfoot sends is caught here instead of being delivered. Open one to follow its links."
        actions={
          notDemo ? null : (
            <Button variant="secondary" onClick={refresh} pending={refreshing}>
              Refresh
            </Button>
          )
        }
      />
      {mailbox.isError && mailbox.data && !notDemo ? (
        <Alert tone="caution" className="mb-4">
          New mail could not be checked: {errorMessage(mailbox.error)}
        </Alert>
      ) : null}
      {body}
    </SimpleLayout>
  );
}
