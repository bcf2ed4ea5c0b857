import { useQuery } from '@tanstack/react-query';
import { Link, useLocation, useParams, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { SectionLoading } from '@/components/ui/spinner';
import { areaOfPath, paths, type Area } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';
import { reviewQueryOptions } from '../api';
import { ReviewPanel } from '../components/review-panel';
import { orderHref, PublishedReport, ReportNotFound } from './report';

/** /office/reports/:orderId and /field/reports/:orderId: the review and publish screen, and the published report. */
export function StaffReportRoute() {
  const { orderId = '' } = useParams();
  const location = useLocation();
  return <StaffReport orderId={orderId} area={areaOfPath(location.pathname) === 'field' ? 'field' : 'office'} />;
}

function StaffReport({ orderId, area }: { orderId: string; area: Area }) {
  const [params, setParams] = useSearchParams();
  const review = useQuery(reviewQueryOptions(orderId));
  useDocumentTitle(review.data ? `Review · ${review.data.order.address.split(',')[0]}` : 'Review');
  if (review.isPending) return <SectionLoading label="Opening the report…" />;
  if (review.isError) {
    if (isApiError(review.error, 404)) return <ReportNotFound area={area} />;
    return (
      <Alert tone="danger" title="The report could not be loaded">
        <p>{errorMessage(review.error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void review.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  }
  const published = review.data.revisions.length > 0;
  const unpublishedWork = review.data.order.status !== 'published' && review.data.order.status !== 'cancelled';
  const tab =
    params.get('view') === 'report' && published
      ? 'report'
      : params.get('view') === 'review' || !published || unpublishedWork
        ? 'review'
        : 'report';
  const editHref = area === 'office' ? paths.inspection.office.getHref(orderId) : paths.inspection.field.getHref(orderId);
  const tabs: { id: 'review' | 'report'; label: string; enabled: boolean }[] = [
    { id: 'review', label: 'Review and publish', enabled: true },
    { id: 'report', label: published ? `Published report (${review.data.revisions.length})` : 'Published report', enabled: published },
  ];
  return (
    <>
      <p className="mb-2 text-sm">
        <Link to={orderHref(area, orderId)}>← Order details</Link>
      </p>
      {tab === 'review' ? (
        <h1 className="mb-3 text-2xl font-bold tracking-tight break-words">{review.data.order.address}</h1>
      ) : (
        <p className="mb-3 text-lg font-semibold break-words">{review.data.order.address}</p>
      )}
      <div role="tablist" aria-label="Report" className="mb-6 flex gap-1 border-b border-line">
        {tabs.map((t) => (
          <button
            key={t.id}
            type="button"
            role="tab"
            aria-selected={tab === t.id}
            disabled={!t.enabled}
            onClick={() => setParams({ view: t.id }, { replace: true })}
            className={cn(
              '-mb-px min-h-11 border-b-2 px-3 font-semibold disabled:cursor-not-allowed disabled:text-ink-muted/60',
              tab === t.id ? 'border-brand text-brand-strong' : 'border-transparent text-ink hover:bg-sand',
            )}
          >
            {t.label}
          </button>
        ))}
      </div>
      <div role="tabpanel">
        {tab === 'review' ? (
          <ReviewPanel orderId={orderId} editHref={editHref} onPublished={() => setParams({ view: 'report' }, { replace: true })} />
        ) : (
          <PublishedReport orderId={orderId} area={area} />
        )}
      </div>
    </>
  );
}
