import { formatFeetInches, kindInfo, type Observation } from '@underfoot/core';
import { useEffect, useId, useMemo, useState } from 'react';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { uploadStill, type MediaView, type StillDetails } from '../api';
import { formatVideoTime } from '../model/document';
import { FieldError } from '@/components/ui/field-error';
import { SelectField } from '@/components/ui/form-fields';
import { Sheet } from './controls';
import type { GrabbedFrame } from './video-panel';

/** Thumbnails of a finding's stills, each opening the markup editor, and a way to add a photo. */
export function StillStrip({
  orderId,
  runId,
  observation,
  media,
  readOnly,
  onAttached,
  onOpen,
}: {
  orderId: string;
  runId: string;
  observation: Observation;
  media: Map<string, MediaView>;
  readOnly: boolean;
  onAttached: (still: MediaView) => void;
  onOpen: (still: MediaView) => void;
}) {
  const inputId = useId();
  const [uploading, setUploading] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const stills = observation.stillIds.map((id) => media.get(id)).filter((m): m is MediaView => !!m);
  const name = kindInfo[observation.kind].name;

  function addPhoto(file: File | undefined) {
    if (!file) return;
    setError(null);
    setUploading(0);
    const details: StillDetails = {
      origin: 'photo',
      runId,
      observationId: observation.id,
      videoTime: observation.videoTime,
      footage: observation.at,
    };
    uploadStill(orderId, file, file.name, details, (p) => setUploading(Math.floor((p.loaded / Math.max(1, p.total)) * 100))).done.then(
      ({ media: still }) => {
        setUploading(null);
        onAttached(still);
      },
      (e: unknown) => {
        setUploading(null);
        setError(errorMessage(e));
      },
    );
  }

  if (stills.length === 0 && readOnly) return null;
  return (
    <div className="mt-2">
      <ul className="flex flex-wrap items-center gap-2">
        {stills.map((still, i) => (
          <li key={still.id}>
            <button
              type="button"
              onClick={() => onOpen(still)}
              className="relative block overflow-hidden rounded-md border border-line bg-black"
              aria-label={`Still ${i + 1} of ${name} at ${formatFeetInches(observation.at)}${still.markup?.shapes.length ? ', marked up' : ''}: open to mark up`}
            >
              <img src={still.thumbnailUrl ?? still.url} alt="" className="h-16 w-20 object-cover" loading="lazy" />
              {still.markup?.shapes.length ? (
                <span className="absolute right-0 bottom-0 left-0 bg-ink/75 px-1 text-center text-[11px] font-semibold text-white">
                  Marked up
                </span>
              ) : null}
            </button>
          </li>
        ))}
        {uploading !== null ? (
          <li className="flex h-16 w-20 items-center justify-center rounded-md border border-dashed border-accent bg-accent-soft text-xs font-semibold text-accent-strong">
            <span role="status">Uploading {uploading}%</span>
          </li>
        ) : null}
        {!readOnly && uploading === null ? (
          <li>
            <label
              htmlFor={inputId}
              className="flex h-16 w-20 cursor-pointer flex-col items-center justify-center rounded-md border border-dashed border-line-strong bg-white text-xs font-semibold text-accent hover:bg-accent-soft has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent"
            >
              <svg aria-hidden="true" viewBox="0 0 24 24" className="size-5" fill="none" stroke="currentColor" strokeWidth="2">
                <path d="M12 5v14M5 12h14" />
              </svg>
              Photo
              <span className="sr-only">
                {' '}
                for {name} at {formatFeetInches(observation.at)}
              </span>
              <input
                id={inputId}
                type="file"
                accept="image/jpeg,image/png,image/webp"
                className="sr-only"
                onChange={(e) => {
                  addPhoto(e.target.files?.[0]);
                  e.target.value = '';
                }}
              />
            </label>
          </li>
        ) : null}
      </ul>
      <FieldError message={error ?? undefined} />
    </div>
  );
}

/**
 * After "Grab this frame": see the frame, and attach it to a finding of the run (the
 * nearest in video time is offered first), or start a new finding from it.
 */
export function AttachFrameSheet({
  frame,
  orderId,
  runId,
  observations,
  onClose,
  onAttached,
  onNewFinding,
}: {
  frame: GrabbedFrame | null;
  orderId: string;
  runId: string;
  observations: Observation[];
  onClose: () => void;
  onAttached: (still: MediaView, observationId: string) => void;
  onNewFinding: () => void;
}) {
  const previewUrl = useMemo(() => (frame ? URL.createObjectURL(frame.blob) : null), [frame]);
  useEffect(() => () => (previewUrl ? URL.revokeObjectURL(previewUrl) : undefined), [previewUrl]);
  const nearest = useMemo(() => {
    if (!frame || observations.length === 0) return '';
    const timed = observations.filter((o) => o.videoTime !== null);
    const pool = timed.length > 0 ? timed : observations;
    return [...pool].sort((a, b) => Math.abs((a.videoTime ?? 0) - frame.videoTime) - Math.abs((b.videoTime ?? 0) - frame.videoTime))[0]!.id;
  }, [frame, observations]);
  const [choice, setChoice] = useState<string | null>(null);
  const [sending, setSending] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const selected = choice ?? nearest;

  function attach() {
    const observation = observations.find((o) => o.id === selected);
    if (!frame || !observation) return;
    setError(null);
    setSending(0);
    const details: StillDetails = {
      origin: 'frame_grab',
      runId,
      observationId: observation.id,
      videoTime: frame.videoTime,
      footage: observation.at,
    };
    const fileName = `frame-${formatVideoTime(frame.videoTime).replace(/[:.]/g, '-')}.jpg`;
    uploadStill(orderId, frame.blob, fileName, details, (p) => setSending(Math.floor((p.loaded / Math.max(1, p.total)) * 100))).done.then(
      ({ media }) => {
        setSending(null);
        setChoice(null);
        onAttached(media, observation.id);
      },
      (e: unknown) => {
        setSending(null);
        setError(errorMessage(e));
      },
    );
  }

  return (
    <Sheet
      open={frame !== null}
      onClose={() => {
        setChoice(null);
        setError(null);
        onClose();
      }}
      title="Attach this frame"
      description={frame ? `From the video at ${formatVideoTime(frame.videoTime)}.` : undefined}
    >
      {frame && previewUrl ? (
        <div className="space-y-4">
          <img src={previewUrl} alt={`Frame at ${formatVideoTime(frame.videoTime)}`} className="w-full rounded-lg bg-black" />
          {observations.length > 0 ? (
            <SelectField label="Attach to the finding" value={selected} onChange={(e) => setChoice(e.target.value)}>
              {observations.map((o) => (
                <option key={o.id} value={o.id}>
                  {formatFeetInches(o.at)} · {kindInfo[o.kind].name}
                  {o.videoTime !== null ? ` (video ${formatVideoTime(o.videoTime)})` : ''}
                </option>
              ))}
            </SelectField>
          ) : (
            <p className="text-sm text-ink-muted">This run has no findings yet. Start one from this frame.</p>
          )}
          <FieldError message={error ?? undefined} />
          <div className={cn('flex flex-wrap gap-2 border-t border-line pt-4')}>
            {observations.length > 0 ? (
              <Button onClick={attach} pending={sending !== null}>
                {sending !== null ? `Uploading ${sending}%` : 'Attach still'}
              </Button>
            ) : null}
            <Button variant={observations.length > 0 ? 'secondary' : 'primary'} onClick={onNewFinding} disabled={sending !== null}>
              New finding from this frame
            </Button>
          </div>
        </div>
      ) : null}
    </Sheet>
  );
}
