import { queryOptions, type QueryClient } from '@tanstack/react-query';
import { demoPriceBook, type Inspection, type Markup, type OrderStatus, type PriceBook } from '@underfoot/core';
import { api, ApiError, isApiError, type Problem } from '@/lib/api-client';

// ---------- shapes the API answers with ----------

export interface InspectionView {
  orderId: string;
  document: Inspection;
  /** 0 until the first save. */
  version: number;
  updatedAt: string | null;
  updatedBy: { id: string; name: string } | null;
}

export interface MediaView {
  id: string;
  kind: 'video' | 'still';
  orderId: string;
  runId: string | null;
  observationId: string | null;
  mime: string;
  sizeBytes: number;
  width: number | null;
  height: number | null;
  durationSeconds: number | null;
  videoTime: number | null;
  footage: number | null;
  origin: 'upload' | 'frame_grab' | 'photo' | 'markup';
  originalName: string;
  createdAt: string;
  url: string;
  thumbnailUrl: string | null;
  markup: Markup | null;
  markupVersion: number;
  renderedUrl: string | null;
}

export interface InspectionPage {
  inspection: InspectionView;
  order: {
    id: string;
    status: OrderStatus;
    address: string;
    yearBuilt: number | null;
    propertyType: string;
    accessNotes: string;
    inspectorName: string | null;
    windowDate: string | null;
  };
  media: MediaView[];
  allowed: { edit: boolean };
}

// ---------- queries ----------

export const fieldEditorKeys = {
  all: ['field-editor'] as const,
  page: (orderId: string) => ['field-editor', 'inspection', orderId] as const,
  priceBook: ['field-editor', 'price-book'] as const,
};

export function inspectionPageQueryOptions(orderId: string) {
  return queryOptions({
    queryKey: fieldEditorKeys.page(orderId),
    queryFn: ({ signal }) => api.get<InspectionPage>(`/api/orders/${encodeURIComponent(orderId)}/inspection`, { signal }),
    // The editor keeps its own copy while open; a refetch would not replace it anyway.
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    meta: { errorToast: false },
  });
}

export interface PriceBookForPreview {
  priceBook: PriceBook;
  /** True when the company has not set its own prices (the demo book is used). */
  isDefault: boolean;
}

/** The company's price book for the live cost preview; the demo book if it cannot be read. */
export function priceBookQueryOptions() {
  return queryOptions({
    queryKey: fieldEditorKeys.priceBook,
    queryFn: async ({ signal }): Promise<PriceBookForPreview> => {
      try {
        const body = await api.get<{ priceBook: PriceBook; isDefault: boolean }>('/api/company/price-book', { signal });
        return { priceBook: body.priceBook, isDefault: body.isDefault };
      } catch (error) {
        if (isApiError(error) && error.status !== 401) return { priceBook: demoPriceBook, isDefault: true };
        throw error;
      }
    },
    staleTime: 10 * 60_000,
    meta: { errorToast: false },
  });
}

/** Put a new or changed file into the open page's list. */
export function rememberMedia(queryClient: QueryClient, orderId: string, media: MediaView) {
  queryClient.setQueryData<InspectionPage>(fieldEditorKeys.page(orderId), (page) =>
    page ? { ...page, media: [...page.media.filter((m) => m.id !== media.id), media] } : page,
  );
}

export function forgetMedia(queryClient: QueryClient, orderId: string, mediaId: string) {
  queryClient.setQueryData<InspectionPage>(fieldEditorKeys.page(orderId), (page) =>
    page ? { ...page, media: page.media.filter((m) => m.id !== mediaId) } : page,
  );
}

// ---------- saving ----------

export type SaveOutcome =
  | { kind: 'saved'; version: number; updatedAt: string }
  | { kind: 'conflict'; current: InspectionView }
  | { kind: 'invalid'; errors: { path: string; message: string }[]; detail: string }
  | { kind: 'locked'; detail: string };

/** PUT the whole document with the version it started from; every answer but a network failure becomes an outcome. */
export async function saveInspection(orderId: string, baseVersion: number, document: Inspection): Promise<SaveOutcome> {
  const url = `/api/orders/${encodeURIComponent(orderId)}/inspection`;
  try {
    const body = await api.put<{ version: number; updatedAt: string }>(url, { baseVersion, document });
    return { kind: 'saved', version: body.version, updatedAt: body.updatedAt };
  } catch (error) {
    if (!(error instanceof ApiError)) throw error;
    if (error.status === 409 && error.code === 'version_conflict') {
      // The answer carries the stored version, but our client keeps only the problem fields: read it afresh.
      const page = await api.get<InspectionPage>(url);
      return { kind: 'conflict', current: page.inspection };
    }
    if (error.status === 400) {
      return {
        kind: 'invalid',
        detail: error.detail,
        errors: error.fieldErrors.map((e) => ({ path: e.path.replace(/^document\./, ''), message: e.message })),
      };
    }
    if (error.status === 403 || error.status === 404 || (error.status === 409 && error.code === 'order_cancelled')) {
      return { kind: 'locked', detail: error.detail };
    }
    throw error;
  }
}

// ---------- uploads with progress ----------

export interface UploadProgress {
  loaded: number;
  total: number;
}

export interface UploadHandle<T> {
  done: Promise<T>;
  cancel: () => void;
}

export class UploadCancelled extends Error {
  constructor() {
    super('The upload was cancelled.');
    this.name = 'UploadCancelled';
  }
}

async function csrfToken(): Promise<string> {
  return (await api.get<{ token: string }>('/api/auth/csrf')).token;
}

function problemOf(xhr: XMLHttpRequest): Problem {
  let body: Partial<Problem> = {};
  try {
    body = JSON.parse(xhr.responseText) as Partial<Problem>;
  } catch {
    // Not JSON: fall back to the status.
  }
  return {
    type: body.type ?? 'about:blank',
    title: body.title ?? 'Upload failed',
    status: xhr.status,
    detail:
      body.detail ??
      (xhr.status === 413
        ? 'The file is larger than the server accepts.'
        : `The upload failed (${xhr.status || 'no answer from the server'}).`),
    code: body.code ?? `http_${xhr.status}`,
    ...(body.errors ? { errors: body.errors } : {}),
  };
}

/**
 * Send a form with XMLHttpRequest, whose upload events report real progress (fetch
 * cannot). The file streams from the phone's storage; cancel aborts the request and the
 * server removes what it had received.
 */
export function uploadForm<T>(url: string, form: FormData, onProgress: (progress: UploadProgress) => void): UploadHandle<T> {
  let xhr: XMLHttpRequest | null = null;
  let cancelled = false;
  const send = (token: string) =>
    new Promise<{ status: number; body: T; xhr: XMLHttpRequest }>((resolve, reject) => {
      const request = new XMLHttpRequest();
      xhr = request;
      request.open('POST', url);
      request.setRequestHeader('x-csrf-token', token);
      request.setRequestHeader('accept', 'application/json');
      request.upload.onprogress = (event) => {
        if (event.lengthComputable) onProgress({ loaded: event.loaded, total: event.total });
      };
      request.onload = () => resolve({ status: request.status, body: safeJson(request.responseText) as T, xhr: request });
      request.onerror = () =>
        reject(
          new ApiError({
            type: 'about:blank',
            title: 'Network error',
            status: 0,
            detail: 'The connection dropped during the upload. Check the signal and try again.',
            code: 'network_error',
          }),
        );
      request.onabort = () => reject(new UploadCancelled());
      request.send(form);
    });
  const done = (async () => {
    for (let attempt = 0; ; attempt++) {
      if (cancelled) throw new UploadCancelled();
      const result = await send(await csrfToken());
      if (result.status >= 200 && result.status < 300) return result.body;
      const problem = problemOf(result.xhr);
      // The session's token changed under us: fetch it again, once.
      if (attempt === 0 && result.status === 403 && problem.code === 'csrf_invalid') continue;
      throw new ApiError(problem);
    }
  })();
  return {
    done,
    cancel: () => {
      cancelled = true;
      (xhr as XMLHttpRequest | null)?.abort();
    },
  };
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

export function uploadVideo(orderId: string, runId: string, file: Blob, fileName: string, onProgress: (p: UploadProgress) => void) {
  const form = new FormData();
  form.append('runId', runId);
  form.append('video', file, fileName);
  return uploadForm<{ media: MediaView }>(`/api/orders/${encodeURIComponent(orderId)}/media/videos`, form, onProgress);
}

export interface StillDetails {
  origin: 'frame_grab' | 'photo';
  runId: string;
  observationId: string;
  videoTime: number | null;
  footage: number | null;
}

export function uploadStill(
  orderId: string,
  image: Blob,
  fileName: string,
  details: StillDetails,
  onProgress: (p: UploadProgress) => void,
) {
  const form = new FormData();
  form.append('origin', details.origin);
  form.append('runId', details.runId);
  form.append('observationId', details.observationId);
  if (details.videoTime !== null) form.append('videoTime', String(Math.round(details.videoTime * 1000) / 1000));
  if (details.footage !== null) form.append('footage', String(details.footage));
  form.append('image', image, fileName);
  return uploadForm<{ media: MediaView }>(`/api/orders/${encodeURIComponent(orderId)}/media/stills`, form, onProgress);
}

export function saveMarkup(mediaId: string, baseVersion: number, markup: Markup) {
  return api.put<{ media: MediaView }>(`/api/media/${encodeURIComponent(mediaId)}/markup`, { baseVersion, markup }).then((b) => b.media);
}

export function deleteMedia(mediaId: string) {
  return api.delete<void>(`/api/media/${encodeURIComponent(mediaId)}`);
}
