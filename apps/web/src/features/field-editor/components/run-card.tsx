import {
  formatFeetInches,
  kindInfo,
  runEndReasonNames,
  runEndReasons,
  accessPointNames,
  bendInfo,
  materialNames,
  type Inspection,
  type Markup,
  type Observation,
  type Run,
  type RunDirection,
  type RunEndReason,
} from '@underfoot/core';
import { useQueryClient } from '@tanstack/react-query';
import { useId, useRef, useState, type ReactNode } from 'react';
import { toast } from 'sonner';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { deleteMedia, forgetMedia, rememberMedia, saveMarkup, uploadStill, type MediaView } from '../api';
import {
  attachStill,
  detachStill,
  formatVideoTime,
  removeObservation,
  removeRun,
  removeSection,
  runTitle,
  updateRun,
  upsertObservation,
  upsertSection,
} from '../model/document';
import { FieldError } from '@/components/ui/field-error';
import { SelectField, TextAreaField } from '@/components/ui/form-fields';
import { ConfirmButton, SectionCard, Segmented, Sheet } from './controls';
import { DepthReadings } from './depth-readings';
import { FindingSheet } from './finding-sheet';
import { FootageField } from './footage-field';
import { MarkupEditor } from './markup-editor';
import { PipeSections } from './pipe-sections';
import { SeverityChip } from './marks';
import { AttachFrameSheet, StillStrip } from './stills';
import { VideoPanel, type GrabbedFrame } from './video-panel';

type Edit = (change: (doc: Inspection) => Inspection) => void;

/** A few words on what a finding is, beyond its kind: the bend angle, the materials, the sizes. */
function findingDetail(o: Observation): string | null {
  switch (o.kind) {
    case 'bend':
      return bendInfo[o.angle].name;
    case 'material_change':
      return `${materialNames[o.fromMaterial]} to ${materialNames[o.toMaterial]}`;
    case 'size_change':
      return `${o.fromSize}″ to ${o.toSize}″`;
    case 'run_end':
      return runEndReasonNames[o.reason];
    case 'branch':
      return o.fitting === 'unknown' ? null : o.fitting === 'wye' ? 'Wye' : 'Tee';
    default: {
      if (!('severity' in o)) return null;
      const parts = [o.to !== null ? `to ${formatFeetInches(o.to)}` : null, o.clock !== null ? `at ${o.clock} o'clock` : null];
      return parts.filter(Boolean).join(', ') || null;
    }
  }
}

function Subsection({ title, children, count }: { title: string; children: ReactNode; count?: number }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="border-t border-line pt-4">
      <h3 className="mb-2 flex items-center gap-2 font-semibold">
        <span id={id}>{title}</span>
        {count !== undefined ? (
          <span className="numeric rounded-full bg-sand px-2 text-sm font-semibold text-ink-muted">
            {count}
            <span className="sr-only"> recorded</span>
          </span>
        ) : null}
      </h3>
      {children}
    </section>
  );
}

export function RunCard({
  doc,
  run,
  runIndex,
  orderId,
  media,
  problems,
  readOnly,
  edit,
}: {
  doc: Inspection;
  run: Run;
  runIndex: number;
  orderId: string;
  media: Map<string, MediaView>;
  problems: Map<string, string>;
  readOnly: boolean;
  edit: Edit;
}) {
  const queryClient = useQueryClient();
  const playerRef = useRef<HTMLVideoElement | null>(null);
  const [sheet, setSheet] = useState<{ observation: Observation | null; videoTimeHint: number | null } | null>(null);
  const [frame, setFrame] = useState<GrabbedFrame | null>(null);
  const [frameForNewFinding, setFrameForNewFinding] = useState<GrabbedFrame | null>(null);
  const [markupStill, setMarkupStill] = useState<MediaView | null>(null);
  const title = runTitle(doc, run);
  const prefix = `runs.${runIndex}.`;
  const problemAt = (path: string) => problems.get(`${prefix}${path}`);
  const editRun = (change: (run: Run) => Run) => edit((d) => updateRun(d, run.id, change));
  const extendTo = (r: Run, to: number | null) => (to !== null && to > r.distanceReached ? { ...r, distanceReached: to } : r);
  const video = run.videoFileId ? media.get(run.videoFileId) : undefined;

  function attach(still: MediaView, observationId: string) {
    rememberMedia(queryClient, orderId, still);
    edit((d) => attachStill(d, observationId, still.id));
  }

  function uploadFrameFor(observation: Observation, grabbed: GrabbedFrame) {
    const fileName = `frame-${formatVideoTime(grabbed.videoTime).replace(/[:.]/g, '-')}.jpg`;
    const { done } = uploadStill(
      orderId,
      grabbed.blob,
      fileName,
      { origin: 'frame_grab', runId: run.id, observationId: observation.id, videoTime: grabbed.videoTime, footage: observation.at },
      () => undefined,
    );
    done.then(
      ({ media: still }) => attach(still, observation.id),
      (error: unknown) => toast.error(`The frame could not be attached: ${errorMessage(error)}`),
    );
  }

  async function saveStillMarkup(still: MediaView, shapes: Markup['shapes']) {
    const saved = await saveMarkup(still.id, still.markupVersion, { shapes });
    rememberMedia(queryClient, orderId, saved);
    setMarkupStill(saved);
    toast.success(shapes.length > 0 ? 'Markup saved.' : 'Markup cleared.');
  }

  async function removeStill(still: MediaView) {
    // Out of the document first, so no save ever points at a file that is gone.
    edit((d) => detachStill(d, still.id));
    setMarkupStill(null);
    try {
      await deleteMedia(still.id);
      forgetMedia(queryClient, orderId, still.id);
    } catch (error) {
      toast.error(`The still was taken off the finding but not deleted: ${errorMessage(error)}`);
    }
  }

  /** A video the run no longer points at: out of the store too, so hundreds of MB do not linger. */
  async function removeVideoFile(mediaId: string) {
    try {
      await deleteMedia(mediaId);
      forgetMedia(queryClient, orderId, mediaId);
    } catch (error) {
      toast.error(`The old video could not be deleted: ${errorMessage(error)}`);
    }
  }

  const runProblems = [...problems.entries()].filter(([path]) => path.startsWith(prefix));

  return (
    <SectionCard
      title={title}
      description={
        <span className="numeric">
          {run.distanceReached > 0
            ? `Reached ${formatFeetInches(run.distanceReached)} · ${runEndReasonNames[run.endReason]}`
            : 'Distance not entered yet'}
        </span>
      }
    >
      <div className="space-y-4">
        {runProblems.length > 0 ? (
          <div role="alert" className="rounded-lg border border-danger/40 bg-danger-soft px-3 py-2 text-sm text-danger">
            <p className="font-semibold">Fix before this can be saved:</p>
            <ul className="mt-1 list-disc pl-5">
              {runProblems.map(([path, message]) => (
                <li key={path}>{message}</li>
              ))}
            </ul>
          </div>
        ) : null}

        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            label="From access point"
            value={run.accessPointId}
            disabled={readOnly}
            onChange={(e) => editRun((r) => ({ ...r, accessPointId: e.target.value }))}
            error={problemAt('accessPointId')}
          >
            {doc.accessPoints.map((a, i) => (
              <option key={a.id} value={a.id}>
                {i + 1}. {accessPointNames[a.kind]}
                {a.locationNote ? ` – ${a.locationNote}` : ''}
              </option>
            ))}
          </SelectField>
          <Segmented<RunDirection>
            legend="Direction"
            value={run.direction}
            disabled={readOnly}
            options={[
              { value: 'toward_main', label: 'Toward the main' },
              { value: 'toward_building', label: 'Toward the house' },
            ]}
            onChange={(direction) => editRun((r) => ({ ...r, direction }))}
          />
          <FootageField
            label="Distance reached"
            value={run.distanceReached > 0 ? run.distanceReached : null}
            disabled={readOnly}
            hint="Where the camera stopped, from the cable counter."
            error={problemAt('distanceReached')}
            // Saved when the field is left, so typing 6 on the way to 62 does not flag every finding past 6 ft.
            onChange={() => undefined}
            onCommit={(value) => {
              if (value !== null && value !== run.distanceReached) editRun((r) => ({ ...r, distanceReached: value }));
            }}
          />
          <SelectField
            label="Why it ended"
            value={run.endReason}
            disabled={readOnly}
            onChange={(e) => editRun((r) => ({ ...r, endReason: e.target.value as RunEndReason }))}
          >
            {runEndReasons.map((reason) => (
              <option key={reason} value={reason}>
                {runEndReasonNames[reason]}
              </option>
            ))}
          </SelectField>
        </div>
        {run.endReason !== 'reached_main' && run.endReason !== 'reached_building' ? (
          <TextAreaField
            rows={2}
            label="What stopped the camera"
            value={run.endNote}
            disabled={readOnly}
            onChange={(e) => editRun((r) => ({ ...r, endNote: e.target.value }))}
            error={problemAt('endNote')}
          />
        ) : null}

        <Subsection title="Findings" count={run.observations.length}>
          {run.observations.length === 0 ? (
            <p className="text-sm text-ink-muted">
              Nothing recorded on this run yet. Add defects, fittings and landmarks as the camera reaches them, with the footage from the
              counter.
            </p>
          ) : (
            <ol className="divide-y divide-line rounded-lg border border-line bg-white">
              {run.observations.map((o, i) => {
                const problem = [...problems.entries()].find(([path]) => path.startsWith(`${prefix}observations.${i}.`))?.[1];
                const detail = findingDetail(o);
                return (
                  <li key={o.id} className={cn('px-3 py-2.5', problem && 'bg-danger-soft')}>
                    <button
                      type="button"
                      onClick={() => setSheet({ observation: o, videoTimeHint: null })}
                      className="flex w-full min-w-0 flex-wrap items-baseline gap-x-2 gap-y-0.5 rounded text-left"
                    >
                      <span className="numeric w-16 shrink-0 font-semibold">{formatFeetInches(o.at)}</span>
                      <span className="min-w-0 flex-1 font-semibold text-accent underline-offset-2 hover:underline">
                        {kindInfo[o.kind].name}
                      </span>
                      {'severity' in o ? <SeverityChip severity={o.severity} /> : null}
                      {detail || o.note ? (
                        <span className="w-full truncate pl-18 text-sm text-ink-muted">{[detail, o.note].filter(Boolean).join(' · ')}</span>
                      ) : null}
                    </button>
                    {problem ? <FieldError message={problem} /> : null}
                    <div className="pl-18">
                      <StillStrip
                        orderId={orderId}
                        runId={run.id}
                        observation={o}
                        media={media}
                        readOnly={readOnly}
                        onAttached={(still) => attach(still, o.id)}
                        onOpen={setMarkupStill}
                      />
                    </div>
                  </li>
                );
              })}
            </ol>
          )}
          {!readOnly ? (
            <Button
              className="mt-3 w-full sm:w-auto"
              onClick={() => {
                // Paused on the spot in the video: the finding takes that time.
                const player = playerRef.current;
                setSheet({
                  observation: null,
                  videoTimeHint: player && player.paused && player.currentTime > 0 ? player.currentTime : null,
                });
              }}
            >
              Add finding
            </Button>
          ) : null}
        </Subsection>

        <Subsection title="Pipe sections" count={run.sections.length}>
          <PipeSections
            run={run}
            runIndex={runIndex}
            problems={problems}
            readOnly={readOnly}
            onSave={(section, to) => editRun((r) => upsertSection(extendTo(r, to), section))}
            onRemove={(id) => editRun((r) => removeSection(r, id))}
          />
        </Subsection>

        <Subsection title="Video and stills">
          <VideoPanel
            orderId={orderId}
            runId={run.id}
            runLabel={title}
            video={video}
            readOnly={readOnly}
            playerRef={playerRef}
            onUploaded={(m) => {
              const replaced = run.videoFileId;
              rememberMedia(queryClient, orderId, m);
              editRun((r) => ({ ...r, videoFileId: m.id }));
              if (replaced) void removeVideoFile(replaced);
            }}
            onRemove={() => {
              const removed = run.videoFileId;
              editRun((r) => ({ ...r, videoFileId: null }));
              if (removed) void removeVideoFile(removed);
            }}
            onGrab={setFrame}
          />
        </Subsection>

        <Subsection title="Depth readings" count={run.depthReadings.length}>
          <DepthReadings run={run} runIndex={runIndex} problems={problems} readOnly={readOnly} editRun={editRun} />
        </Subsection>

        {!readOnly ? (
          <div className="border-t border-line pt-3">
            <ConfirmButton
              size="sm"
              label="Remove this run"
              confirmLabel="Tap again to remove the run and its findings"
              onConfirm={() => edit((d) => removeRun(d, run.id))}
            />
          </div>
        ) : null}
      </div>

      <FindingSheet
        open={sheet !== null}
        onClose={() => {
          setSheet(null);
          setFrameForNewFinding(null);
        }}
        run={run}
        observation={sheet?.observation ?? null}
        videoTimeHint={sheet?.videoTimeHint ?? null}
        readOnly={readOnly}
        onSave={(observation, to) => {
          editRun((r) => upsertObservation(extendTo(r, to), observation));
          if (frameForNewFinding && !sheet?.observation) uploadFrameFor(observation, frameForNewFinding);
          setFrameForNewFinding(null);
        }}
        onDelete={(id) => editRun((r) => removeObservation(r, id))}
      />

      <AttachFrameSheet
        frame={frame}
        orderId={orderId}
        runId={run.id}
        observations={run.observations}
        onClose={() => setFrame(null)}
        onAttached={(still, observationId) => {
          attach(still, observationId);
          setFrame(null);
          toast.success('Still attached.');
        }}
        onNewFinding={() => {
          setFrameForNewFinding(frame);
          setSheet({ observation: null, videoTimeHint: frame?.videoTime ?? null });
          setFrame(null);
        }}
      />

      <Sheet open={markupStill !== null} onClose={() => setMarkupStill(null)} title="Mark up the still" wide>
        {markupStill ? (
          <MarkupEditor
            key={`${markupStill.id}-${markupStill.markupVersion}`}
            still={markupStill}
            readOnly={readOnly}
            onSave={(shapes) => saveStillMarkup(markupStill, shapes)}
            onClose={() => setMarkupStill(null)}
            onRemoveStill={() => void removeStill(markupStill)}
          />
        ) : null}
      </Sheet>
    </SectionCard>
  );
}
