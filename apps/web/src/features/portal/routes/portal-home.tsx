import { can } from '@underfoot/core';
import { DocumentIcon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { actorOf, useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';

export function PortalHomeRoute() {
  useDocumentTitle('Your reports');
  const user = useCurrentUser();
  if (!user) return null;
  // Agents order inspections; buyers and sellers read what is released to them.
  const ordersInspections = can(actorOf(user), 'order.create', { companyId: user.companyId });

  return (
    <>
      <PageHeader title="Your reports" description={`Sewer line inspections by ${user.companyName}`} />
      <EmptyState icon={<DocumentIcon />} title="Your reports will appear here">
        {ordersInspections ? (
          <p>
            The inspections you order, with their status and contingency deadline, and each report once it is released to your side of the
            sale.
          </p>
        ) : (
          <p>
            Each sewer line report shared with you, once the inspection company releases it. You will be able to read it on your phone, ask
            the inspector a question and download a PDF.
          </p>
        )}
      </EmptyState>
    </>
  );
}
