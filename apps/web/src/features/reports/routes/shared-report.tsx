import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { ErrorPage } from '@/components/errors/error-page';
import { SimpleLayout } from '@/components/layout/simple-layout';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { SectionLoading } from '@/components/ui/spinner';
import { errorMessage, isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useDocumentTitle } from '@/lib/use-document-title';
import { sharedMedia, sharedPdfHref, sharedReportQueryOptions, type SharedRead } from '../api';
import { ReportDocument, ReportFirstView } from '../components/report-document';
import { PdfButton } from '../components/pdf-button';

/** Whose link this is and how long it works, above the report (`serverRendered`: the time in UTC, the reader's zone being unknown). */
function SharedNotice({ report, serverRendered = false }: { report: SharedRead; serverRendered?: boolean }) {
  return (
    <p className="rounded-lg border border-line bg-sand/60 px-3.5 py-2.5 text-sm text-ink-muted">
      {report.purpose === 'disclosure'
        ? 'The seller shares this report with prospective buyers. It is read-only.'
        : `Shared with you to read. ${report.expiresAt ? `This link works until ${formatDateTime(report.expiresAt, { utc: serverRendered })}.` : ''}`}
    </p>
  );
}

/**
 * The top of a shared report as the server renders it into the first HTML (a guest on a phone
 * sees the grade after a few kilobytes): the same layout, header and grade as the full page.
 */
export function SharedReportFirstViewPage({ report, token }: { report: SharedRead; token: string }) {
  return (
    <SimpleLayout>
      <ReportFirstView
        revision={report.revision}
        changes={report.changes}
        readerSide={report.readerSide}
        headerActions={<PdfButton href={sharedPdfHref(token)} />}
        notice={<SharedNotice report={report} serverRendered />}
      />
    </SimpleLayout>
  );
}

/** A report opened through a share link: read-only, no account, outside the signed-in area. */
export function SharedReportRoute() {
  const { token = '' } = useParams();
  const report = useQuery(sharedReportQueryOptions(token));
  useDocumentTitle(report.data ? `Report · ${report.data.revision.snapshot.property.address.split(',')[0]}` : 'Shared report');

  let content;
  if (report.isPending) content = <SectionLoading label="Opening the report…" />;
  else if (report.isError) {
    content = isApiError(report.error, 404) ? (
      <ErrorPage eyebrow="Link not working" title="This link does not open a report">
        <p>It may have expired or been withdrawn, or part of it is missing. Ask the person who sent it to you for a new link.</p>
      </ErrorPage>
    ) : (
      <Alert tone="danger" title="The report could not be loaded">
        <p>{errorMessage(report.error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void report.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  } else {
    const data = report.data;
    content = (
      <ReportDocument
        revision={data.revision}
        changes={data.changes}
        readerSide={data.readerSide}
        media={sharedMedia(token)}
        headerActions={<PdfButton href={sharedPdfHref(token)} />}
        notice={<SharedNotice report={data} />}
      />
    );
  }
  return <SimpleLayout>{content}</SimpleLayout>;
}
