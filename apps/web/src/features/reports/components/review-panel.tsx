import { useQuery } from '@tanstack/react-query';
import {
  analyseInspection,
  demoPriceBook,
  formatCents,
  gradeInfo,
  gradeLevels,
  gradeOverrideSchema,
  inspectionSchema,
  urgencyNames,
  type Check,
  type GradeLevel,
} from '@underfoot/core';
import { useId, useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { toast } from 'sonner';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { CameraPipeIcon } from '@/components/ui/icons';
import { SectionLoading } from '@/components/ui/spinner';
import { inputClasses } from '@/components/ui/text-field';
import { errorMessage, isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import {
  inspectionForReviewQueryOptions,
  priceBookQueryOptions,
  reviewQueryOptions,
  useGradeOverride,
  usePublish,
  useReopen,
  type ReviewPage,
} from '../api';
import { GradeChip } from '@/components/ui/grade-marks';
import { Panel } from './report-panels';

const checkTone: Record<Check['level'], string> = {
  concern: 'border-danger/40 bg-danger-soft',
  advice: 'border-caution/40 bg-caution-soft',
  note: 'border-line bg-sand/60',
};
const revisionKindNames = { original: 'Original', amendment: 'Amendment', reinspection: 'Re-inspection' } as const;

/**
 * The office's review before publishing (or an inspector's, where the company allows it):
 * what core computes from the inspection as it stands now, a grade override with its reason,
 * publishing with a note, reopening for an amendment, and the revisions so far.
 */
export function ReviewPanel({ orderId, editHref, onPublished }: { orderId: string; editHref: string; onPublished: () => void }) {
  const review = useQuery(reviewQueryOptions(orderId));
  const inspection = useQuery(inspectionForReviewQueryOptions(orderId));
  const book = useQuery(priceBookQueryOptions());
  const priceBook = book.data?.priceBook ?? demoPriceBook;
  const demoPrices = book.data?.isDefault ?? true;
  const parsed = useMemo(
    () => (inspection.data ? inspectionSchema.safeParse(inspection.data.inspection.document) : null),
    [inspection.data],
  );
  const analysis = useMemo(
    () => (parsed?.success && parsed.data.runs.length > 0 ? analyseInspection(parsed.data, priceBook, { demoPrices }) : null),
    [parsed, priceBook, demoPrices],
  );

  if (review.isPending || inspection.isPending) return <SectionLoading label="Working out the report…" />;
  if (review.isError || inspection.isError) {
    const error = review.error ?? inspection.error;
    return (
      <Alert tone="danger" title="The review could not be loaded">
        <p>{errorMessage(error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void Promise.all([review.refetch(), inspection.refetch()])}>
          Try again
        </Button>
      </Alert>
    );
  }
  const page = review.data;
  const version = inspection.data.inspection.version;
  const held = page.requirePaymentBeforeRelease && page.order.paymentState !== 'paid';

  return (
    <div className="space-y-5">
      <PaymentHold page={page} held={held} />

      {page.order.status === 'cancelled' ? (
        <Alert tone="caution" title="This order is cancelled">
          There is nothing to publish.
        </Alert>
      ) : version === 0 || !analysis ? (
        <EmptyState icon={<CameraPipeIcon />} title="Nothing recorded yet">
          <p>The grade, costs and summary appear here once the inspector has recorded at least one run.</p>
          <ButtonLink to={editHref} variant="secondary" className="mt-4">
            Open the inspection
          </ButtonLink>
        </EmptyState>
      ) : (
        <>
          {!parsed?.success ? (
            <Alert tone="danger" title="The inspection has fields to fix">
              Open the inspection and fix the marked fields before publishing.
            </Alert>
          ) : null}
          <div className="grid gap-5 lg:grid-cols-2 lg:items-start">
            <Panel
              id="review-grade"
              title="Condition grade"
              description={`Computed now from the inspection as saved${inspection.data.inspection.updatedAt ? ` ${formatDateTime(inspection.data.inspection.updatedAt)}` : ''}${inspection.data.inspection.updatedBy ? ` by ${inspection.data.inspection.updatedBy.name}` : ''}.`}
            >
              <div className="flex flex-wrap items-center gap-2">
                <GradeChip level={analysis.grade.level} />
                {analysis.grade.override ? (
                  <span className="text-sm text-ink-muted">
                    set by hand; the findings give {gradeInfo[analysis.grade.computedLevel].name}
                  </span>
                ) : null}
              </div>
              <p className="mt-2 text-sm">
                {analysis.grade.meaning} <span className="font-semibold">{analysis.grade.action}</span>
              </p>
              <h3 className="mt-3 text-sm font-semibold">What decided it</h3>
              <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm">
                {analysis.grade.drivers.map((d, i) => (
                  <li key={`${d.ruleId}-${i}`}>{d.text}</li>
                ))}
              </ul>
              {analysis.grade.otherFindings.length > 0 ? (
                <details className="mt-2 text-sm">
                  <summary className="min-h-9 cursor-pointer py-1 font-semibold text-accent">
                    Other findings ({analysis.grade.otherFindings.length})
                  </summary>
                  <ul className="mt-1 list-disc space-y-0.5 pl-5 text-ink-muted">
                    {analysis.grade.otherFindings.map((d, i) => (
                      <li key={`${d.ruleId}-${i}`}>
                        {gradeInfo[d.level].name}: {d.text}
                      </li>
                    ))}
                  </ul>
                </details>
              ) : null}
              {page.allowed.override ? (
                <OverrideForm
                  orderId={orderId}
                  version={version}
                  current={analysis.grade.override}
                  computed={analysis.grade.computedLevel}
                />
              ) : null}
            </Panel>

            <Panel id="review-summary" title="What the buyer reads first">
              <p className="leading-7">{analysis.summary.text}</p>
            </Panel>

            <Panel id="review-recommendations" title="Recommendations">
              {analysis.recommendations.line.length === 0 && analysis.recommendations.findings.length === 0 ? (
                <p className="text-sm text-ink-muted">No work recommended.</p>
              ) : (
                <ul className="space-y-2 text-sm">
                  {analysis.recommendations.line.map((r) => (
                    <li key={r.id}>
                      <span className="font-semibold">{r.name}</span> · {urgencyNames[r.urgency]}
                      <span className="block text-ink-muted">{r.text}</span>
                    </li>
                  ))}
                  {analysis.recommendations.findings.length > 0 ? (
                    <li>
                      <details>
                        <summary className="min-h-9 cursor-pointer py-1 font-semibold text-accent">
                          Per finding ({analysis.recommendations.findings.length})
                        </summary>
                        <ul className="mt-1 space-y-1">
                          {analysis.recommendations.findings.map((r) => (
                            <li key={r.id}>
                              <span className="font-semibold">{r.name}</span>: {r.text}
                            </li>
                          ))}
                        </ul>
                      </details>
                    </li>
                  ) : null}
                </ul>
              )}
            </Panel>

            <Panel
              id="review-costs"
              title="Repair cost options"
              description={demoPrices ? 'From the demo price book until the office sets its own prices.' : 'From the company price book.'}
            >
              {analysis.costs.options.length === 0 ? (
                <p className="text-sm text-ink-muted">Nothing to price.</p>
              ) : (
                <table className="w-full text-sm">
                  <caption className="sr-only">Cost options</caption>
                  <tbody>
                    {analysis.costs.options.map((o) => (
                      <tr key={o.kind} className="border-b border-line last:border-0">
                        <th scope="row" className="py-2 pr-2 text-left font-normal">
                          {o.name}
                          {o.proposed ? (
                            <span className="ml-1.5 rounded-full bg-accent-soft px-1.5 text-xs font-semibold text-accent-strong">
                              proposed
                            </span>
                          ) : null}
                        </th>
                        <td className="numeric py-2 text-right font-semibold whitespace-nowrap">
                          {formatCents(o.lowCents)} – {formatCents(o.highCents)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              )}
            </Panel>

            <Panel id="review-checks" title="Checks">
              {analysis.checks.length === 0 ? (
                <p className="text-sm text-ink-muted">Nothing to flag.</p>
              ) : (
                <ul className="space-y-2">
                  {analysis.checks.map((c) => (
                    <li key={c.id} className={cn('rounded-lg border px-3 py-2 text-sm', checkTone[c.level])}>
                      <p className="font-semibold">{c.title}</p>
                      <p className="text-ink-muted">{c.text}</p>
                    </li>
                  ))}
                </ul>
              )}
            </Panel>
          </div>
        </>
      )}

      <div className="grid gap-5 lg:grid-cols-2 lg:items-start">
        {page.allowed.publish && analysis && parsed?.success ? (
          <PublishForm orderId={orderId} page={page} version={version} held={held} onPublished={onPublished} />
        ) : page.allowed.reopen ? (
          <ReopenPanel orderId={orderId} />
        ) : !page.allowed.publish && page.order.status !== 'published' && page.order.status !== 'cancelled' && version > 0 ? (
          <Panel id="publish" title="Publish">
            <p className="text-sm text-ink-muted">
              {page.inspectorsMayPublish ? 'You cannot publish this report.' : 'Your company has the office review and publish reports.'}
            </p>
          </Panel>
        ) : null}
        <Panel id="revisions" title="Revisions">
          {page.revisions.length === 0 ? (
            <p className="text-sm text-ink-muted">Not published yet.</p>
          ) : (
            <ol className="divide-y divide-line text-sm">
              {page.revisions.map((r) => (
                <li key={r.number} className="py-2">
                  <div className="flex flex-wrap items-center justify-between gap-2">
                    <span className="font-semibold">
                      {r.number}. {revisionKindNames[r.kind]}
                    </span>
                    <GradeChip level={r.grade} />
                  </div>
                  <p className="numeric text-ink-muted">
                    {formatDateTime(r.publishedAt)}
                    {r.publishedBy ? ` · ${r.publishedBy}` : ''}
                  </p>
                  {r.note ? <p className="mt-0.5">{r.note}</p> : null}
                </li>
              ))}
            </ol>
          )}
          <p className="mt-3 text-sm">
            <Link to={editHref}>Open the inspection</Link>
          </p>
        </Panel>
      </div>
    </div>
  );
}

function PaymentHold({ page, held }: { page: ReviewPage; held: boolean }) {
  if (page.releaseHeld) {
    return (
      <Alert tone="caution" title="Published, held until paid">
        The report is published but not released: the buyer side cannot read it until the inspection fee is paid. It goes out by e-mail the
        moment the payment arrives.
      </Alert>
    );
  }
  if (held && page.order.status !== 'published' && page.order.status !== 'cancelled') {
    return (
      <Alert tone="caution" title="Will be held until paid">
        The fee is not paid yet and your company releases reports only once it is. Publishing now freezes the report; it reaches the
        {page.order.kind === 'pre_purchase' ? ' buyer' : ' seller'} side when the payment arrives.
      </Alert>
    );
  }
  return null;
}

function OverrideForm({
  orderId,
  version,
  current,
  computed,
}: {
  orderId: string;
  version: number;
  current: { level: GradeLevel; reason: string } | null;
  computed: GradeLevel;
}) {
  const [open, setOpen] = useState(false);
  const [level, setLevel] = useState<GradeLevel>(current?.level ?? computed);
  const [reason, setReason] = useState(current?.reason ?? '');
  const [fieldError, setFieldError] = useState<string | null>(null);
  const mutation = useGradeOverride(orderId);
  const levelId = useId();
  const reasonId = useId();

  const save = (override: { level: GradeLevel; reason: string } | null) => {
    if (override) {
      const check = gradeOverrideSchema.safeParse(override);
      if (!check.success) {
        setFieldError(check.error.issues[0]?.message ?? 'Say why you changed the grade.');
        return;
      }
    }
    setFieldError(null);
    mutation.mutate(
      { baseVersion: version, override },
      {
        onSuccess: () => {
          setOpen(false);
          toast.success(override ? 'Grade set. The change and its reason are in the audit trail.' : 'The computed grade applies again.');
        },
        onError: (error) => {
          if (isApiError(error, 400)) setFieldError(error.fieldErrors.find((e) => e.path.startsWith('override'))?.message ?? error.detail);
        },
      },
    );
  };

  if (!open) {
    return (
      <div className="mt-4 flex flex-wrap gap-2">
        <Button size="sm" variant="secondary" onClick={() => setOpen(true)}>
          {current ? 'Change the grade set by hand' : 'Disagree? Set the grade by hand'}
        </Button>
        {current ? (
          <Button size="sm" variant="quiet" pending={mutation.isPending} onClick={() => save(null)}>
            Use the computed grade
          </Button>
        ) : null}
      </div>
    );
  }
  return (
    <form
      className="mt-4 space-y-3 rounded-lg border border-line bg-paper p-3"
      onSubmit={(e) => {
        e.preventDefault();
        save({ level, reason });
      }}
    >
      <div className="space-y-1.5">
        <label htmlFor={levelId} className="block text-sm font-semibold">
          Grade
        </label>
        <select id={levelId} value={level} onChange={(e) => setLevel(e.target.value as GradeLevel)} className={cn(inputClasses, 'w-auto')}>
          {gradeLevels.map((g) => (
            <option key={g} value={g}>
              {gradeInfo[g].name}
              {g === computed ? ' (computed)' : ''}
            </option>
          ))}
        </select>
      </div>
      <div className="space-y-1.5">
        <label htmlFor={reasonId} className="block text-sm font-semibold">
          Why (required, kept in the audit trail)
        </label>
        <textarea
          id={reasonId}
          rows={3}
          value={reason}
          maxLength={1000}
          onChange={(e) => setReason(e.target.value)}
          aria-invalid={fieldError ? true : undefined}
          aria-describedby={fieldError ? `${reasonId}-error` : undefined}
          className={cn(inputClasses, 'min-h-20')}
        />
        {fieldError ? (
          <p id={`${reasonId}-error`} className="text-sm font-medium text-danger">
            {fieldError}
          </p>
        ) : null}
      </div>
      {mutation.error && !isApiError(mutation.error, 400) ? <Alert tone="danger">{errorMessage(mutation.error)}</Alert> : null}
      <div className="flex gap-2">
        <Button type="submit" size="sm" pending={mutation.isPending}>
          Save the grade
        </Button>
        <Button size="sm" variant="quiet" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function PublishForm({
  orderId,
  page,
  version,
  held,
  onPublished,
}: {
  orderId: string;
  page: ReviewPage;
  version: number;
  held: boolean;
  onPublished: () => void;
}) {
  const amending = page.revisions.length > 0;
  const [kind, setKind] = useState<'amendment' | 'reinspection'>('amendment');
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string | null>(null);
  const publish = usePublish(orderId);
  const noteId = useId();
  const next = page.revisions.length + 1;

  return (
    <Panel
      id="publish"
      title={amending ? `Publish revision ${next}` : 'Publish the report'}
      description={
        amending
          ? 'The published revisions stay as they are; readers see the new one with a note on what changed.'
          : 'Publishing freezes the report: later changes to the inspection go into a new revision.'
      }
    >
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          if (amending && note.trim().length < 3) {
            setNoteError('Say what changed in this revision.');
            return;
          }
          setNoteError(null);
          publish.mutate(
            { note: note.trim(), inspectionVersion: version, ...(amending ? { kind } : {}) },
            {
              onSuccess: (body) => {
                toast.success(
                  body.releaseHeld ? 'Published. It is held until the fee is paid.' : 'Published. The parties have been e-mailed.',
                );
                onPublished();
              },
              onError: (error) => {
                if (isApiError(error, 400)) setNoteError(error.fieldErrors.find((f) => f.path === 'note')?.message ?? error.detail);
              },
            },
          );
        }}
      >
        {amending ? (
          <fieldset>
            <legend className="text-sm font-semibold">What is this revision?</legend>
            <div className="mt-1 space-y-1">
              <label className="flex min-h-11 items-center gap-2">
                <input
                  type="radio"
                  name="revision-kind"
                  className="size-5 accent-brand"
                  checked={kind === 'amendment'}
                  onChange={() => setKind('amendment')}
                />
                An amendment: a correction or an addition to the same visit
              </label>
              <label className="flex min-h-11 items-center gap-2">
                <input
                  type="radio"
                  name="revision-kind"
                  className="size-5 accent-brand"
                  checked={kind === 'reinspection'}
                  onChange={() => setKind('reinspection')}
                />
                A re-inspection: a new visit, for example after a repair
              </label>
            </div>
          </fieldset>
        ) : null}
        <div className="space-y-1.5">
          <label htmlFor={noteId} className="block text-sm font-semibold">
            {amending ? 'What changed (readers see this)' : 'Note for the readers (optional)'}
          </label>
          <textarea
            id={noteId}
            rows={3}
            value={note}
            maxLength={2000}
            onChange={(e) => setNote(e.target.value)}
            aria-invalid={noteError ? true : undefined}
            aria-describedby={noteError ? `${noteId}-error` : undefined}
            className={cn(inputClasses, 'min-h-20')}
          />
          {noteError ? (
            <p id={`${noteId}-error`} className="text-sm font-medium text-danger">
              {noteError}
            </p>
          ) : null}
        </div>
        {held ? <p className="text-sm font-semibold text-caution">Held until paid: the fee is not paid yet.</p> : null}
        {publish.error && !isApiError(publish.error, 400) ? <Alert tone="danger">{errorMessage(publish.error)}</Alert> : null}
        <Button type="submit" pending={publish.isPending} className="w-full sm:w-auto">
          {amending ? `Publish revision ${next}` : 'Publish the report'}
        </Button>
      </form>
    </Panel>
  );
}

function ReopenPanel({ orderId }: { orderId: string }) {
  const reopen = useReopen(orderId);
  return (
    <Panel
      id="reopen"
      title="Amend or re-inspect"
      description="Reopening lets the inspection be changed again. Readers keep seeing the published report until you publish the next revision."
    >
      <Button
        variant="secondary"
        pending={reopen.isPending}
        onClick={() =>
          reopen.mutate(undefined, { onSuccess: () => toast.success('Reopened. Change the inspection, then publish a new revision.') })
        }
      >
        Reopen for a new revision
      </Button>
    </Panel>
  );
}
