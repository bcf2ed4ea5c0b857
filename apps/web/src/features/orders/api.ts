import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  ArrivalWindow,
  OrderCreateInput,
  OrderKind,
  OrderStatus,
  PartyRole,
  Payer,
  PaymentState,
  PropertyType,
  ScheduleInput,
  Side,
} from '@underfoot/core';
import { api } from '@/lib/api-client';

/** What the API answers; the shapes follow apps/server/src/modules/orders/orders.service.ts. */

export interface FeeListItem {
  id: string;
  kind: 'base' | 'add_on';
  name: string;
  description: string;
  priceCents: number;
  active: boolean;
}

export interface OrderListItem {
  id: string;
  kind: OrderKind;
  status: OrderStatus;
  address: string;
  street: string;
  city: string;
  contingencyDeadline: string;
  /** Whole days from the company's today to the deadline; negative once it has passed. */
  daysLeft: number;
  paymentState: PaymentState;
  payer: Payer;
  feeTotalCents: number;
  inspectorName: string | null;
  window: ArrivalWindow | null;
  createdAt: string;
  /** The published report's grade; null until a report is published. */
  grade: string | null;
}

/** `attention`: open orders first, nearest deadline first, then closed ones, latest first. The others sort by one column. */
export type OrderSort = 'attention' | 'deadline' | 'created' | 'status' | 'address' | 'window';

export interface OrderListQuery {
  statuses?: readonly OrderStatus[];
  q?: string;
  sort?: OrderSort;
  direction?: 'asc' | 'desc';
  limit?: number;
  offset?: number;
}

export interface OrderListPage {
  total: number;
  orders: OrderListItem[];
}

export interface OrderHistoryEvent {
  id: number;
  type: string;
  detail: Record<string, unknown>;
  at: string;
  actorName: string | null;
}

export interface OrderParty {
  userId: string;
  name: string;
  partyRole: PartyRole;
  /** False until the person has accepted their invitation. */
  active: boolean;
  /** Only for the office, and for the person themselves. */
  email?: string;
}

export interface OrderDetail {
  id: string;
  kind: OrderKind;
  orderingSide: Side;
  status: OrderStatus;
  contingencyDeadline: string;
  daysLeft: number;
  preferredDates: string[];
  payer: Payer;
  feeTotalCents: number;
  paymentState: PaymentState;
  property: {
    street: string;
    unit: string;
    city: string;
    region: string;
    postalCode: string;
    address: string;
    yearBuilt: number;
    propertyType: PropertyType;
    occupancy: 'occupied' | 'vacant';
    accessNotes: string;
  };
  inspector: { id: string; name: string } | null;
  window: ArrivalWindow | null;
  note: string;
  cancelReason: string | null;
  createdAt: string;
  feeLines: { name: string; priceCents: number }[];
  parties: OrderParty[];
  history: OrderHistoryEvent[];
  payment: { status: string; amountCents: number; updatedAt: string } | null;
  yourPartyRoles: PartyRole[];
  /** The published report, when this person may read it. */
  report?: { revision: number; grade: string; releaseHeld: boolean } | null;
  allowed: { schedule: boolean; cancel: boolean; pay: boolean; recordInspection: boolean; finishRecording: boolean };
}

export interface Inspector {
  id: string;
  name: string;
}

export interface FieldDay {
  date: string;
  jobs: OrderListItem[];
}

export const orderKeys = {
  all: ['orders'] as const,
  lists: () => [...orderKeys.all, 'list'] as const,
  list: (query: OrderListQuery) => [...orderKeys.lists(), query] as const,
  detail: (id: string) => [...orderKeys.all, 'detail', id] as const,
  fieldDay: (date: string) => [...orderKeys.all, 'field-day', date] as const,
  feeList: () => ['fee-list'] as const,
  inspectors: () => ['inspectors'] as const,
};

function listSearch(query: OrderListQuery): string {
  const params = new URLSearchParams();
  for (const status of query.statuses ?? []) params.append('status', status);
  if (query.q) params.set('q', query.q);
  if (query.sort) params.set('sort', query.sort);
  if (query.direction) params.set('direction', query.direction);
  if (query.limit !== undefined) params.set('limit', String(query.limit));
  if (query.offset) params.set('offset', String(query.offset));
  const search = params.toString();
  return search ? `?${search}` : '';
}

export function orderListQueryOptions(query: OrderListQuery) {
  return queryOptions({
    queryKey: orderKeys.list(query),
    queryFn: ({ signal }) => api.get<OrderListPage>(`/api/orders${listSearch(query)}`, { signal }),
    // Typing in the search box keeps the last rows on screen instead of flashing a spinner.
    placeholderData: keepPreviousData,
    staleTime: 10_000,
    // Each list shows its own error with a retry button.
    meta: { errorToast: false },
  });
}

export function orderQueryOptions(id: string) {
  return queryOptions({
    queryKey: orderKeys.detail(id),
    queryFn: ({ signal }) => api.get<{ order: OrderDetail }>(`/api/orders/${encodeURIComponent(id)}`, { signal }).then((b) => b.order),
    staleTime: 10_000,
    meta: { errorToast: false },
  });
}

export function feeListQueryOptions() {
  return queryOptions({
    queryKey: orderKeys.feeList(),
    queryFn: ({ signal }) => api.get<{ items: FeeListItem[] }>('/api/fee-list', { signal }).then((b) => b.items),
    staleTime: 5 * 60_000,
    meta: { errorToast: false },
  });
}

export function inspectorsQueryOptions() {
  return queryOptions({
    queryKey: orderKeys.inspectors(),
    queryFn: ({ signal }) => api.get<{ inspectors: Inspector[] }>('/api/inspectors', { signal }).then((b) => b.inspectors),
    staleTime: 5 * 60_000,
    meta: { errorToast: false },
  });
}

export function fieldDayQueryOptions(date: string) {
  return queryOptions({
    queryKey: orderKeys.fieldDay(date),
    queryFn: ({ signal }) => api.get<FieldDay>(`/api/field/jobs?date=${encodeURIComponent(date)}`, { signal }),
    meta: { errorToast: false },
  });
}

export type OrderCreateRequest = OrderCreateInput & { confirmDuplicate?: true };

/** Forms show their own errors (fields and an alert), so mutations stay out of the toast. */
const formMeta = { errorToast: false } as const;

export function useCreateOrder() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: OrderCreateRequest) => api.post<{ order: OrderDetail }>('/api/orders', input).then((b) => b.order),
    meta: formMeta,
    onSuccess: (order) => {
      queryClient.setQueryData(orderKeys.detail(order.id), order);
      void queryClient.invalidateQueries({ queryKey: orderKeys.lists() });
    },
  });
}

/** After a change the answer is the fresh order: store it, and let every list ask again. */
function useOrderChange<TInput>(send: (input: TInput) => Promise<OrderDetail>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: send,
    meta: formMeta,
    onSuccess: (order) => {
      queryClient.setQueryData(orderKeys.detail(order.id), order);
      void queryClient.invalidateQueries({ queryKey: orderKeys.lists() });
      void queryClient.invalidateQueries({ queryKey: [...orderKeys.all, 'field-day'] });
    },
  });
}

export function useScheduleOrder(orderId: string) {
  return useOrderChange((input: ScheduleInput) =>
    api.post<{ order: OrderDetail }>(`/api/orders/${encodeURIComponent(orderId)}/schedule`, input).then((b) => b.order),
  );
}

export function useCancelOrder(orderId: string) {
  return useOrderChange((input: { reason: string }) =>
    api.post<{ order: OrderDetail }>(`/api/orders/${encodeURIComponent(orderId)}/cancel`, input).then((b) => b.order),
  );
}

/** The camera work is done: scheduled → recorded, ready for the office's review. */
export function useFinishRecording(orderId: string) {
  return useOrderChange(() => api.post<{ order: OrderDetail }>(`/api/orders/${encodeURIComponent(orderId)}/recorded`).then((b) => b.order));
}

/** Opens (or reopens) the payment provider's hosted checkout; the page then leaves for its address. */
export function useStartCheckout() {
  return useMutation({
    mutationFn: (orderId: string) => api.post<{ url: string }>(`/api/orders/${encodeURIComponent(orderId)}/checkout`).then((b) => b.url),
    meta: formMeta,
  });
}
