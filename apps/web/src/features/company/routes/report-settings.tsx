import { useQuery } from '@tanstack/react-query';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading } from '@/components/ui/spinner';
import { companyQueryOptions } from '../api';
import { CompanyPage, Section } from '../components/company-page';
import { ReportSettingsForm } from '../components/report-settings-form';

export function ReportSettingsRoute() {
  const company = useQuery(companyQueryOptions());
  return (
    <CompanyPage title="Report settings" description="Who publishes, when reports open, and how shared reports behave.">
      {company.isPending ? (
        <SectionLoading label="Loading the settings…" />
      ) : company.isError ? (
        <LoadFailed what="settings" error={company.error} onRetry={() => void company.refetch()} retrying={company.isFetching} />
      ) : (
        <Section title="Settings" className="max-w-3xl">
          <ReportSettingsForm company={company.data} />
        </Section>
      )}
    </CompanyPage>
  );
}
