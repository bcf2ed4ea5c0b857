import { useEffect, useId, useRef, useState, type RefObject } from 'react';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { UploadCancelled, uploadVideo, type MediaView, type UploadHandle, type UploadProgress } from '../api';
import { formatVideoTime } from '../model/document';
import { FieldError } from '@/components/ui/field-error';
import { ConfirmButton } from './controls';

const sizeText = (bytes: number) =>
  bytes >= 1024 ** 3
    ? `${(bytes / 1024 ** 3).toFixed(2)} GB`
    : bytes >= 1024 ** 2
      ? `${(bytes / 1024 ** 2).toFixed(1)} MB`
      : `${Math.max(1, Math.round(bytes / 1024))} KB`;

type Upload =
  | { state: 'idle' }
  | { state: 'sending'; file: File; progress: UploadProgress; handle: UploadHandle<{ media: MediaView }> }
  | { state: 'failed'; file: File; message: string }
  | { state: 'cancelled'; file: File };

/** A still taken from the paused player: the picture and where in the video it is. */
export interface GrabbedFrame {
  blob: Blob;
  videoTime: number;
  width: number;
  height: number;
}

/** Draw the player's current frame on a canvas and encode it as a JPEG. */
export function grabFrame(video: HTMLVideoElement): Promise<GrabbedFrame> {
  return new Promise((resolve, reject) => {
    const width = video.videoWidth;
    const height = video.videoHeight;
    if (!width || !height) {
      reject(new Error('The video has no picture yet. Play it to the spot first.'));
      return;
    }
    const canvas = document.createElement('canvas');
    canvas.width = width;
    canvas.height = height;
    const context = canvas.getContext('2d');
    if (!context) {
      reject(new Error('This browser cannot copy frames from the video.'));
      return;
    }
    context.drawImage(video, 0, 0, width, height);
    const videoTime = video.currentTime;
    canvas.toBlob(
      (blob) => (blob ? resolve({ blob, videoTime, width, height }) : reject(new Error('The frame could not be copied.'))),
      'image/jpeg',
      0.92,
    );
  });
}

/**
 * The run's video: upload it with a real progress bar (cancel, retry), watch it while it
 * goes up (the phone plays its own copy), then from the server with seeking; pause on a
 * defect and grab the frame as a still.
 */
export function VideoPanel({
  orderId,
  runId,
  runLabel,
  video,
  readOnly,
  playerRef,
  onUploaded,
  onRemove,
  onGrab,
}: {
  orderId: string;
  runId: string;
  runLabel: string;
  video: MediaView | undefined;
  readOnly: boolean;
  playerRef: RefObject<HTMLVideoElement | null>;
  onUploaded: (media: MediaView) => void;
  onRemove: () => void;
  onGrab: (frame: GrabbedFrame) => void;
}) {
  const inputId = useId();
  const progressLabelId = useId();
  const [upload, setUpload] = useState<Upload>({ state: 'idle' });
  const [localUrl, setLocalUrl] = useState<string | null>(null);
  const [grabError, setGrabError] = useState<string | null>(null);
  const [grabbing, setGrabbing] = useState(false);
  const [time, setTime] = useState(0);
  const inputRef = useRef<HTMLInputElement>(null);

  // Let the object URL go when a new file replaces it or the panel closes.
  useEffect(() => () => (localUrl ? URL.revokeObjectURL(localUrl) : undefined), [localUrl]);
  // Leaving the page mid-upload cancels it; the server keeps nothing of a cut-off upload.
  const sending = upload.state === 'sending' ? upload.handle : null;
  useEffect(() => () => sending?.cancel(), [sending]);

  function start(file: File) {
    setGrabError(null);
    const handle = uploadVideo(orderId, runId, file, file.name, (progress) =>
      setUpload((u) => (u.state === 'sending' && u.file === file ? { ...u, progress } : u)),
    );
    setUpload({ state: 'sending', file, progress: { loaded: 0, total: file.size }, handle });
    handle.done.then(
      ({ media }) => {
        setUpload({ state: 'idle' });
        // From now on the player streams the stored copy (seeking by range requests).
        setLocalUrl(null);
        onUploaded(media);
      },
      (error: unknown) => {
        if (error instanceof UploadCancelled) setUpload({ state: 'cancelled', file });
        else setUpload({ state: 'failed', file, message: errorMessage(error) });
      },
    );
  }

  function choose(file: File | undefined) {
    if (!file) return;
    setLocalUrl(URL.createObjectURL(file));
    start(file);
  }

  async function grab() {
    const player = playerRef.current;
    if (!player) return;
    player.pause();
    setGrabbing(true);
    setGrabError(null);
    try {
      onGrab(await grabFrame(player));
    } catch (error) {
      setGrabError((error as Error).message);
    } finally {
      setGrabbing(false);
    }
  }

  // "#t=0.1" asks the player for the picture a tenth of a second in, so the first frame shows before playing.
  const source = localUrl ?? (video ? `${video.url}#t=0.1` : null);
  const percent =
    upload.state === 'sending' && upload.progress.total > 0 ? Math.floor((upload.progress.loaded / upload.progress.total) * 100) : 0;

  return (
    <div className="space-y-3">
      {source ? (
        <div className="overflow-hidden rounded-lg border border-line bg-black">
          <video
            ref={playerRef}
            key={source}
            src={source}
            controls
            playsInline
            preload="metadata"
            aria-label={`Video of ${runLabel}`}
            className="aspect-video w-full bg-black"
            onTimeUpdate={(e) => setTime(e.currentTarget.currentTime)}
            onSeeked={(e) => setTime(e.currentTarget.currentTime)}
          />
        </div>
      ) : (
        <p className="text-sm text-ink-muted">No video for this run yet. MP4, WebM or QuickTime (.mov) from the camera or the phone.</p>
      )}

      {upload.state === 'sending' ? (
        <div className="space-y-1.5 rounded-lg border border-accent/30 bg-accent-soft p-3">
          <p id={progressLabelId} className="text-sm font-semibold text-accent-strong">
            Uploading {upload.file.name}
          </p>
          <div
            role="progressbar"
            aria-labelledby={progressLabelId}
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={percent}
            aria-valuetext={`${percent}%, ${sizeText(upload.progress.loaded)} of ${sizeText(upload.progress.total)}`}
            className="h-2.5 overflow-hidden rounded-full bg-white"
          >
            <div className="h-full rounded-full bg-accent transition-[width] duration-200" style={{ width: `${percent}%` }} />
          </div>
          <div className="flex flex-wrap items-center justify-between gap-2 text-sm">
            <span className="numeric text-ink-muted">
              {sizeText(upload.progress.loaded)} of {sizeText(upload.progress.total)} · {percent}%
            </span>
            <Button size="sm" variant="secondary" onClick={() => upload.handle.cancel()}>
              Cancel upload
            </Button>
          </div>
          <p className="text-xs text-ink-muted">You can keep recording findings and grab stills from the phone’s copy meanwhile.</p>
        </div>
      ) : null}

      {upload.state === 'failed' || upload.state === 'cancelled' ? (
        <div className="space-y-2 rounded-lg border border-danger/40 bg-danger-soft p-3 text-sm">
          <p role="alert" className="font-semibold text-danger">
            {upload.state === 'cancelled' ? 'Upload cancelled. Nothing was kept on the server.' : upload.message}
          </p>
          <div className="flex flex-wrap gap-2">
            <Button size="sm" onClick={() => start(upload.file)}>
              Try again
            </Button>
            <Button size="sm" variant="secondary" onClick={() => inputRef.current?.click()}>
              Choose another file
            </Button>
          </div>
        </div>
      ) : null}

      {source ? (
        <div className="flex flex-wrap items-center gap-2">
          {!readOnly ? (
            <Button size="sm" onClick={() => void grab()} pending={grabbing}>
              Grab this frame
            </Button>
          ) : null}
          <span className="numeric text-sm text-ink-muted" aria-live="off">
            at {formatVideoTime(time) || '0:00'}
          </span>
        </div>
      ) : null}
      <FieldError message={grabError ?? undefined} />

      {!readOnly && upload.state !== 'sending' ? (
        <div className="flex flex-wrap gap-2">
          <label
            htmlFor={inputId}
            className="inline-flex min-h-9 cursor-pointer items-center rounded-lg border border-line-strong bg-sheet px-3 text-sm font-semibold hover:bg-sand has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent"
          >
            {video ? 'Replace the video' : 'Upload the run’s video'}
            <input
              ref={inputRef}
              id={inputId}
              type="file"
              accept="video/mp4,video/webm,video/quicktime,.mp4,.m4v,.webm,.mov"
              className="sr-only"
              onChange={(e) => {
                choose(e.target.files?.[0]);
                e.target.value = '';
              }}
            />
          </label>
          {video ? (
            <ConfirmButton size="sm" label="Remove the video" confirmLabel="Tap again to delete the video" onConfirm={onRemove} />
          ) : null}
        </div>
      ) : null}
      {video && upload.state === 'idle' ? (
        <p className="text-xs text-ink-muted">
          {video.originalName ? `${video.originalName} · ` : ''}
          {sizeText(video.sizeBytes)}
          {video.durationSeconds ? ` · ${formatVideoTime(video.durationSeconds)}` : ''}
        </p>
      ) : null}
    </div>
  );
}
