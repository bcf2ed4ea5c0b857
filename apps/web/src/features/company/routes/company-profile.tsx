import { useQuery } from '@tanstack/react-query';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading } from '@/components/ui/spinner';
import { companyQueryOptions } from '../api';
import { CompanyPage, Section } from '../components/company-page';
import { LogoCard } from '../components/logo-card';
import { ProfileForm } from '../components/profile-form';

export function CompanyProfileRoute() {
  const company = useQuery(companyQueryOptions());

  return (
    <CompanyPage title="Company profile" description="How your company appears on reports, e-mails and the portal.">
      {company.isPending ? (
        <SectionLoading label="Loading the company…" />
      ) : company.isError ? (
        <LoadFailed what="company profile" error={company.error} onRetry={() => void company.refetch()} retrying={company.isFetching} />
      ) : (
        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
          <Section title="Details">
            <ProfileForm company={company.data} />
          </Section>
          <Section title="Logo" description="Shown at the top of reports, e-mails and the public report page.">
            <LogoCard company={company.data} />
          </Section>
        </div>
      )}
    </CompanyPage>
  );
}
