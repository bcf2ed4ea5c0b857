import { useQuery } from '@tanstack/react-query';
import { gradeInfo } from '@underfoot/core';
import type { ReactNode } from 'react';
import { Link, useLocation, useParams, useSearchParams } from 'react-router-dom';
import { ErrorPage } from '@/components/errors/error-page';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { SectionLoading } from '@/components/ui/spinner';
import { inputClasses } from '@/components/ui/text-field';
import { areaOfPath, paths, type Area } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';
import { pdfHref, reportQueryOptions, revisionParam, signedInMedia, type ReportRead } from '../api';
import { PdfButton } from '../components/pdf-button';
import { ReportDocument, ReportFirstView } from '../components/report-document';
import { DisclosurePanel, QuestionsPanel, ShareLinksPanel, ViewsPanel } from '../components/report-panels';

export const homes: Record<Area, { href: string; label: string }> = {
  office: { href: paths.office.home.getHref(), label: 'Office' },
  field: { href: paths.field.home.getHref(), label: 'Your jobs' },
  portal: { href: paths.portal.home.getHref(), label: 'Your reports' },
};

export const orderHref = (area: Area, orderId: string) =>
  area === 'office'
    ? paths.office.order.getHref(orderId)
    : area === 'field'
      ? paths.field.order.getHref(orderId)
      : paths.portal.order.getHref(orderId);

/** The same friendly page for a report that does not exist and one this person may not see. */
export function ReportNotFound({ area }: { area: Area | null }) {
  return (
    <ErrorPage
      eyebrow="Report not found"
      title="We could not find that report"
      actions={area ? <ButtonLink to={homes[area].href}>Back to {homes[area].label.toLowerCase()}</ButtonLink> : null}
    >
      <p>The link may be mistyped, the report may not be published yet, or it has not been shared with you.</p>
      <p>If you were expecting it, ask the agent or the inspection company who sent you the link.</p>
    </ErrorPage>
  );
}

function RevisionSwitcher({ report, onChange }: { report: ReportRead; onChange: (revision: number | null) => void }) {
  if (report.revisions.length < 2) return null;
  const latest = report.revisions[report.revisions.length - 1]!.number;
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="font-semibold">Revision</span>
      <select
        className={cn(inputClasses, 'w-auto')}
        value={report.revision.number}
        onChange={(e) => onChange(Number(e.target.value) === latest ? null : Number(e.target.value))}
      >
        {[...report.revisions].reverse().map((r) => (
          <option key={r.number} value={r.number}>
            {r.number}. {r.kind === 'original' ? 'Original' : r.kind === 'amendment' ? 'Amendment' : 'Re-inspection'} ·{' '}
            {gradeInfo[r.grade].name}
            {r.number === latest ? ' (latest)' : ''}
          </option>
        ))}
      </select>
    </label>
  );
}

/** What sits above the grade: notices for this reader, the PDF button and the revision switcher. */
function reportTop(data: ReportRead, options: { area: Area; revision: number | null; onRevision: (revision: number | null) => void }) {
  const latest = data.revisions[data.revisions.length - 1]?.number ?? data.revision.number;
  const notices: ReactNode[] = [];
  if (data.releaseHeld) {
    notices.push(
      <Alert key="held" tone="caution" title="Held until paid">
        The buyer side cannot read this report yet: it is released the moment the inspection fee is paid.
      </Alert>,
    );
  }
  if (data.revision.number !== latest) {
    notices.push(
      <Alert key="old" tone="info" title={`You are reading revision ${data.revision.number}`}>
        A newer revision was published.{' '}
        <button type="button" className="font-semibold underline" onClick={() => options.onRevision(null)}>
          Read the latest
        </button>
      </Alert>,
    );
  }
  if (data.status === 'in_review' && options.area !== 'portal') {
    notices.push(
      <Alert key="review" tone="info" title="Reopened for a new revision">
        Readers see this published revision until the next one is published.
      </Alert>,
    );
  }
  return {
    notice: notices.length ? <div className="space-y-3">{notices}</div> : null,
    headerActions: (
      <>
        <PdfButton href={pdfHref(data.orderId, options.revision)} />
        <RevisionSwitcher report={data} onChange={options.onRevision} />
      </>
    ),
  };
}

export function PublishedReport({ orderId, area }: { orderId: string; area: Area }) {
  const [params, setParams] = useSearchParams();
  const revision = revisionParam(params);
  const report = useQuery(reportQueryOptions(orderId, revision));
  useDocumentTitle(report.data ? `Report · ${report.data.revision.snapshot.property.address.split(',')[0]}` : 'Report');

  if (report.isPending) return <SectionLoading label="Opening the report…" />;
  if (report.isError) {
    if (isApiError(report.error, 404)) return <ReportNotFound area={area} />;
    return (
      <Alert tone="danger" title="The report could not be loaded">
        <p>{errorMessage(report.error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void report.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  }
  const data = report.data;
  return (
    <ReportColumns
      aside={
        <aside aria-label="About this report" className="mt-8 space-y-5 lg:mt-0">
          <p className="text-sm">
            <Link to={orderHref(area, orderId)}>Order details</Link>
          </p>
          <DisclosurePanel orderId={orderId} orderingSide={data.revision.snapshot.orderingSide} allowed={data.allowed} />
          <QuestionsPanel orderId={orderId} allowed={data.allowed} />
          <ShareLinksPanel orderId={orderId} orderKind={data.revision.snapshot.kind} allowed={data.allowed} />
          {data.allowed.viewLog ? <ViewsPanel orderId={orderId} /> : null}
        </aside>
      }
    >
      <ReportDocument
        revision={data.revision}
        changes={data.changes}
        readerSide={data.readerSide}
        media={signedInMedia}
        {...reportTop(data, {
          area,
          revision,
          onRevision: (n) => setParams(n ? { revision: String(n) } : {}, { replace: true }),
        })}
      />
    </ReportColumns>
  );
}

/** The report beside its panels on a desktop, one column on a phone (the first view has the same columns). */
function ReportColumns({ children, aside }: { children: ReactNode; aside?: ReactNode }) {
  return (
    <div className="lg:grid lg:grid-cols-[minmax(0,1fr)_22rem] lg:items-start lg:gap-8">
      <div className="mx-auto w-full max-w-2xl">{children}</div>
      {aside}
    </div>
  );
}

/**
 * The top of a reader's report page as the server renders it into the first HTML: the same
 * header, back link and grade as the full page, so nothing moves when the app takes over.
 */
export function ReportFirstViewPage({ report, revision }: { report: ReportRead; revision: number | null }) {
  return (
    <>
      <p className="mb-4 text-sm">
        <Link to={homes.portal.href}>← {homes.portal.label}</Link>
      </p>
      <ReportColumns>
        <ReportFirstView
          revision={report.revision}
          changes={report.changes}
          readerSide={report.readerSide}
          {...reportTop(report, { area: 'portal', revision, onRevision: () => undefined })}
        />
      </ReportColumns>
    </>
  );
}

/** /portal/reports/:orderId: the report for agents, buyers and sellers. */
export function ReportRoute() {
  const { orderId = '' } = useParams();
  const location = useLocation();
  const area = areaOfPath(location.pathname) ?? 'portal';
  return (
    <>
      <p className="mb-4 text-sm">
        <Link to={homes[area].href}>← {homes[area].label}</Link>
      </p>
      <PublishedReport orderId={orderId} area={area} />
    </>
  );
}
