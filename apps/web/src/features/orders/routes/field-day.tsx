import { useQuery } from '@tanstack/react-query';
import { orderKindLabels, propertyTypeNames } from '@underfoot/core';
import { useId, type ReactNode } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { CameraPipeIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { SectionLoading } from '@/components/ui/spinner';
import { inputClasses } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/api-client';
import { useCurrentUser } from '@/lib/auth';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';
import { fieldDayQueryOptions, orderQueryOptions, type OrderListItem } from '../api';
import { addDaysIso, formatDay, formatLongDay, formatTimes, localTodayIso, orderHref } from '../components/order-format';

const isIsoDate = (value: string | null): value is string => value !== null && /^\d{4}-\d{2}-\d{2}$/.test(value);

function JobCard({ job, position }: { job: OrderListItem; position: number }) {
  // The day list carries no access notes; each job's own page does (a handful of jobs a day).
  const detail = useQuery(orderQueryOptions(job.id));
  const property = detail.data?.property;
  return (
    <li className="rounded-card border border-line bg-sheet shadow-sheet">
      <div className="flex items-start gap-3 p-4">
        <span
          aria-hidden="true"
          className="numeric flex size-8 shrink-0 items-center justify-center rounded-full bg-brand-soft font-bold text-brand-strong"
        >
          {position}
        </span>
        <div className="min-w-0 flex-1">
          <p className="numeric text-lg font-bold">{job.window ? formatTimes(job.window) : 'No window'}</p>
          <h2 className="font-semibold break-words">{job.address}</h2>
          <p className="text-sm text-ink-muted">
            {orderKindLabels[job.kind]}
            {property ? ` · ${propertyTypeNames[property.propertyType]} · built ${property.yearBuilt} · ${property.occupancy}` : null}
          </p>
          <div className="mt-3 rounded-lg bg-sand/70 px-3 py-2 text-sm">
            <p className="font-semibold">Access</p>
            {detail.isPending ? (
              <p className="text-ink-muted">Loading…</p>
            ) : detail.isError ? (
              <p className="text-ink-muted">Open the job for the access notes.</p>
            ) : (
              <p className="break-words whitespace-pre-line">{property?.accessNotes || 'No access notes were given.'}</p>
            )}
          </div>
        </div>
      </div>
      <Link
        to={orderHref('field', job.id)}
        className="flex min-h-11 items-center justify-between border-t border-line px-4 font-semibold no-underline hover:bg-paper"
      >
        Open the job
        <span aria-hidden="true">→</span>
      </Link>
    </li>
  );
}

/** The inspector's day: their visits on one date, in arrival order. */
export function FieldDayRoute() {
  const today = localTodayIso();
  const [params, setParams] = useSearchParams();
  const rawDate = params.get('date');
  const date = isIsoDate(rawDate) ? rawDate : today;
  const isToday = date === today;
  const title = isToday ? "Today's jobs" : `Jobs on ${formatDay(date)}`;
  useDocumentTitle(title);
  const user = useCurrentUser();
  const dateId = useId();
  const day = useQuery(fieldDayQueryOptions(date));
  if (!user) return null;

  const goTo = (next: string) => setParams(next === today ? {} : { date: next }, { replace: true });

  let body: ReactNode;
  if (day.isPending) {
    body = <SectionLoading label="Loading your jobs…" />;
  } else if (day.isError) {
    body = (
      <Alert tone="danger" title="Your jobs could not be loaded">
        <p>{errorMessage(day.error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void day.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  } else if (day.data.jobs.length === 0) {
    body = (
      <EmptyState icon={<CameraPipeIcon />} title={isToday ? 'No jobs today' : 'No jobs on this day'}>
        <p>Visits the office assigns to you show up here in arrival order, with the address and how to reach the cleanout.</p>
      </EmptyState>
    );
  } else {
    body = (
      <ol className="space-y-3" aria-label={`Jobs on ${formatLongDay(date)}`}>
        {day.data.jobs.map((job, i) => (
          <JobCard key={job.id} job={job} position={i + 1} />
        ))}
      </ol>
    );
  }

  return (
    <>
      <PageHeader title={title} description={isToday ? `${formatLongDay(date)} · ${user.companyName}` : user.companyName} />
      <div className="mb-5 flex flex-wrap items-end gap-2">
        <div className="space-y-1.5">
          <label htmlFor={dateId} className="block text-sm font-semibold">
            Day
          </label>
          <input
            id={dateId}
            type="date"
            value={date}
            onChange={(e) => (isIsoDate(e.target.value) ? goTo(e.target.value) : undefined)}
            className={cn(inputClasses, 'w-auto')}
          />
        </div>
        <Button variant="secondary" onClick={() => goTo(addDaysIso(date, -1))} aria-label="Previous day">
          ←
        </Button>
        <Button variant="secondary" onClick={() => goTo(addDaysIso(date, 1))} aria-label="Next day">
          →
        </Button>
        {isToday ? null : (
          <Button variant="quiet" onClick={() => goTo(today)}>
            Today
          </Button>
        )}
      </div>
      {body}
    </>
  );
}
