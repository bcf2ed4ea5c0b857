import { FlexRender, type Row, type RowData, type TableFeatures } from '@tanstack/react-table';
import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

/**
 * The wide-screen half of a list: a table on a card that scrolls sideways if it
 * must. Phones get a `CardList` of the same rows instead. `className` goes on the <table>.
 */
export function WideTable({ caption, className, children }: { caption: string; className?: string; children: ReactNode }) {
  return (
    <div className="hidden overflow-x-auto rounded-card border border-line bg-sheet shadow-sheet md:block">
      <table className={cn('w-full border-collapse text-left', className)}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

/** The phone half of a list: one card per row, named like the table it stands in for. */
export function CardList({ label, spacing = 'space-y-3', children }: { label: string; spacing?: string; children: ReactNode }) {
  return (
    <ul className={`${spacing} md:hidden`} aria-label={label}>
      {children}
    </ul>
  );
}

/** The body of a TanStack table: one row per record, each cell as its column renders it. */
export function DataTableBody<TFeatures extends TableFeatures, TData extends RowData>({
  rows,
  cellClassName,
}: {
  rows: Row<TFeatures, TData>[];
  cellClassName: string;
}) {
  return (
    <tbody>
      {rows.map((row) => (
        <tr key={row.id} className="border-b border-line align-top last:border-b-0 hover:bg-paper">
          {row.getAllCells().map((cell) => (
            <td key={cell.id} className={cellClassName}>
              <FlexRender cell={cell} />
            </td>
          ))}
        </tr>
      ))}
    </tbody>
  );
}
