import { can } from '@underfoot/core';
import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { DocumentIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { paths } from '@/config/paths';
import { actorOf, useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';
import { OrdersTable } from '../components/orders-table';

/** The portal's home: agents see the orders they placed or joined, buyers and sellers the ones they are on. */
export function PortalHomeRoute() {
  useDocumentTitle('Your reports');
  const user = useCurrentUser();
  if (!user) return null;
  // Agents order inspections; buyers and sellers follow the ones they were invited to.
  const ordersInspections = can(actorOf(user), 'order.create', { companyId: user.companyId });

  return (
    <>
      <PageHeader
        title="Your reports"
        description={
          ordersInspections
            ? `Sewer line inspections you ordered from ${user.companyName}, with their deadlines, visits and payment.`
            : `Sewer line inspections by ${user.companyName} that you are part of.`
        }
        actions={ordersInspections ? <ButtonLink to={paths.portal.newOrder.getHref()}>Order an inspection</ButtonLink> : null}
      />
      <OrdersTable
        area="portal"
        label="Your orders"
        emptyState={
          <EmptyState icon={<DocumentIcon />} title={ordersInspections ? 'No inspections ordered yet' : 'Nothing shared with you yet'}>
            {ordersInspections ? (
              <>
                <p>
                  Order a camera inspection of a property&rsquo;s sewer line. Your client gets an invitation by e-mail, and the report
                  appears here once it is published.
                </p>
                <ButtonLink to={paths.portal.newOrder.getHref()} className="mt-5">
                  Order an inspection
                </ButtonLink>
              </>
            ) : (
              <p>
                When your agent orders a sewer line inspection for your home, it appears here with its visit date, and you can read the
                report on your phone once it is released to you.
              </p>
            )}
          </EmptyState>
        }
      />
    </>
  );
}
