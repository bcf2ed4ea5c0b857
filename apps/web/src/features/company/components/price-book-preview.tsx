import { compareSampleCosts, formatMoney, priceBookSampleDescription, type PriceBook } from '@underfoot/core';
import { useMemo } from 'react';
import { cn } from '@/lib/cn';

function Range({ range }: { range: { lowCents: number; highCents: number } | null }) {
  if (!range) return <span className="text-ink-muted">—</span>;
  return (
    <span className="numeric whitespace-nowrap">
      {formatMoney(range.lowCents)} – {formatMoney(range.highCents)}
    </span>
  );
}

function Change({
  before,
  after,
}: {
  before: { highCents: number; lowCents: number };
  after: { highCents: number; lowCents: number } | null;
}) {
  if (!after) return <span className="text-ink-muted">—</span>;
  const mid = (r: { highCents: number; lowCents: number }) => (r.lowCents + r.highCents) / 2;
  const delta = mid(after) - mid(before);
  if (Math.abs(delta) < 1) return <span className="whitespace-nowrap text-ink-muted">No change</span>;
  const percent = Math.round((delta / mid(before)) * 100);
  return (
    <span className={cn('numeric font-semibold whitespace-nowrap', delta > 0 ? 'text-brand-strong' : 'text-accent-strong')}>
      {delta > 0 ? '▲ up' : '▼ down'} {Math.abs(percent)} %
    </span>
  );
}

/**
 * How the sample inspection's repair options would cost with the saved price
 * book and with the edits on screen, worked out in the browser by the same
 * core code the reports use, before anything is saved.
 */
export function PriceBookPreview({ saved, edited }: { saved: PriceBook; edited: PriceBook | null }) {
  const rows = useMemo(() => compareSampleCosts(saved, edited), [saved, edited]);
  const changed = rows.some((r) => r.after && (r.after.lowCents !== r.before.lowCents || r.after.highCents !== r.before.highCents));

  return (
    <div className="space-y-3" aria-live="polite">
      <p className="text-sm text-ink-muted">{priceBookSampleDescription}</p>
      {!edited ? (
        <p role="status" className="rounded-lg border border-caution/40 bg-caution-soft px-3 py-2 text-sm text-caution">
          Fix the marked fields to see the new ranges.
        </p>
      ) : !changed ? (
        <p role="status" className="text-sm text-ink-muted">
          No change yet: edit a price to see how the ranges move.
        </p>
      ) : null}
      {/* One short block per option: it reads the same in the narrow side column and on a phone. */}
      <ul className="space-y-2" aria-label="Sample cost options">
        {rows.map((row) => (
          <li key={row.kind} data-option={row.kind} className="rounded-lg border border-line bg-white px-3 py-2.5 text-sm">
            <div className="flex items-start justify-between gap-3">
              <p className="font-semibold">
                {row.name}
                {row.proposed ? (
                  <span className="ml-2 rounded bg-brand-soft px-1.5 py-0.5 text-xs font-semibold whitespace-nowrap text-brand-strong">
                    Proposed
                  </span>
                ) : null}
              </p>
              <Change before={row.before} after={row.after} />
            </div>
            <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3">
              <dt className="text-ink-muted">Saved</dt>
              <dd>
                <Range range={row.before} />
              </dd>
              <dt className="text-ink-muted">Edited</dt>
              <dd data-testid={`after-${row.kind}`}>
                <Range range={row.after} />
              </dd>
            </dl>
          </li>
        ))}
      </ul>
      <p className="text-xs text-ink-muted">Estimated ranges from a price book, not quotes; reports show them with their assumptions.</p>
    </div>
  );
}
