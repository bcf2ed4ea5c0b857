import { can } from '@underfoot/core';
import { ClipboardIcon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { actorOf, useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';

export function OfficeHomeRoute() {
  useDocumentTitle('Office');
  const user = useCurrentUser();
  if (!user) return null;
  const managesCompany = can(actorOf(user), 'company.manage', { companyId: user.companyId });

  return (
    <>
      <PageHeader title="Office" description={user.companyName} />
      <EmptyState icon={<ClipboardIcon />} title="Your orders queue will appear here">
        <p>
          New inspection orders, sorted by contingency deadline, ready to schedule and assign to an inspector.
          {managesCompany ? ' Your team, price book and company settings will be managed from here too.' : null}
        </p>
      </EmptyState>
    </>
  );
}
