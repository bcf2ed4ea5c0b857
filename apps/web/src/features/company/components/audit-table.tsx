import { useQuery } from '@tanstack/react-query';
import {
  createColumnHelper,
  rowPaginationFeature,
  tableFeatures,
  useTable,
  type PaginationState,
  type Updater,
} from '@tanstack/react-table';
import { AUDIT_PAGE_SIZES, type AuditQueryInput } from '@underfoot/core';
import { useId, useMemo, type ReactNode } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { CardList, DataTableBody, WideTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { compactSelectClasses, FilterInput, FilterSelect } from '@/components/ui/form-fields';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading, Spinner } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import { useDebouncedSearch } from '@/lib/use-debounced-search';
import { pageParam, useListParams } from '@/lib/use-list-params';
import { auditExportHref, auditFiltersQueryOptions, auditQueryOptions, type AuditEntry } from '../api';

// Pagination only: the server filters and pages (manualPagination below).
const features = tableFeatures({ rowPaginationFeature });
const column = createColumnHelper<typeof features, AuditEntry>();
const columns = column.columns([
  column.accessor('at', {
    header: 'When',
    cell: ({ getValue }) => <span className="numeric whitespace-nowrap">{formatDateTime(getValue())}</span>,
  }),
  column.accessor((e) => e.actor?.name ?? '', {
    id: 'actor',
    header: 'Who',
    cell: ({ row }) =>
      row.original.actor ? (
        <span className="block min-w-36">
          <span className="block font-medium">{row.original.actor.name}</span>
          <span className="block text-xs break-all text-ink-muted">{row.original.actor.email}</span>
        </span>
      ) : (
        <span className="text-ink-muted">Underfoot</span>
      ),
  }),
  column.accessor('actionLabel', {
    header: 'What',
    cell: ({ row }) => (
      <span className="block min-w-40">
        <span className="block font-medium">{row.original.actionLabel}</span>
        <span className="block font-mono text-xs text-ink-muted">{row.original.action}</span>
      </span>
    ),
  }),
  column.accessor((e) => e.subject?.label ?? '', {
    id: 'subject',
    header: 'Subject',
    cell: ({ row }) =>
      row.original.subject ? <span className="break-words">{row.original.subject.label}</span> : <span className="text-ink-muted">—</span>,
  }),
  column.accessor('detailText', {
    header: 'Details',
    cell: ({ getValue }) => <span className="block max-w-80 text-sm break-words text-ink-muted">{getValue() || '—'}</span>,
  }),
]);

/** The day a date input holds, as the instant its local midnight starts (or ends, for the "to" day). */
function dayToInstant(day: string, end: boolean): string | undefined {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(day)) return undefined;
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  const local = end ? new Date(y, m - 1, d, 23, 59, 59, 999) : new Date(y, m - 1, d, 0, 0, 0, 0);
  return local.toISOString();
}

/** Filters live in the address, so Back and a shared link show the same trail. */
function useAuditParams() {
  const { params, update } = useListParams();
  const pageSizeParam = Number(params.get('size'));
  const pageSize = (AUDIT_PAGE_SIZES as readonly number[]).includes(pageSizeParam) ? pageSizeParam : 50;
  const state = {
    action: params.get('action') ?? '',
    actorId: params.get('actor') ?? '',
    fromDay: params.get('from') ?? '',
    toDay: params.get('to') ?? '',
    q: params.get('q') ?? '',
    page: pageParam(params),
    pageSize,
  };
  return { ...state, update };
}

export function AuditTable() {
  const { action, actorId, fromDay, toDay, q, page, pageSize, update } = useAuditParams();
  const [searchText, setSearchText] = useDebouncedSearch(q, (text) => update({ q: text || null }));
  const sizeId = useId();

  const filter: Omit<AuditQueryInput, 'page' | 'pageSize'> = {
    ...(action ? { action } : {}),
    ...(actorId ? { actorId } : {}),
    ...(fromDay ? { from: dayToInstant(fromDay, false) } : {}),
    ...(toDay ? { to: dayToInstant(toDay, true) } : {}),
    ...(q ? { q } : {}),
  };
  const query: AuditQueryInput = { ...filter, page, pageSize };
  const list = useQuery({ ...auditQueryOptions(query), meta: { errorToast: false } });
  const filters = useQuery(auditFiltersQueryOptions());
  const entries = useMemo(() => list.data?.entries ?? [], [list.data]);
  const pagination: PaginationState = { pageIndex: page, pageSize };

  const table = useTable({
    features,
    columns,
    data: entries,
    state: { pagination },
    manualPagination: true,
    rowCount: list.data?.total ?? 0,
    onPaginationChange: (updater: Updater<PaginationState>) => {
      const next = typeof updater === 'function' ? updater(pagination) : updater;
      if (next.pageSize !== pageSize) update({ size: String(next.pageSize), page: null });
      else update({ page: next.pageIndex ? String(next.pageIndex) : null });
    },
  });

  const filtered = Boolean(action || actorId || fromDay || toDay || q);
  const total = list.data?.total ?? 0;
  const first = total === 0 ? 0 : page * pageSize + 1;
  const last = Math.min(total, (page + 1) * pageSize);
  const badRange = fromDay && toDay && fromDay > toDay;

  const controls = (
    <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[minmax(0,1.6fr)_minmax(0,1fr)_minmax(0,1fr)_auto_auto]">
      <FilterInput
        label="Search"
        className="sm:col-span-2 lg:col-span-1"
        type="search"
        value={searchText}
        onChange={(e) => setSearchText(e.target.value)}
        placeholder="Name, e-mail, address, action…"
      />
      <FilterSelect label="Action" value={action} onChange={(e) => update({ action: e.target.value || null })}>
        <option value="">All actions</option>
        {(filters.data?.actions ?? []).map((a) => (
          <option key={a.code} value={a.code}>
            {a.label}
          </option>
        ))}
      </FilterSelect>
      <FilterSelect label="Person" value={actorId} onChange={(e) => update({ actor: e.target.value || null })}>
        <option value="">Everyone</option>
        {(filters.data?.actors ?? []).map((a) => (
          <option key={a.id} value={a.id}>
            {a.name}
          </option>
        ))}
      </FilterSelect>
      <FilterInput
        label="From"
        type="date"
        value={fromDay}
        max={toDay || undefined}
        onChange={(e) => update({ from: e.target.value || null })}
      />
      <FilterInput
        label="To"
        type="date"
        value={toDay}
        min={fromDay || undefined}
        onChange={(e) => update({ to: e.target.value || null })}
      />
    </div>
  );

  let body: ReactNode;
  if (badRange) {
    body = <Alert tone="caution">The “to” day is before the “from” day. Change one of them to see entries.</Alert>;
  } else if (list.isPending) {
    body = <SectionLoading label="Loading the audit trail…" />;
  } else if (list.isError && !list.data) {
    body = <LoadFailed what="audit trail" error={list.error} onRetry={() => void list.refetch()} />;
  } else if (entries.length === 0) {
    body = (
      <EmptyState title={filtered ? 'Nothing matches these filters' : 'Nothing recorded yet'}>
        <p>
          {filtered
            ? 'Widen the dates or clear a filter.'
            : 'Sign-ins, role changes, publishing, sharing and downloads will be listed here.'}
        </p>
        {filtered ? (
          <Button
            variant="secondary"
            className="mt-4"
            onClick={() => {
              setSearchText('');
              update({ action: null, actor: null, from: null, to: null, q: null });
            }}
          >
            Clear the filters
          </Button>
        ) : null}
      </EmptyState>
    );
  } else {
    body = (
      <div className={cn(list.isPlaceholderData && 'opacity-70')}>
        <WideTable caption="Audit trail, newest first" className="text-sm">
          <thead className="border-b border-line bg-sand/60 text-ink-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <th key={header.id} scope="col" className="px-3 py-2.5 font-semibold whitespace-nowrap first:pl-4">
                    <table.FlexRender header={header} />
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <DataTableBody rows={table.getRowModel().rows} cellClassName="px-3 py-2.5 first:pl-4" />
        </WideTable>
        {/* Phones get one card per entry, from the same rows. */}
        <CardList label="Audit trail, newest first" spacing="space-y-2">
          {table.getRowModel().rows.map(({ original: e }) => (
            <li key={e.id} className="rounded-card border border-line bg-sheet p-3.5 text-sm shadow-sheet">
              <p className="font-semibold">{e.actionLabel}</p>
              <p className="text-ink-muted">
                {e.actor?.name ?? 'Underfoot'}
                {e.subject ? ` · ${e.subject.label}` : ''}
              </p>
              {e.detailText ? <p className="mt-1 break-words text-ink-muted">{e.detailText}</p> : null}
              <p className="numeric mt-1 text-xs text-ink-muted">{formatDateTime(e.at)}</p>
            </li>
          ))}
        </CardList>
      </div>
    );
  }

  return (
    <div className="space-y-4">
      {controls}
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="numeric text-sm text-ink-muted" aria-live="polite">
          {list.isFetching ? <Spinner className="mr-2 align-middle" /> : null}
          {total === 0
            ? 'No entries'
            : total === 1
              ? '1 entry'
              : `${first.toLocaleString()}–${last.toLocaleString()} of ${total.toLocaleString()} entries, newest first`}
        </p>
        <a href={auditExportHref(filter)} download className={buttonClasses('secondary', 'sm')}>
          Export as CSV
        </a>
      </div>
      {body}
      {total > 0 ? (
        <nav aria-label="Audit trail pages" className="flex flex-wrap items-center justify-between gap-3">
          <div className="flex items-center gap-2 text-sm">
            <label htmlFor={sizeId} className="font-semibold whitespace-nowrap">
              Rows per page
            </label>
            <select
              id={sizeId}
              value={pageSize}
              onChange={(e) => table.setPageSize(Number(e.target.value))}
              className={compactSelectClasses}
            >
              {AUDIT_PAGE_SIZES.map((size) => (
                <option key={size} value={size}>
                  {size}
                </option>
              ))}
            </select>
          </div>
          <div className="flex items-center gap-2">
            <Button size="sm" variant="secondary" disabled={!table.getCanPreviousPage()} onClick={() => table.previousPage()}>
              Newer
            </Button>
            <span className="numeric text-sm text-ink-muted">
              Page {page + 1} of {Math.max(1, table.getPageCount())}
            </span>
            <Button size="sm" variant="secondary" disabled={!table.getCanNextPage()} onClick={() => table.nextPage()}>
              Older
            </Button>
          </div>
        </nav>
      ) : null}
    </div>
  );
}
