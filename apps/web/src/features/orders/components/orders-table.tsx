import { useQuery } from '@tanstack/react-query';
import { createColumnHelper, rowSortingFeature, tableFeatures, useTable, type SortingState, type Updater } from '@tanstack/react-table';
import { formatMoney, orderKindLabels, orderStatuses, orderStatusLabels, type OrderStatus } from '@underfoot/core';
import { useMemo, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { CardList, DataTableBody, WideTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { FilterInput, FilterSelect } from '@/components/ui/form-fields';
import { ClipboardIcon } from '@/components/ui/icons';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading, Spinner } from '@/components/ui/spinner';
import { paths, type Area } from '@/config/paths';
import { cn } from '@/lib/cn';
import { useDebouncedSearch } from '@/lib/use-debounced-search';
import { pageParam, useListParams } from '@/lib/use-list-params';
import { orderListQueryOptions, type OrderListItem, type OrderSort } from '../api';
import { PaymentBadge, StatusBadge } from './badges';
import { DaysLeft } from './days-left';
import { formatCompactDay, formatDay, formatTimes, orderHref } from './order-format';

export const ORDERS_PAGE_SIZE = 25;
/** A handful of orders reads at a glance; search, filter and sort appear once there are more. */
export const CONTROLS_FROM = 6;

/** The orders a column header sorts by, either way round. */
const columnSortKeys = ['deadline', 'created', 'status', 'address', 'window'] as const satisfies readonly OrderSort[];
const sortKeys: readonly OrderSort[] = ['attention', ...columnSortKeys];
const sortLabels: Record<(typeof columnSortKeys)[number], string> = {
  deadline: 'Deadline',
  created: 'Date ordered',
  status: 'Status',
  address: 'Address',
  window: 'Visit date',
};

// Sorting only: the server sorts, filters and pages (manualSorting below).
const features = tableFeatures({ rowSortingFeature });
const column = createColumnHelper<typeof features, OrderListItem>();

/** The grade, once a report is published; a dash until then. */
export function GradeCell({ grade, href }: { grade: string | null; href?: string }) {
  if (!grade)
    return (
      <span className="text-ink-muted">
        <span aria-hidden="true">—</span>
        <span className="sr-only">Not published yet</span>
      </span>
    );
  // Where the report can be opened from the list, the grade is the way in.
  if (href)
    return (
      <Link to={href} className="font-semibold">
        {grade}
        <span className="sr-only">: read the report</span>
      </Link>
    );
  return <span className="font-semibold">{grade}</span>;
}

/** The report page of an order in this area (the portal reads it; the company reviews it). */
const reportHref = (area: Area, orderId: string) =>
  area === 'office'
    ? paths.reports.office.getHref(orderId)
    : area === 'field'
      ? paths.reports.field.getHref(orderId)
      : paths.reports.portal.getHref(orderId);

function VisitCell({ order }: { order: OrderListItem }) {
  if (!order.window) return <span className="text-ink-muted">{order.status === 'cancelled' ? '—' : 'Not scheduled'}</span>;
  return (
    <span className="numeric block">
      {formatCompactDay(order.window.date)} · {formatTimes(order.window)}
      {order.inspectorName ? <span className="block text-sm text-ink-muted">{order.inspectorName}</span> : null}
    </span>
  );
}

function useColumns(area: Area) {
  return useMemo(
    () =>
      column.columns([
        column.accessor('street', {
          id: 'address',
          header: 'Address',
          cell: ({ row }) => (
            <span className="block min-w-48">
              <Link to={orderHref(area, row.original.id)} className="font-semibold text-ink underline-offset-2 hover:underline">
                {row.original.street}
              </Link>
              <span className="block text-sm text-ink-muted">
                {row.original.city} · <span className="whitespace-nowrap">{orderKindLabels[row.original.kind]}</span>
              </span>
            </span>
          ),
        }),
        column.accessor('status', {
          header: 'Status',
          cell: ({ getValue }) => <StatusBadge status={getValue()} />,
        }),
        column.accessor('contingencyDeadline', {
          id: 'deadline',
          header: 'Deadline',
          cell: ({ row }) => (
            <span className="block">
              <span className="numeric block">{formatCompactDay(row.original.contingencyDeadline)}</span>
              <DaysLeft daysLeft={row.original.daysLeft} status={row.original.status} className="text-sm" />
            </span>
          ),
        }),
        column.accessor((o) => o.window?.date ?? '', {
          id: 'window',
          header: 'Visit',
          cell: ({ row }) => <VisitCell order={row.original} />,
        }),
        column.accessor('paymentState', {
          header: 'Payment',
          enableSorting: false,
          cell: ({ row }) => (
            <span className="flex flex-col items-start gap-0.5">
              <PaymentBadge state={row.original.paymentState} payer={row.original.payer} />
              <span className="numeric text-sm text-ink-muted">{formatMoney(row.original.feeTotalCents)}</span>
            </span>
          ),
        }),
        column.accessor('grade', {
          header: 'Grade',
          enableSorting: false,
          cell: ({ row, getValue }) => <GradeCell grade={getValue()} href={getValue() ? reportHref(area, row.original.id) : undefined} />,
        }),
        column.accessor('createdAt', {
          id: 'created',
          header: 'Ordered',
          cell: ({ getValue }) => <span className="numeric text-ink-muted">{formatCompactDay(getValue().slice(0, 10))}</span>,
        }),
      ]),
    [area],
  );
}

function SortIcon({ direction }: { direction: false | 'asc' | 'desc' }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 12 12" className={cn('size-3', direction ? 'text-ink' : 'text-line-strong')} fill="currentColor">
      {direction !== 'desc' ? <path d="M6 2 9.5 6h-7z" /> : null}
      {direction !== 'asc' ? <path d="M6 10 2.5 6h7z" /> : null}
    </svg>
  );
}

/** The list's state lives in the address, so Back and a shared link show the same list. */
function useOrderListParams(defaultSort: OrderSort, defaultDirection: 'asc' | 'desc') {
  const { params, update } = useListParams();
  const rawSort = params.get('sort');
  const sort: OrderSort = sortKeys.includes(rawSort as OrderSort) ? (rawSort as OrderSort) : defaultSort;
  const rawDir = params.get('dir');
  // "Open first" (attention) has one way round.
  const direction: 'asc' | 'desc' = sort === 'attention' ? 'asc' : rawDir === 'asc' || rawDir === 'desc' ? rawDir : defaultDirection;
  const rawStatus = params.get('status');
  const status = orderStatuses.includes(rawStatus as OrderStatus) ? (rawStatus as OrderStatus) : null;
  const q = params.get('q') ?? '';
  const page = pageParam(params);
  return { sort, direction, status, q, page, update };
}

export interface OrdersTableProps {
  area: Area;
  /** Shown when the person has no orders at all (not when a filter hides them). */
  emptyState: ReactNode;
  defaultSort?: OrderSort;
  defaultDirection?: 'asc' | 'desc';
  /** An accessible name for the table, e.g. "Your orders". */
  label: string;
}

/**
 * Orders as a sortable table on wide screens and a list of cards on phones.
 * Sorting, the status filter and the address search all run on the server.
 */
export function OrdersTable({ area, emptyState, defaultSort = 'attention', defaultDirection = 'asc', label }: OrdersTableProps) {
  const { sort, direction, status, q, page, update } = useOrderListParams(defaultSort, defaultDirection);
  // Debounced: the server is asked once typing pauses.
  const [searchText, setSearchText] = useDebouncedSearch(q, (text) => update({ q: text || null }));

  const query = {
    ...(status ? { statuses: [status] } : {}),
    ...(q ? { q } : {}),
    sort,
    direction,
    limit: ORDERS_PAGE_SIZE,
    offset: page * ORDERS_PAGE_SIZE,
  };
  const list = useQuery(orderListQueryOptions(query));
  const orders = useMemo(() => list.data?.orders ?? [], [list.data]);
  // No column is sorted by "open first": no header shows an arrow then.
  const sorting: SortingState = sort === 'attention' ? [] : [{ id: sort, desc: direction === 'desc' }];

  const table = useTable({
    features,
    columns: useColumns(area),
    data: orders,
    state: { sorting },
    manualSorting: true,
    enableSortingRemoval: false,
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const first = next[0];
      if (first) update({ sort: first.id, dir: first.desc ? 'desc' : 'asc' });
    },
  });

  const filtered = Boolean(status || q);
  const total = list.data?.total ?? 0;
  const pageCount = Math.max(1, Math.ceil(total / ORDERS_PAGE_SIZE));
  const showControls = filtered || searchText !== '' || total >= CONTROLS_FROM;

  const controls = (
    <div className="mb-4 grid gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)] md:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_auto]">
      <FilterInput
        label="Search by address"
        type="search"
        value={searchText}
        placeholder="Street, city or postal code"
        onChange={(e) => setSearchText(e.target.value)}
      />
      <FilterSelect label="Status" value={status ?? ''} onChange={(e) => update({ status: e.target.value || null })}>
        <option value="">All statuses</option>
        {orderStatuses.map((s) => (
          <option key={s} value={s}>
            {orderStatusLabels[s]}
          </option>
        ))}
      </FilterSelect>
      {/* Phones have no column headers to click, and "open first" is no column: the order is chosen here too. */}
      <FilterSelect
        label="Sort by"
        className="sm:col-span-2 md:col-span-1"
        value={`${sort}:${direction}`}
        onChange={(e) => {
          const [nextSort, nextDir] = e.target.value.split(':');
          update({ sort: nextSort ?? null, dir: nextDir === 'desc' ? 'desc' : 'asc' });
        }}
      >
        <option value="attention:asc">Open first, nearest deadline</option>
        {columnSortKeys.map((key) => (
          <option key={`${key}:asc`} value={`${key}:asc`}>
            {sortLabels[key]}
            {key === 'created' ? ', oldest first' : key === 'address' || key === 'status' ? ', A to Z' : ', soonest first'}
          </option>
        ))}
        {columnSortKeys.map((key) => (
          <option key={`${key}:desc`} value={`${key}:desc`}>
            {sortLabels[key]}
            {key === 'created' ? ', newest first' : key === 'address' || key === 'status' ? ', Z to A' : ', latest first'}
          </option>
        ))}
      </FilterSelect>
    </div>
  );

  let body: ReactNode;
  if (list.isPending) {
    body = <SectionLoading label="Loading orders…" />;
  } else if (list.isError && !list.data) {
    body = <LoadFailed what="orders" error={list.error} onRetry={() => void list.refetch()} />;
  } else if (total === 0 && !filtered) {
    return <>{emptyState}</>;
  } else if (orders.length === 0) {
    body = (
      <EmptyState icon={<ClipboardIcon />} title="No orders match">
        <p>Nothing matches {q ? `“${q}”` : 'this filter'}. Check the spelling or show every order.</p>
        <Button
          variant="secondary"
          className="mt-4"
          onClick={() => {
            setSearchText('');
            update({ q: null, status: null });
          }}
        >
          Show all orders
        </Button>
      </EmptyState>
    );
  } else {
    body = (
      <>
        <WideTable caption={label}>
          <thead className="border-b border-line bg-sand/60 text-sm">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className="px-3 py-2.5 font-semibold whitespace-nowrap text-ink-muted first:pl-4"
                    >
                      {canSort ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="inline-flex min-h-8 items-center gap-1.5 rounded hover:text-ink"
                        >
                          <table.FlexRender header={header} />
                          <SortIcon direction={sorted} />
                        </button>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <DataTableBody rows={table.getRowModel().rows} cellClassName="px-3 py-3 first:pl-4" />
        </WideTable>

        <CardList label={label}>
          {orders.map((order) => (
            <li key={order.id}>
              <Link
                to={order.grade && area === 'portal' ? reportHref(area, order.id) : orderHref(area, order.id)}
                className="block rounded-card border border-line bg-sheet p-4 text-ink no-underline shadow-sheet hover:border-line-strong"
              >
                <span className="flex items-start justify-between gap-3">
                  <span className="min-w-0">
                    <span className="block font-semibold break-words">{order.street}</span>
                    <span className="block text-sm text-ink-muted">
                      {order.city} · <span className="whitespace-nowrap">{orderKindLabels[order.kind]}</span>
                    </span>
                  </span>
                  <StatusBadge status={order.status} />
                </span>
                <span className="mt-3 grid grid-cols-2 gap-x-3 gap-y-2 text-sm">
                  <span>
                    <span className="block text-ink-muted">Deadline</span>
                    <span className="numeric block">{formatDay(order.contingencyDeadline)}</span>
                    <DaysLeft daysLeft={order.daysLeft} status={order.status} />
                  </span>
                  <span>
                    <span className="block text-ink-muted">Visit</span>
                    <VisitCell order={order} />
                  </span>
                  <span>
                    <span className="block text-ink-muted">Payment</span>
                    <PaymentBadge state={order.paymentState} payer={order.payer} />
                  </span>
                  <span>
                    <span className="block text-ink-muted">Grade</span>
                    <GradeCell grade={order.grade} />
                  </span>
                </span>
              </Link>
            </li>
          ))}
        </CardList>

        <div className="mt-4 flex flex-wrap items-center justify-between gap-3 text-sm">
          <p className="numeric text-ink-muted" aria-live="polite">
            {list.isFetching ? <Spinner className="mr-2 align-middle" /> : null}
            Showing {page * ORDERS_PAGE_SIZE + 1}–{page * ORDERS_PAGE_SIZE + orders.length} of {total}
          </p>
          {pageCount > 1 ? (
            <div className="flex gap-2">
              <Button
                size="sm"
                variant="secondary"
                disabled={page === 0}
                onClick={() => update({ page: page > 1 ? String(page - 1) : null })}
              >
                Previous
              </Button>
              <Button size="sm" variant="secondary" disabled={page + 1 >= pageCount} onClick={() => update({ page: String(page + 1) })}>
                Next
              </Button>
            </div>
          ) : null}
        </div>
      </>
    );
  }

  return (
    <div>
      {showControls ? controls : null}
      {body}
    </div>
  );
}
