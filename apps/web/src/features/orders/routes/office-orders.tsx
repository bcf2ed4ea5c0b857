import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ClipboardIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { paths } from '@/config/paths';
import { useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';
import { OrdersTable } from '../components/orders-table';

/** Every order of the company, in any status: the office's searchable register. */
export function OfficeOrdersRoute() {
  useDocumentTitle('All orders');
  const user = useCurrentUser();
  if (!user) return null;
  return (
    <>
      <PageHeader
        title="All orders"
        description={`Every inspection order at ${user.companyName}, in any status.`}
        actions={
          <ButtonLink to={paths.office.newOrder.getHref()} variant="secondary">
            New order
          </ButtonLink>
        }
      />
      <OrdersTable
        area="office"
        label="All orders"
        defaultSort="created"
        defaultDirection="desc"
        emptyState={
          <EmptyState icon={<ClipboardIcon />} title="No orders yet">
            <p>Orders placed by agents, or by you for a client, appear here with their status, deadline and payment.</p>
          </EmptyState>
        }
      />
    </>
  );
}
