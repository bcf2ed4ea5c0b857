import { useQuery } from '@tanstack/react-query';
import { formatMoney } from '@underfoot/core';
import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import { feesQueryOptions, useReorderFees, type FeeListItem } from '../api';
import { CompanyPage, Section } from '../components/company-page';
import { FeeItemForm, feeKindLabels } from '../components/fee-item-form';

function FeeRow({
  item,
  editing,
  onEdit,
  onDone,
  onMove,
  canMoveUp,
  canMoveDown,
  moving,
}: {
  item: FeeListItem;
  editing: boolean;
  onEdit: () => void;
  onDone: () => void;
  onMove: (by: -1 | 1) => void;
  canMoveUp: boolean;
  canMoveDown: boolean;
  moving: boolean;
}) {
  if (editing) {
    return (
      <li className="rounded-card border border-brand/50 bg-sheet p-4 shadow-sheet sm:p-5">
        <FeeItemForm item={item} onDone={onDone} />
      </li>
    );
  }
  return (
    <li className={cn('rounded-card border border-line bg-sheet p-4 shadow-sheet sm:p-5', !item.active && 'bg-sand/50')}>
      <div className="flex flex-col gap-3 sm:flex-row sm:items-start sm:justify-between">
        <div className="min-w-0">
          <p className="flex flex-wrap items-center gap-2">
            <span className="font-semibold break-words">{item.name}</span>
            <span
              className={cn(
                'rounded-full border px-2 py-0.5 text-xs font-semibold',
                item.kind === 'base' ? 'border-brand/40 bg-brand-soft text-brand-strong' : 'border-line-strong bg-sand text-ink-muted',
              )}
            >
              {feeKindLabels[item.kind]}
            </span>
            {!item.active ? (
              <span className="rounded-full border border-line-strong px-2 py-0.5 text-xs font-semibold text-ink-muted">Retired</span>
            ) : null}
          </p>
          {item.description ? <p className="mt-0.5 text-sm text-ink-muted">{item.description}</p> : null}
          <p className="mt-1 text-sm text-ink-muted">
            {item.orderCount === 0
              ? 'Not on any order yet'
              : `On ${item.orderCount} ${item.orderCount === 1 ? 'order' : 'orders'}, at the price of the day each was placed`}
          </p>
        </div>
        <div className="flex shrink-0 items-center gap-3 sm:flex-col sm:items-end">
          <p className="numeric text-xl font-semibold">{formatMoney(item.priceCents)}</p>
          <div className="flex flex-wrap gap-1.5">
            {item.kind === 'add_on' ? (
              <>
                <Button
                  size="sm"
                  variant="quiet"
                  disabled={!canMoveUp || moving}
                  onClick={() => onMove(-1)}
                  aria-label={`Move ${item.name} up`}
                >
                  ↑
                </Button>
                <Button
                  size="sm"
                  variant="quiet"
                  disabled={!canMoveDown || moving}
                  onClick={() => onMove(1)}
                  aria-label={`Move ${item.name} down`}
                >
                  ↓
                </Button>
              </>
            ) : null}
            <Button size="sm" variant="secondary" onClick={onEdit} aria-label={`Edit ${item.name}`}>
              Edit
            </Button>
          </div>
        </div>
      </div>
    </li>
  );
}

export function FeeListRoute() {
  const fees = useQuery(feesQueryOptions());
  const reorder = useReorderFees();
  const [editing, setEditing] = useState<string | 'new' | null>(null);

  const items = fees.data ?? [];
  const addOns = items.filter((f) => f.kind === 'add_on');
  const hasActiveBase = items.some((f) => f.kind === 'base' && f.active);

  const move = (item: FeeListItem, by: -1 | 1) => {
    const order = addOns.map((f) => f.id);
    const from = order.indexOf(item.id);
    const to = from + by;
    if (from < 0 || to < 0 || to >= order.length) return;
    [order[from], order[to]] = [order[to]!, order[from]!];
    reorder.mutate([...items.filter((f) => f.kind === 'base').map((f) => f.id), ...order]);
  };

  return (
    <CompanyPage
      title="Fee list"
      description="The inspection fee and the add-ons people choose when they order."
      actions={
        editing !== 'new' ? (
          <Button onClick={() => setEditing('new')} disabled={fees.isPending}>
            Add a fee
          </Button>
        ) : null
      }
    >
      <div className="space-y-4">
        <Alert tone="info">
          Changes apply to new orders only. An order keeps the fees and prices it was placed with, so nobody is charged differently after
          ordering.
        </Alert>
        {fees.isSuccess && !hasActiveBase ? (
          <Alert tone="caution" title="No inspection fee is offered">
            New orders cannot be placed until an inspection fee is on the list. Add one, or restore a retired one.
          </Alert>
        ) : null}
        {editing === 'new' ? (
          <Section title="New fee">
            <FeeItemForm item={null} onDone={() => setEditing(null)} />
          </Section>
        ) : null}
        {fees.isPending ? (
          <SectionLoading label="Loading the fee list…" />
        ) : fees.isError ? (
          <LoadFailed what="fee list" error={fees.error} onRetry={() => void fees.refetch()} retrying={fees.isFetching} />
        ) : items.length === 0 ? (
          <EmptyState title="No fees yet">
            <p>Add the inspection fee first, then any add-ons such as a second access point or cleaning before filming.</p>
          </EmptyState>
        ) : (
          <ul className="space-y-3" aria-label="Fees">
            {items.map((item) => {
              const index = addOns.findIndex((f) => f.id === item.id);
              return (
                <FeeRow
                  key={item.id}
                  item={item}
                  editing={editing === item.id}
                  onEdit={() => setEditing(item.id)}
                  onDone={() => setEditing(null)}
                  onMove={(by) => move(item, by)}
                  canMoveUp={index > 0}
                  canMoveDown={index >= 0 && index < addOns.length - 1}
                  moving={reorder.isPending}
                />
              );
            })}
          </ul>
        )}
      </div>
    </CompanyPage>
  );
}
