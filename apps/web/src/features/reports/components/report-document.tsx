import {
  accessPointOffsets,
  collectFindings,
  formatCents,
  findingFromBuilding,
  formatFootage,
  glossaryFor,
  gradeGuidance,
  gradeInfo,
  gradeStyles,
  kindInfo,
  recommendationInfo,
  renderDiagramSvg,
  runLabel,
  severityStyle,
  sourceForReaders,
  urgencyNames,
  type CostOption,
  type Finding,
  type Footage,
  type RevisionComparison,
  type Side,
} from '@underfoot/core';
import { useMemo, useState, type MouseEvent, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import type { MediaSource, RevisionView, SnapshotMedia } from '../api';
import { Lightbox } from './lightbox';
import { ShapeMark } from '@/components/ui/grade-marks';
import { SeverityLabel } from './marks';

const DIAGRAM_PREFIX = 'report';
export const findingAnchor = (observationId: string) => `${DIAGRAM_PREFIX}-finding-${observationId}`;

const longDate = (iso: string | null) =>
  iso
    ? new Date(iso.length === 10 ? `${iso}T12:00:00Z` : iso).toLocaleDateString(undefined, {
        year: 'numeric',
        month: 'long',
        day: 'numeric',
        ...(iso.length === 10 ? { timeZone: 'UTC' } : {}),
      })
    : null;

const revisionKindNames = { original: 'Report', amendment: 'Amended report', reinspection: 'Re-inspection' } as const;

const clock = (seconds: number) => `${Math.floor(seconds / 60)}:${String(Math.floor(seconds % 60)).padStart(2, '0')}`;

/** One section of the letter: a heading and its text, with an anchor others can link to. */
function Part({ id, title, children, className }: { id: string; title: string; children: ReactNode; className?: string }) {
  return (
    <section aria-labelledby={`${id}-title`} id={id} className={cn('scroll-mt-20 border-t border-line pt-6', className)}>
      <h2 id={`${id}-title`} className="mb-3 text-xl font-bold tracking-tight">
        {title}
      </h2>
      {children}
    </section>
  );
}

export interface ReportDocumentProps {
  revision: RevisionView;
  changes: RevisionComparison | null;
  /** The reader's side of the sale; null reads as the ordering side (office, inspector, guests). */
  readerSide: Side | null;
  media: MediaSource;
  /** Under the address: the revision switcher, the PDF button. */
  headerActions?: ReactNode;
  /** Above the grade: the payment hold, a link's expiry. */
  notice?: ReactNode;
}

type ReportHeadingProps = Omit<ReportDocumentProps, 'media'>;

/** Element Timing (a browser API) reports when the grade is first painted; the speed bench reads it. */
const gradePaintTiming = { elementtiming: 'report-grade' } as Record<string, string>;

/**
 * The top of the report: who, where and when, any notice, what changed, and the grade with what
 * it means for the reader. The server sends this part ready-made in the page's first HTML
 * (ReportFirstView), so a reader on a slow phone sees the grade before the app has loaded.
 */
function ReportHeading({ revision, changes, readerSide, headerActions, notice }: ReportHeadingProps) {
  const snap = revision.snapshot;
  const grade = snap.analysis.grade;
  const side = readerSide ?? snap.orderingSide;
  const style = gradeStyles[grade.level];
  return (
    <>
      <header>
        <p className="text-sm font-semibold tracking-wide text-brand uppercase">{snap.company.name}</p>
        <h1 id="report-title" className="mt-1 text-2xl font-bold tracking-tight sm:text-3xl">
          Sewer line report
        </h1>
        <p className="mt-1 text-lg break-words">{snap.property.address}</p>
        <p className="mt-1 text-sm text-ink-muted">
          {[
            longDate(snap.inspectedOn) ? `Inspected ${longDate(snap.inspectedOn)}` : null,
            snap.inspector ? `by ${snap.inspector.name}` : null,
          ]
            .filter(Boolean)
            .join(' ')}
          {' · '}
          {revisionKindNames[revision.kind]}
          {revision.number > 1 ? `, revision ${revision.number}` : ''}, published {longDate(revision.publishedAt)}
        </p>
        {headerActions ? <div className="mt-4 flex flex-wrap items-center gap-2">{headerActions}</div> : null}
      </header>

      {notice}

      {changes ? (
        <section aria-labelledby="changes-title" className="rounded-card border border-accent/30 bg-accent-soft p-4 sm:p-5">
          <h2 id="changes-title" className="font-semibold text-accent-strong">
            {revision.kind === 'reinspection'
              ? 'What changed since the last inspection'
              : `What changed since revision ${revision.number - 1}`}
          </h2>
          {revision.note ? <p className="mt-1 whitespace-pre-line">{revision.note}</p> : null}
          <p className="mt-2 font-semibold">{changes.gradeText}</p>
          {changes.changes.length > 0 ? (
            <ul className="mt-1 list-disc space-y-0.5 pl-5">
              {changes.changes.map((c, i) => (
                <li key={`${c.kind}-${i}`}>{c.text}</li>
              ))}
            </ul>
          ) : (
            <p className="mt-1 text-ink-muted">No findings were added, removed or changed in severity.</p>
          )}
        </section>
      ) : null}

      <section
        aria-labelledby="grade-title"
        className="rounded-card border-2 bg-sheet p-5 shadow-sheet sm:p-6"
        style={{ borderColor: style.color }}
      >
        <p className="text-sm font-semibold tracking-wide text-ink-muted uppercase">Condition grade</p>
        <div className="mt-1 flex items-center gap-3">
          <ShapeMark shape={style.shape} color={style.color} className="size-9" />
          <h2 id="grade-title" className="text-3xl font-bold tracking-tight" {...gradePaintTiming}>
            {grade.name}
          </h2>
          <span className="numeric ml-auto shrink-0 text-sm text-ink-muted">
            {gradeInfo[grade.level].rank} of 5<span className="sr-only">, where 1 is best</span>
          </span>
        </div>
        <p className="mt-3">
          {grade.meaning} <span className="font-semibold">{grade.action}</span>
        </p>
        <div className="mt-4 rounded-lg bg-paper p-3.5">
          <h3 className="text-sm font-semibold">{readerSide ? 'What this means for you' : `What this means for the ${side}`}</h3>
          <p className="mt-1 leading-7">{gradeGuidance[side][grade.level]}</p>
        </div>
        {grade.override ? (
          <p className="mt-3 text-sm text-ink-muted">
            The inspector set this grade; the findings alone give {gradeInfo[grade.computedLevel].name}. Reason: {grade.override.reason}
          </p>
        ) : null}
        {grade.computedLevel !== 'clear' && grade.drivers.length > 0 ? (
          <details className="mt-3 text-sm">
            <summary className="min-h-11 cursor-pointer py-2 font-semibold text-accent">Why this grade</summary>
            <ul className="list-disc space-y-1 pl-5">
              {grade.drivers.map((d, i) => (
                <li key={`${d.ruleId}-${i}`}>{d.text}</li>
              ))}
            </ul>
          </details>
        ) : null}
        <ol className="mt-4 flex flex-wrap gap-x-3 gap-y-1.5 text-xs text-ink-muted" aria-label="The five grades, best to worst">
          {(['clear', 'maintain', 'plan_repair', 'repair_now', 'failing'] as const).map((level) => (
            <li key={level} className={cn('inline-flex items-center gap-1', level === grade.level && 'font-semibold text-ink')}>
              <ShapeMark shape={gradeStyles[level].shape} color={gradeStyles[level].color} className="size-3" />
              {gradeInfo[level].name}
            </li>
          ))}
        </ol>
      </section>
    </>
  );
}

/** The report's first screen on its own, as the server renders it before the app takes over. */
export function ReportFirstView(props: ReportHeadingProps) {
  return (
    <article aria-labelledby="report-title" className="space-y-8">
      <ReportHeading {...props} />
    </article>
  );
}

/**
 * The published report as a calm letter, phone first: the grade and what it means for the
 * reader, the short version, the line with its findings pinned, each finding with its
 * marked-up still and a jump into the video, the repair options, what was fine, notes,
 * cautions, the words it uses, and who did the work.
 */
export function ReportDocument({ revision, changes, readerSide, media, headerActions, notice }: ReportDocumentProps) {
  const snap = revision.snapshot;
  const { analysis, inspection } = snap;
  const [still, setStill] = useState<{ media: SnapshotMedia; title: string } | null>(null);
  const [video, setVideo] = useState<{ mediaId: string; time: number; title: string } | null>(null);

  const findings = useMemo(() => {
    const pins = analysis.diagram.lanes.flatMap((l) => l.pins);
    const numberOf = new Map(pins.map((p) => [p.observationId, p.number]));
    return collectFindings(inspection)
      .map((f) => ({ finding: f, number: numberOf.get(f.observation.id) ?? null }))
      .sort((a, b) => (a.number ?? 999) - (b.number ?? 999));
  }, [analysis, inspection]);
  const diagramSvg = useMemo(() => renderDiagramSvg(analysis.diagram, { idPrefix: DIAGRAM_PREFIX, linkPins: true }), [analysis.diagram]);
  const glossary = useMemo(() => glossaryFor(inspection, analysis), [inspection, analysis]);
  const mediaById = useMemo(() => new Map(snap.media.map((m) => [m.id, m])), [snap.media]);
  const recommendationFor = useMemo(() => new Map(analysis.recommendations.findings.map((r) => [r.observationIds[0], r])), [analysis]);
  const seenFeet = inspection.runs.reduce((sum, r) => sum + r.distanceReached, 0);
  const offsets = useMemo(() => accessPointOffsets(inspection), [inspection]);
  const footerCautions = analysis.cautions.filter((c) => c.places.includes('report_footer') || c.places.includes('cost_section'));

  // A pin is a link to its finding: scroll there and put the focus on it, without a jump in history.
  const followPin = (event: MouseEvent<HTMLElement>) => {
    const link = (event.target as Element).closest('a');
    const href = link?.getAttribute('href');
    if (!href?.startsWith('#')) return;
    const target = document.getElementById(href.slice(1));
    if (!target) return;
    event.preventDefault();
    target.scrollIntoView({ behavior: window.matchMedia('(prefers-reduced-motion: reduce)').matches ? 'auto' : 'smooth', block: 'start' });
    target.focus({ preventScroll: true });
  };

  return (
    <article aria-labelledby="report-title" className="space-y-8">
      <ReportHeading revision={revision} changes={changes} readerSide={readerSide} headerActions={headerActions} notice={notice} />

      <Part id="summary" title="In short">
        <p className="text-lg leading-8">{analysis.summary.text}</p>
      </Part>

      <Part id="diagram" title="Your line, from the house to the main">
        <p className="mb-3 text-sm text-ink-muted">
          The camera saw <span className="numeric">{formatFootage(seenFeet)}</span> of pipe. The scale counts from the house; each numbered
          mark is a finding below, which gives both its distance from the house and from where the camera went in. Tap one to read it.
        </p>
        <div
          className="overflow-hidden rounded-lg border border-line [&_a:focus-visible]:outline-3 [&_a:focus-visible]:outline-accent [&_svg]:mx-auto [&_svg]:block [&_svg]:h-auto"
          onClick={followPin}
          // The SVG comes from core's renderer, which escapes every text it draws.
          dangerouslySetInnerHTML={{ __html: diagramSvg }}
        />
        {findings.length > 0 ? (
          // The pins are small on a phone: the same links again, as a list with room for a thumb.
          <ul className="mt-3 flex flex-wrap gap-2" aria-label="Findings on the diagram" onClick={followPin}>
            {findings.map(({ finding, number }) => {
              const pin = severityStyle(finding.observation.severity);
              return (
                <li key={finding.observation.id}>
                  <a
                    href={`#${findingAnchor(finding.observation.id)}`}
                    className="inline-flex min-h-11 items-center gap-1.5 rounded-full border border-line-strong bg-sheet px-3 text-sm text-ink no-underline hover:bg-sand"
                  >
                    <ShapeMark shape={pin.shape} color={pin.color} className="size-3" />
                    <span className="font-semibold">{number ?? '–'}</span> {kindInfo[finding.observation.kind].name}
                    <span className="numeric text-ink-muted">{formatFootage(finding.start)}</span>
                  </a>
                </li>
              );
            })}
          </ul>
        ) : null}
      </Part>

      <Part id="findings" title={findings.length ? `What the camera found (${findings.length})` : 'What the camera found'}>
        {findings.length === 0 ? (
          <p>The camera found no defects in the pipe.</p>
        ) : (
          <ol className="space-y-4">
            {findings.map(({ finding, number }) => (
              <FindingCard
                key={finding.observation.id}
                finding={finding}
                number={number}
                fromHouse={findingFromBuilding(inspection, finding, offsets)}
                stills={finding.observation.stillIds.map((id) => mediaById.get(id)).filter((m): m is SnapshotMedia => !!m)}
                recommendation={recommendationFor.get(finding.observation.id) ?? null}
                videoId={finding.run.videoFileId && mediaById.has(finding.run.videoFileId) ? finding.run.videoFileId : null}
                media={media}
                onOpenStill={(m, title) => setStill({ media: m, title })}
                onOpenVideo={(mediaId, time, title) => setVideo({ mediaId, time, title })}
              />
            ))}
          </ol>
        )}
      </Part>

      {analysis.recommendations.line.length > 0 ? (
        <Part id="recommendations" title="What we recommend">
          <ul className="space-y-3">
            {analysis.recommendations.line.map((r) => (
              <li key={r.id} className="rounded-lg border border-line bg-sheet p-4">
                <p className="font-semibold">
                  {r.name} <span className="font-normal text-ink-muted">· {urgencyNames[r.urgency]}</span>
                </p>
                <p className="mt-1">{r.text}</p>
                <p className="mt-1 text-sm text-ink-muted">{recommendationInfo[r.kind].explanation}</p>
              </li>
            ))}
          </ul>
        </Part>
      ) : null}

      <Part id="costs" title="Repair options and what they may cost">
        {revision.costsHidden ? (
          <p className="text-ink-muted">Cost ranges are not included in this copy of the report.</p>
        ) : analysis.costs.options.length === 0 ? (
          <p>Nothing needs repair or cleaning, so there are no costs to estimate.</p>
        ) : (
          <>
            <p className="mb-4 rounded-lg border border-caution/40 bg-caution-soft px-3.5 py-2.5 text-sm text-caution">
              <span className="font-semibold">An estimate, not a quote.</span> {analysis.costs.disclaimer}
            </p>
            <ul className="space-y-3">
              {analysis.costs.options.map((option) => (
                <CostOptionCard key={option.kind} option={option} />
              ))}
            </ul>
          </>
        )}
      </Part>

      <Part id="fine" title="What was checked and found fine">
        {inspection.checkedNotFound.length > 0 ? (
          <>
            <p>The inspector looked for these and did not see them:</p>
            <ul className="mt-2 grid gap-x-4 gap-y-1 sm:grid-cols-2">
              {inspection.checkedNotFound.map((kind) => (
                <li key={kind} className="flex items-center gap-2">
                  <svg
                    aria-hidden="true"
                    viewBox="0 0 16 16"
                    className="size-4 shrink-0 text-success"
                    fill="none"
                    stroke="currentColor"
                    strokeWidth="2"
                  >
                    <path d="m3 8.5 3 3L13 4.5" />
                  </svg>
                  {kindInfo[kind].name}
                </li>
              ))}
            </ul>
          </>
        ) : (
          <p className="text-ink-muted">The inspector did not list conditions that were looked for and not seen.</p>
        )}
        <ul className="mt-3 space-y-1 text-sm text-ink-muted">
          {inspection.runs.map((run) => {
            const ap = inspection.accessPoints.find((a) => a.id === run.accessPointId) ?? null;
            return (
              <li key={run.id}>
                <span className="numeric">{formatFootage(run.distanceReached)}</span> {runLabel(run, ap)}
                {run.endReason === 'reached_main' ? ', to the main' : run.endReason === 'reached_building' ? ', to the house' : ''}.
              </li>
            );
          })}
        </ul>
      </Part>

      {analysis.checks.length > 0 || analysis.slope.runs.length > 0 ? (
        <Part id="notes" title="Slope, code and pipe notes">
          <ul className="space-y-3">
            {analysis.checks.map((c) => (
              <li key={c.id}>
                <p className="font-semibold">{c.title}</p>
                <p>{c.text}</p>
                {sourceForReaders(c.source) ? <p className="text-sm text-ink-muted">Source: {sourceForReaders(c.source)}</p> : null}
              </li>
            ))}
          </ul>
          {analysis.slope.runs.length > 0 ? (
            <div className="mt-4">
              <h3 className="font-semibold">Slope</h3>
              <ul className="mt-1 list-disc space-y-1 pl-5">
                {analysis.slope.runs.flatMap((r) =>
                  (r.notes.length ? r.notes : ['Slope measured; see the diagram.']).map((n, i) => <li key={`${r.runId}-${i}`}>{n}</li>),
                )}
              </ul>
              <p className="mt-2 text-sm text-ink-muted">
                {analysis.slope.caveat} {analysis.slope.upcNote}
              </p>
            </div>
          ) : null}
        </Part>
      ) : null}

      <Part id="cautions" title="Please read">
        <ul className="space-y-3">
          {footerCautions.map((c) => (
            <li key={c.id} className="flex gap-3">
              <svg
                aria-hidden="true"
                viewBox="0 0 24 24"
                className="mt-0.5 size-5 shrink-0 text-caution"
                fill="none"
                stroke="currentColor"
                strokeWidth="2"
              >
                <path d="M12 8v5m0 3.5v.01M10.3 3.9 2.4 17.5A2 2 0 0 0 4.1 20.5h15.8a2 2 0 0 0 1.7-3L13.7 3.9a2 2 0 0 0-3.4 0Z" />
              </svg>
              <div>
                <p className="font-semibold">{c.title}</p>
                <p>{c.text}</p>
              </div>
            </li>
          ))}
        </ul>
      </Part>

      <Part id="glossary" title="Words used in this report">
        <dl className="space-y-3">
          {glossary.map((g) => (
            <div key={g.term}>
              <dt className="font-semibold">{g.term}</dt>
              <dd className="text-ink-muted">{g.definition}</dd>
            </div>
          ))}
        </dl>
      </Part>

      <Part id="about" title="Who did this inspection">
        <dl className="grid gap-3 sm:grid-cols-2">
          <div>
            <dt className="text-sm text-ink-muted">Company</dt>
            <dd className="font-semibold">{snap.company.name}</dd>
            {snap.company.licenceNumber ? <dd className="numeric text-sm">Licence {snap.company.licenceNumber}</dd> : null}
          </div>
          {snap.inspector ? (
            <div>
              <dt className="text-sm text-ink-muted">Inspector</dt>
              <dd className="font-semibold">{snap.inspector.name}</dd>
            </div>
          ) : null}
          {snap.company.phone || snap.company.email ? (
            <div>
              <dt className="text-sm text-ink-muted">Contact</dt>
              {snap.company.phone ? (
                <dd>
                  <a href={`tel:${snap.company.phone.replace(/[^\d+]/g, '')}`}>{snap.company.phone}</a>
                </dd>
              ) : null}
              {snap.company.email ? (
                <dd className="break-all">
                  <a href={`mailto:${snap.company.email}`}>{snap.company.email}</a>
                </dd>
              ) : null}
            </div>
          ) : null}
          <div>
            <dt className="text-sm text-ink-muted">Property</dt>
            <dd>
              {snap.property.propertyType}, built <span className="numeric">{snap.property.yearBuilt}</span>
            </dd>
          </div>
        </dl>
        {snap.company.footer ? <p className="mt-4 text-sm text-ink-muted">{snap.company.footer}</p> : null}
      </Part>

      <Lightbox open={still !== null} onClose={() => setStill(null)} title={still?.title ?? ''}>
        {still ? <FullStill media={media} still={still.media} alt={still.title} /> : null}
      </Lightbox>
      <Lightbox open={video !== null} onClose={() => setVideo(null)} title={video?.title ?? ''}>
        {video ? (
          <video
            key={`${video.mediaId}-${video.time}`}
            src={media(video.mediaId, 'file')}
            controls
            playsInline
            preload="metadata"
            className="mx-auto block max-h-[calc(100dvh-5rem)] w-full bg-black"
            onLoadedMetadata={(e) => {
              e.currentTarget.currentTime = video.time;
            }}
          >
            Your browser cannot play this video.
          </video>
        ) : null}
      </Lightbox>
    </article>
  );
}

function FullStill({ media, still, alt }: { media: MediaSource; still: SnapshotMedia; alt: string }) {
  const [failed, setFailed] = useState(false);
  if (failed) return <p className="p-6 text-center">This picture could not be loaded. Check your connection and try again.</p>;
  return (
    <img
      src={media(still.renderedId ?? still.id, 'file')}
      alt={alt}
      className="mx-auto block h-auto max-h-[calc(100dvh-5rem)] w-auto max-w-full"
      onError={() => setFailed(true)}
    />
  );
}

function FindingCard({
  finding,
  number,
  fromHouse,
  stills,
  recommendation,
  videoId,
  media,
  onOpenStill,
  onOpenVideo,
}: {
  finding: Finding;
  number: number | null;
  /** Where it starts on the diagram's scale (from the house), beside its footage from the access point. */
  fromHouse: Footage;
  stills: SnapshotMedia[];
  recommendation: { name: string; text: string; urgency: keyof typeof urgencyNames } | null;
  videoId: string | null;
  media: MediaSource;
  onOpenStill: (still: SnapshotMedia, title: string) => void;
  onOpenVideo: (mediaId: string, time: number, title: string) => void;
}) {
  const o = finding.observation;
  const info = kindInfo[o.kind];
  const where =
    finding.end > finding.start
      ? `From ${formatFootage(finding.start)} to ${formatFootage(finding.end)}`
      : `At ${formatFootage(finding.start)}`;
  const title = `${number ? `${number}. ` : ''}${info.name}`;
  return (
    <li
      id={findingAnchor(o.id)}
      tabIndex={-1}
      className="scroll-mt-20 rounded-card border border-line bg-sheet p-4 shadow-sheet outline-offset-2 focus:outline-3 focus:outline-accent sm:p-5"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
        <h3 className="text-lg font-semibold">{title}</h3>
        <SeverityLabel severity={o.severity} />
      </div>
      <p className="numeric mt-0.5 text-sm text-ink-muted">
        {where} {runLabel(finding.run, finding.accessPoint)} · {formatFootage(fromHouse)} from the house
      </p>
      <p className="mt-2">{info.explanation}</p>
      {o.note ? (
        <p className="mt-2">
          <span className="font-semibold">Inspector’s note: </span>
          {o.note}
        </p>
      ) : null}
      {recommendation ? (
        <p className="mt-2">
          <span className="font-semibold">{recommendation.name}</span>{' '}
          <span className="text-ink-muted">({urgencyNames[recommendation.urgency].toLowerCase()})</span>: {recommendation.text}
        </p>
      ) : null}
      {stills.length > 0 ? (
        <ul
          className={cn('mt-3 grid gap-2', stills.length > 1 ? 'grid-cols-2' : 'grid-cols-1 sm:max-w-md')}
          aria-label={`Pictures of finding ${number ?? ''}`}
        >
          {stills.map((still, i) => (
            <li key={still.id}>
              <button
                type="button"
                onClick={() => onOpenStill(still, `${title}, ${where.toLowerCase()}`)}
                className="group relative block w-full overflow-hidden rounded-lg border border-line bg-sand"
              >
                <img
                  src={media(still.renderedId ?? still.id, 'file')}
                  alt={`${info.name}, picture ${i + 1}${still.renderedId ? ', marked up by the inspector' : ''}`}
                  loading="lazy"
                  decoding="async"
                  width={640}
                  height={480}
                  className="aspect-[4/3] h-auto w-full object-cover"
                />
                <span className="absolute right-1.5 bottom-1.5 rounded bg-ink/75 px-1.5 py-0.5 text-xs font-semibold text-white">
                  Enlarge
                </span>
              </button>
            </li>
          ))}
        </ul>
      ) : null}
      {videoId && o.videoTime !== null ? (
        <button
          type="button"
          onClick={() => onOpenVideo(videoId, o.videoTime ?? 0, `${title}, in the video at ${clock(o.videoTime ?? 0)}`)}
          className="mt-3 inline-flex min-h-11 items-center gap-2 rounded-lg border border-line-strong bg-sheet px-3 font-semibold text-accent hover:bg-sand"
        >
          <svg aria-hidden="true" viewBox="0 0 24 24" className="size-5" fill="currentColor">
            <path d="M8 5.5v13l10-6.5z" />
          </svg>
          Watch in the video <span className="numeric font-normal text-ink-muted">at {clock(o.videoTime)}</span>
        </button>
      ) : null}
    </li>
  );
}

function CostOptionCard({ option }: { option: CostOption }) {
  return (
    <li className={cn('rounded-card border bg-sheet p-4 sm:p-5', option.proposed ? 'border-2 border-accent' : 'border-line')}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
        <h3 className="font-semibold">
          {option.name}
          {option.proposed ? (
            <span className="ml-2 rounded-full bg-accent-soft px-2 py-0.5 text-xs font-semibold text-accent-strong">Proposed</span>
          ) : null}
        </h3>
        <p className="numeric text-lg font-bold">
          {formatCents(option.lowCents)} – {formatCents(option.highCents)}
        </p>
      </div>
      <p className="mt-1 text-ink-muted">{option.description}</p>
      <details className="mt-2">
        <summary className="min-h-11 cursor-pointer py-2 text-sm font-semibold text-accent">How this adds up</summary>
        <table className="w-full text-sm">
          <caption className="sr-only">Itemised estimate for {option.name}</caption>
          <thead>
            <tr className="border-b border-line text-left text-ink-muted">
              <th scope="col" className="py-1.5 pr-2 font-normal">
                Item
              </th>
              <th scope="col" className="py-1.5 text-right font-normal">
                Low – high
              </th>
            </tr>
          </thead>
          <tbody>
            {option.lines.map((line, i) => (
              <tr key={`${line.item}-${i}`} className="border-b border-line align-top">
                <td className="py-1.5 pr-2">
                  {line.label}
                  <span className="numeric block text-xs text-ink-muted">{line.quantityText}</span>
                </td>
                <td className="numeric py-1.5 text-right whitespace-nowrap">
                  {formatCents(line.lowCents, { cents: false })} – {formatCents(line.highCents, { cents: false })}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {option.assumptions.length > 0 ? (
          <>
            <h4 className="mt-3 text-sm font-semibold">Assumptions</h4>
            <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm text-ink-muted">
              {option.assumptions.map((a) => (
                <li key={a}>{a}</li>
              ))}
            </ul>
          </>
        ) : null}
      </details>
    </li>
  );
}
