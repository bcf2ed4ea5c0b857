import { useQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { Avatar } from '@/components/layout/account-menu';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { SectionLoading } from '@/components/ui/spinner';
import { roleLabels } from '@/config/roles';
import { errorMessage } from '@/lib/api-client';
import { useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';
import { accountQueryOptions } from '../api';
import { EmailForm, NameForm, PasswordForm, SessionsCard } from '../components/account-forms';

function Panel({ title, children }: { title: string; children: ReactNode }) {
  return (
    <Card>
      <CardBody>
        <h2 className="mb-4 text-lg font-semibold">{title}</h2>
        {children}
      </CardBody>
    </Card>
  );
}

export function AccountRoute() {
  useDocumentTitle('Account');
  const user = useCurrentUser();
  const overview = useQuery(accountQueryOptions());
  if (!user) return null;

  return (
    <>
      <PageHeader title="Account" description="Your name, sign-in address, password and devices." />
      <div className="grid max-w-5xl items-start gap-6 lg:grid-cols-2">
        <Card className="lg:col-span-2">
          <CardBody className="flex items-center gap-4">
            <Avatar name={user.name} className="size-12 text-base" />
            <div className="min-w-0">
              <p className="truncate text-lg font-semibold">{user.name}</p>
              <p className="truncate text-ink-muted">
                {roleLabels[user.role]} · {user.companyName}
              </p>
            </div>
          </CardBody>
        </Card>
        <Panel title="Name">
          <NameForm key={user.name} user={user} />
        </Panel>
        <Panel title="Password">
          <PasswordForm user={user} />
        </Panel>
        {overview.isPending ? (
          <div className="lg:col-span-2">
            <SectionLoading />
          </div>
        ) : overview.isError ? (
          <Alert tone="danger" title="Your account details could not be loaded" className="lg:col-span-2">
            <p>{errorMessage(overview.error)}</p>
            <Button size="sm" variant="secondary" className="mt-2" onClick={() => void overview.refetch()}>
              Try again
            </Button>
          </Alert>
        ) : (
          <>
            <Panel title="E-mail address">
              <EmailForm overview={overview.data} />
            </Panel>
            <Panel title="Signed-in devices">
              <SessionsCard overview={overview.data} />
            </Panel>
          </>
        )}
      </div>
    </>
  );
}
