import { Avatar } from '@/components/layout/account-menu';
import { Card, CardBody } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { roleLabels } from '@/config/roles';
import { useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';

export function AccountRoute() {
  useDocumentTitle('Account');
  const user = useCurrentUser();
  if (!user) return null;

  const rows: [string, string][] = [
    ['Name', user.name],
    ['E-mail address', user.email],
    ['Role', roleLabels[user.role]],
    ['Company', user.companyName],
  ];

  return (
    <>
      <PageHeader title="Account" />
      <Card className="max-w-2xl">
        <CardBody>
          <div className="mb-6 flex items-center gap-4">
            <Avatar name={user.name} className="size-12 text-base" />
            <div className="min-w-0">
              <p className="truncate text-lg font-semibold">{user.name}</p>
              <p className="truncate text-ink-muted">{user.email}</p>
            </div>
          </div>
          <dl className="divide-y divide-line border-y border-line">
            {rows.map(([label, value]) => (
              <div key={label} className="grid gap-1 py-3 sm:grid-cols-3 sm:gap-4">
                <dt className="text-sm font-semibold text-ink-muted">{label}</dt>
                <dd className="break-words sm:col-span-2">{value}</dd>
              </div>
            ))}
          </dl>
          <p className="mt-6 text-sm text-ink-muted">
            To change your password, sign out and choose “Forgot your password?” on the sign-in page; we will e-mail you a link.
          </p>
        </CardBody>
      </Card>
    </>
  );
}
