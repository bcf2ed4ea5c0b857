import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  Analysis,
  GradeInfo,
  GradeLevel,
  GradeOverride,
  Inspection,
  OrderKind,
  OrderStatus,
  PartyRole,
  Payer,
  PaymentState,
  PriceBook,
  RevisionComparison,
  Side,
} from '@underfoot/core';
import { revisionFromQuery } from '@underfoot/core';
import { api } from '@/lib/api-client';

/** Shapes the API answers with (apps/server/src/modules/reports/reports.service.ts). */

export interface SnapshotMedia {
  id: string;
  kind: 'video' | 'still';
  observationId: string | null;
  runId: string | null;
  /** The still with its markup burned in, when it has markup. */
  renderedId: string | null;
  hasThumbnail: boolean;
  videoTime: number | null;
  footage: number | null;
}

export interface ReportSnapshot {
  orderId: string;
  kind: OrderKind;
  orderingSide: Side;
  property: { address: string; yearBuilt: number; propertyType: string };
  company: { name: string; licenceNumber: string | null; phone: string | null; email: string | null; footer: string | null };
  inspector: { name: string } | null;
  inspectedOn: string | null;
  inspection: Inspection;
  analysis: Analysis;
  media: SnapshotMedia[];
}

export type RevisionKind = 'original' | 'amendment' | 'reinspection';

export interface RevisionView {
  number: number;
  kind: RevisionKind;
  note: string;
  publishedAt: string;
  gradeInfo: GradeInfo;
  snapshot: ReportSnapshot;
  costsHidden: boolean;
}

export interface RevisionListItem {
  number: number;
  kind: RevisionKind;
  note: string;
  grade: GradeLevel;
  publishedAt: string;
  publishedBy: string | null;
}

export interface ReportAllowed {
  disclose: boolean;
  withdraw: boolean;
  share: boolean;
  disclosureLink: boolean;
  viewLog: boolean;
  ask: boolean;
  answer: boolean;
}

export interface ReportRead {
  orderId: string;
  status: OrderStatus;
  releaseHeld: boolean;
  releasedTo: Side[];
  readerSide: Side | null;
  revisions: RevisionListItem[];
  revision: RevisionView;
  changes: RevisionComparison | null;
  allowed: ReportAllowed;
}

export interface SharedRead {
  orderId: string;
  purpose: 'guest' | 'disclosure';
  expiresAt: string | null;
  /** The side the report speaks to as "you": the buyer on a listing's disclosure link, else null. */
  readerSide: Side | null;
  revision: RevisionView;
  changes: RevisionComparison | null;
}

export interface ShareLink {
  id: string;
  purpose: 'guest' | 'disclosure';
  label: string;
  showCosts: boolean;
  expiresAt: string | null;
  revokedAt: string | null;
  createdAt: string;
  createdBy: string | null;
  active: boolean;
  views: number;
}

export interface ReportViewEntry {
  at: string;
  what: 'report' | 'pdf';
  revision: number;
  who: string;
  role: string;
  partyRole: PartyRole | null;
}

export interface Message {
  id: string;
  body: string;
  at: string;
  author: { name: string; role: string | null; partyRole: PartyRole | null };
}
export interface Question extends Message {
  answers: Message[];
}

export interface ReviewPage {
  order: { id: string; kind: OrderKind; status: OrderStatus; address: string; paymentState: PaymentState; payer: Payer };
  inspectionVersion: number;
  requirePaymentBeforeRelease: boolean;
  inspectorsMayPublish: boolean;
  releaseHeld: boolean;
  releasedTo: Side[];
  revisions: RevisionListItem[];
  allowed: { publish: boolean; reopen: boolean; override: boolean };
}

export interface InspectionForReview {
  inspection: { document: Inspection; version: number; updatedAt: string | null; updatedBy: { id: string; name: string } | null };
  order: { status: OrderStatus; address: string; inspectorName: string | null };
}

const enc = encodeURIComponent;

/** Where a file of the report comes from: the signed-in media routes, or the guest's link. */
export type MediaSource = (mediaId: string, variant: 'file' | 'thumbnail') => string;
export const signedInMedia: MediaSource = (id, variant) => `/api/media/${enc(id)}/${variant}`;
export const sharedMedia =
  (token: string): MediaSource =>
  (id, variant) =>
    `/api/shared/${enc(token)}/media/${enc(id)}/${variant}`;

export const reportKeys = {
  all: ['reports'] as const,
  report: (orderId: string, revision: number | null) => ['reports', 'read', orderId, revision] as const,
  shared: (token: string) => ['reports', 'shared', token] as const,
  links: (orderId: string) => ['reports', 'links', orderId] as const,
  views: (orderId: string) => ['reports', 'views', orderId] as const,
  questions: (orderId: string) => ['reports', 'questions', orderId] as const,
  review: (orderId: string) => ['reports', 'review', orderId] as const,
  inspection: (orderId: string) => ['reports', 'inspection', orderId] as const,
  priceBook: ['reports', 'price-book'] as const,
};

// Every read is logged as a view: fetch once per visit, not on every focus.
const readOnce = { staleTime: Infinity, refetchOnWindowFocus: false, meta: { errorToast: false } } as const;

/** ?revision=N on a report page: a published revision number, or null for the latest. */
export function revisionParam(search: URLSearchParams): number | null {
  return revisionFromQuery(search.get('revision'));
}

export function reportQueryOptions(orderId: string, revision: number | null) {
  return queryOptions({
    queryKey: reportKeys.report(orderId, revision),
    queryFn: ({ signal }) => api.get<ReportRead>(`/api/reports/${enc(orderId)}${revision ? `?revision=${revision}` : ''}`, { signal }),
    ...readOnce,
  });
}

export function sharedReportQueryOptions(token: string) {
  return queryOptions({
    queryKey: reportKeys.shared(token),
    queryFn: ({ signal }) => api.get<SharedRead>(`/api/shared/${enc(token)}`, { signal }),
    ...readOnce,
  });
}

export function shareLinksQueryOptions(orderId: string) {
  return queryOptions({
    queryKey: reportKeys.links(orderId),
    queryFn: ({ signal }) => api.get<{ links: ShareLink[] }>(`/api/reports/${enc(orderId)}/share-links`, { signal }).then((b) => b.links),
    meta: { errorToast: false },
  });
}

export function viewsQueryOptions(orderId: string) {
  return queryOptions({
    queryKey: reportKeys.views(orderId),
    queryFn: ({ signal }) => api.get<{ views: ReportViewEntry[] }>(`/api/reports/${enc(orderId)}/views`, { signal }).then((b) => b.views),
    meta: { errorToast: false },
  });
}

export function questionsQueryOptions(orderId: string) {
  return queryOptions({
    queryKey: reportKeys.questions(orderId),
    queryFn: ({ signal }) =>
      api.get<{ questions: Question[] }>(`/api/reports/${enc(orderId)}/questions`, { signal }).then((b) => b.questions),
    meta: { errorToast: false },
  });
}

export function reviewQueryOptions(orderId: string) {
  return queryOptions({
    queryKey: reportKeys.review(orderId),
    queryFn: ({ signal }) => api.get<ReviewPage>(`/api/orders/${enc(orderId)}/review`, { signal }),
    meta: { errorToast: false },
  });
}

export function inspectionForReviewQueryOptions(orderId: string) {
  return queryOptions({
    queryKey: reportKeys.inspection(orderId),
    queryFn: ({ signal }) => api.get<InspectionForReview>(`/api/orders/${enc(orderId)}/inspection`, { signal }),
    meta: { errorToast: false },
  });
}

export function priceBookQueryOptions() {
  return queryOptions({
    queryKey: reportKeys.priceBook,
    queryFn: ({ signal }) => api.get<{ priceBook: PriceBook; isDefault: boolean }>('/api/company/price-book', { signal }),
    staleTime: 60_000,
    meta: { errorToast: false },
  });
}

export const pdfHref = (orderId: string, revision: number | null) =>
  `/api/reports/${enc(orderId)}/pdf${revision ? `?revision=${revision}` : ''}`;
export const sharedPdfHref = (token: string) => `/api/shared/${enc(token)}/pdf`;

// ---------- changes ----------

function useInvalidateReport(orderId: string) {
  const queryClient = useQueryClient();
  return () =>
    Promise.all([
      queryClient.invalidateQueries({ queryKey: ['reports', 'read', orderId] }),
      queryClient.invalidateQueries({ queryKey: reportKeys.review(orderId) }),
      queryClient.invalidateQueries({ queryKey: reportKeys.inspection(orderId) }),
      queryClient.invalidateQueries({ queryKey: ['orders'] }),
    ]);
}

export function useDisclosure(orderId: string) {
  const invalidate = useInvalidateReport(orderId);
  return useMutation({
    mutationFn: (disclose: boolean) =>
      api.post<{ releasedTo: Side[] }>(`/api/reports/${enc(orderId)}/${disclose ? 'disclose' : 'withdraw-disclosure'}`),
    onSuccess: invalidate,
  });
}

export interface NewShareLink {
  purpose: 'guest' | 'disclosure';
  label: string;
  expiresInDays: number | null;
  showCosts: boolean;
}

export function useCreateShareLink(orderId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: NewShareLink) =>
      api.post<{ id: string; url: string; expiresAt: string | null }>(`/api/reports/${enc(orderId)}/share-links`, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: reportKeys.links(orderId) }),
    meta: { errorToast: false },
  });
}

export function useRevokeShareLink(orderId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (linkId: string) => api.post<void>(`/api/reports/${enc(orderId)}/share-links/${enc(linkId)}/revoke`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: reportKeys.links(orderId) }),
  });
}

export function useAsk(orderId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: string) => api.post<{ id: string }>(`/api/reports/${enc(orderId)}/questions`, { body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: reportKeys.questions(orderId) }),
    meta: { errorToast: false },
  });
}

export function useAnswer(orderId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ questionId, body }: { questionId: string; body: string }) =>
      api.post<{ id: string }>(`/api/reports/${enc(orderId)}/questions/${enc(questionId)}/answers`, { body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: reportKeys.questions(orderId) }),
    meta: { errorToast: false },
  });
}

export function usePublish(orderId: string) {
  const invalidate = useInvalidateReport(orderId);
  return useMutation({
    mutationFn: (input: { note: string; kind?: 'amendment' | 'reinspection'; inspectionVersion: number }) =>
      api.post<{ revision: number; grade: GradeLevel; releaseHeld: boolean }>(`/api/orders/${enc(orderId)}/publish`, input),
    onSuccess: invalidate,
    meta: { errorToast: false },
  });
}

export function useReopen(orderId: string) {
  const invalidate = useInvalidateReport(orderId);
  return useMutation({
    mutationFn: () => api.post<void>(`/api/orders/${enc(orderId)}/reopen`),
    onSuccess: invalidate,
  });
}

export function useGradeOverride(orderId: string) {
  const invalidate = useInvalidateReport(orderId);
  return useMutation({
    mutationFn: (input: { baseVersion: number; override: GradeOverride | null }) =>
      api.post<{ version: number }>(`/api/orders/${enc(orderId)}/grade-override`, input),
    onSuccess: invalidate,
    meta: { errorToast: false },
  });
}
