import { CameraPipeIcon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';

export function FieldHomeRoute() {
  useDocumentTitle("Today's jobs");
  const user = useCurrentUser();
  if (!user) return null;

  return (
    <>
      <PageHeader title="Today's jobs" description={user.companyName} />
      <EmptyState icon={<CameraPipeIcon />} title="Your jobs will appear here">
        <p>
          The inspections assigned to you, in order of arrival window, with the address and what is known about the cleanout. Open a job on
          site to record the line, upload the video and mark up stills.
        </p>
      </EmptyState>
    </>
  );
}
