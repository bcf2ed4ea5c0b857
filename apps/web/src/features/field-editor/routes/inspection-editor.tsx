import { useQuery } from '@tanstack/react-query';
import { analyseInspection, demoPriceBook, formatRange, inspectionSchema, orderStatusLabels, type Inspection } from '@underfoot/core';
import { useDeferredValue, useMemo } from 'react';
import { Link, useLocation, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { CameraPipeIcon } from '@/components/ui/icons';
import { SectionLoading } from '@/components/ui/spinner';
import { areaOfPath, paths } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { inspectionPageQueryOptions, priceBookQueryOptions, type InspectionPage, type MediaView } from '../api';
import { AccessPoints } from '../components/access-points';
import { CheckedNotFound } from '../components/checked-not-found';
import { ConflictDialog } from '../components/conflict-dialog';
import { LivePreview } from '../components/live-preview';
import { GradeChip } from '@/components/ui/grade-marks';
import { RunCard } from '../components/run-card';
import { SaveStatus } from '../components/save-status';
import { useEditorEngine } from '../hooks/use-editor-engine';
import { addRun } from '../model/document';

/** The field app's recording screen for one order (the office opens the same screen from its area). */
export function InspectionEditorRoute() {
  const { orderId = '' } = useParams();
  const page = useQuery(inspectionPageQueryOptions(orderId));
  useDocumentTitle(page.data ? `Record · ${page.data.order.address}` : 'Record the line');

  if (page.isPending) return <SectionLoading label="Opening the inspection…" />;
  if (page.isError) {
    return (
      <EmptyState
        icon={<CameraPipeIcon />}
        title={isApiError(page.error, 404) ? 'This job is not one of yours' : 'The inspection could not be opened'}
      >
        <p>
          {isApiError(page.error, 404)
            ? 'It may have been assigned to someone else, or the link is wrong. Your jobs are on your day list.'
            : errorMessage(page.error)}
        </p>
        {!isApiError(page.error, 404) ? (
          <Button className="mt-4" variant="secondary" onClick={() => void page.refetch()}>
            Try again
          </Button>
        ) : null}
      </EmptyState>
    );
  }
  return <InspectionEditor key={orderId} orderId={orderId} page={page.data} />;
}

function InspectionEditor({ orderId, page }: { orderId: string; page: InspectionPage }) {
  const location = useLocation();
  const area = areaOfPath(location.pathname) === 'office' ? 'office' : 'field';
  const { engine, snapshot } = useEditorEngine(orderId, page);
  // The media list lives in the query cache: uploads add to it without a refetch.
  const { data: current } = useQuery(inspectionPageQueryOptions(orderId));
  const media = useMemo(() => new Map<string, MediaView>((current ?? page).media.map((m) => [m.id, m])), [current, page]);
  const priceBook = useQuery(priceBookQueryOptions());
  const previewDocument = useDeferredValue(snapshot.previewDocument);
  const book = priceBook.data?.priceBook ?? demoPriceBook;
  const demoPrices = priceBook.data?.isDefault ?? true;
  const analysis = useMemo(() => {
    const parsed = inspectionSchema.safeParse(previewDocument);
    // Nothing to grade until a run has a length.
    if (!parsed.success || !parsed.data.runs.some((r) => r.distanceReached > 0)) return null;
    return analyseInspection(parsed.data, book, { demoPrices });
  }, [previewDocument, book, demoPrices]);

  const doc = snapshot.document;
  const readOnly = snapshot.state === 'locked';
  const edit = (change: (d: Inspection) => Inspection) => {
    engine.edit(change);
  };
  const proposed = analysis?.costs.options.find((o) => o.kind === analysis.costs.proposed);
  const backHref = area === 'office' ? paths.office.order.getHref(orderId) : paths.field.order.getHref(orderId);

  return (
    <div className="mx-auto max-w-3xl space-y-4 pb-28">
      <Link to={backHref} className="inline-flex min-h-11 items-center gap-1 font-semibold no-underline hover:underline">
        <svg aria-hidden="true" viewBox="0 0 24 24" className="size-5" fill="none" stroke="currentColor" strokeWidth="2">
          <path d="m15 18-6-6 6-6" />
        </svg>
        Job details
      </Link>
      <header className="space-y-2">
        <h1 className="text-2xl font-bold tracking-tight sm:text-3xl">{page.order.address}</h1>
        <p className="text-ink-muted">
          Recording the line · {orderStatusLabels[page.order.status]}
          {page.order.yearBuilt ? ` · built ${page.order.yearBuilt}` : ''}
          {page.order.inspectorName ? ` · ${page.order.inspectorName}` : ''}
        </p>
        <SaveStatus snapshot={snapshot} onRetry={engine.flush} />
        {snapshot.detail && snapshot.state !== 'saved' && snapshot.state !== 'pending' && snapshot.state !== 'saving' ? (
          <p className="text-sm text-ink-muted">{snapshot.detail}</p>
        ) : null}
      </header>

      {snapshot.restoredDraft && snapshot.state !== 'conflict' ? (
        <Alert tone="info" title="Picked up where you left off">
          This phone kept changes that had not reached the server; they are being saved now.
        </Alert>
      ) : null}
      {readOnly ? (
        <Alert tone="caution" title="Read only">
          {page.order.status === 'published'
            ? 'The report is published, so the inspection is frozen. Changes go into a new revision from the office.'
            : (snapshot.detail ?? 'This inspection cannot be changed from your account.')}
        </Alert>
      ) : null}

      <AccessPoints doc={doc} readOnly={readOnly} edit={edit} accessNotes={page.order.accessNotes} problems={snapshot.problems} />

      {doc.runs.map((run, index) => (
        <RunCard
          key={run.id}
          doc={doc}
          run={run}
          runIndex={index}
          orderId={orderId}
          media={media}
          problems={snapshot.problems}
          readOnly={readOnly}
          edit={edit}
        />
      ))}

      {!readOnly && doc.accessPoints.length > 0 ? (
        <Button variant="secondary" className="w-full" onClick={() => edit((d) => addRun(d, d.accessPoints[0]!.id)[0])}>
          Add a run
        </Button>
      ) : null}

      <CheckedNotFound doc={doc} readOnly={readOnly} edit={edit} problem={snapshot.problems.get('checkedNotFound')} />

      <LivePreview analysis={analysis} stale={snapshot.previewDocument !== snapshot.document} demoPrices={demoPrices} />

      <ConflictDialog
        conflict={snapshot.conflict}
        restoredDraft={snapshot.restoredDraft}
        onMerge={() => engine.resolveConflict('merge')}
        onTakeTheirs={() => engine.resolveConflict('theirs')}
      />

      {/* Always in reach on a phone: the grade so far, the cost range and whether it is saved. */}
      <div className="fixed inset-x-0 bottom-0 z-20 border-t border-line bg-sheet/95 backdrop-blur supports-[backdrop-filter]:bg-sheet/85">
        <div className="mx-auto flex max-w-3xl flex-wrap items-center justify-between gap-x-3 gap-y-1.5 px-4 py-2.5">
          <a href="#preview" className="flex min-w-0 items-center gap-2 no-underline" aria-label="See what the findings add up to">
            {analysis ? <GradeChip level={analysis.grade.level} /> : <span className="text-sm text-ink-muted">No grade yet</span>}
            {proposed ? <span className="numeric truncate text-sm font-semibold text-ink">{formatRange(proposed)}</span> : null}
          </a>
          <SaveStatus snapshot={snapshot} onRetry={engine.flush} compact announce={false} />
        </div>
      </div>
    </div>
  );
}
