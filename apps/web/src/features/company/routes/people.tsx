import { useQuery } from '@tanstack/react-query';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading } from '@/components/ui/spinner';
import { companyQueryOptions, peopleQueryOptions } from '../api';
import { AgentSignupCard } from '../components/agent-signup-card';
import { CompanyPage, Section } from '../components/company-page';
import { InviteForm } from '../components/invite-form';
import { PeopleList } from '../components/people-list';

export function PeopleRoute() {
  const people = useQuery(peopleQueryOptions());
  const company = useQuery(companyQueryOptions());

  return (
    <CompanyPage
      title="People"
      description="Invite inspectors, office staff and agents; change roles; disable accounts that should no longer sign in."
    >
      <div className="space-y-6">
        <Section title="Invite someone">
          <InviteForm />
        </Section>

        <Section title="Everyone in the company">
          {people.isPending ? (
            <SectionLoading label="Loading people…" />
          ) : people.isError ? (
            <LoadFailed what="people" error={people.error} onRetry={() => void people.refetch()} retrying={people.isFetching} />
          ) : (
            <PeopleList people={people.data} />
          )}
        </Section>

        <Section title="How agents join" description="Buyers and sellers are always invited through the orders they are on.">
          {company.isPending ? (
            <SectionLoading />
          ) : company.isError ? (
            <LoadFailed what="setting" error={company.error} onRetry={() => void company.refetch()} retrying={company.isFetching} />
          ) : (
            <AgentSignupCard company={company.data} />
          )}
        </Section>
      </div>
    </CompanyPage>
  );
}
