import { AuditTable } from '../components/audit-table';
import { CompanyPage } from '../components/company-page';

export function AuditTrailRoute() {
  return (
    <CompanyPage
      title="Audit trail"
      description="Who did what, and when: sign-ins, role changes, settings, publishing, sharing and downloads. Kept for the record; nobody can edit it."
    >
      <AuditTable />
    </CompanyPage>
  );
}
