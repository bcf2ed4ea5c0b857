import type { ReactNode } from 'react';
import { NavLink } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { companyNavigation } from '@/config/navigation';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';

/** The company section's tabs: a scrolling row on phones, so nothing wraps or overflows the page. */
function CompanyTabs() {
  return (
    <nav aria-label="Company" className="-mx-4 mb-6 overflow-x-auto border-b border-line px-4 sm:mx-0 sm:px-0">
      <ul className="flex min-w-max gap-1">
        {companyNavigation.map((item) => (
          <li key={item.to}>
            <NavLink
              to={item.to}
              end={item.end}
              className={({ isActive }) =>
                cn(
                  '-mb-px inline-flex min-h-11 items-center border-b-2 px-3 text-sm font-semibold no-underline',
                  isActive ? 'border-brand text-brand-strong' : 'border-transparent text-ink-muted hover:text-ink',
                )
              }
            >
              {item.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}

/** Every company page: the title, the section tabs, then the section itself. */
export function CompanyPage({
  title,
  description,
  actions,
  children,
}: {
  title: string;
  description?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
}) {
  useDocumentTitle(title);
  return (
    <>
      <p className="mb-1 text-sm font-semibold tracking-wide text-brand uppercase">Company</p>
      <PageHeader title={title} description={description} actions={actions} />
      <CompanyTabs />
      {children}
    </>
  );
}

/** A titled block inside a company page. */
export function Section({
  title,
  description,
  children,
  className,
  actions,
}: {
  title: string;
  description?: ReactNode;
  children: ReactNode;
  className?: string;
  actions?: ReactNode;
}) {
  return (
    <section className={cn('rounded-card border border-line bg-sheet p-5 shadow-sheet sm:p-6', className)}>
      <div className="mb-4 flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h2 className="text-lg font-semibold text-ink">{title}</h2>
          {description ? <div className="mt-1 text-sm text-ink-muted">{description}</div> : null}
        </div>
        {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
      </div>
      {children}
    </section>
  );
}
