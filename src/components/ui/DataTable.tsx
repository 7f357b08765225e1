// A table drawn from its columns: a caption for assistive technology, one header per column and,
// below 640 px, one card per row with each value under its column's name (global.css `.stack`).
import type { ReactNode, ThHTMLAttributes } from 'react';

/** The classes of a column of figures: right-aligned, digits of one width. */
export const FIGURES = 'text-right tabular-nums';

export interface TableColumn<T> {
  key: string;
  label: string;
  render: (row: T) => ReactNode;
  /** Classes of the column's header and cells (`FIGURES` for numbers). */
  className?: string;
}

export interface DataTableProps<T, C extends TableColumn<T> = TableColumn<T>> {
  rows: readonly T[];
  columns: readonly C[];
  rowKey: (row: T) => string;
  caption?: string;
  /** Shown in one row when there are no rows; without it the body stays empty. */
  empty?: ReactNode;
  rowClassName?: (row: T) => string | undefined;
  /** Classes added to the table's own. */
  className?: string;
  testId?: string;
  rowTestId?: (row: T) => string;
  /** What a header shows (default: the label) and its own attributes (`aria-sort`). */
  header?: (column: C) => ReactNode;
  headerProps?: (column: C) => ThHTMLAttributes<HTMLTableCellElement>;
}

export function DataTable<T, C extends TableColumn<T> = TableColumn<T>>({
  rows,
  columns,
  rowKey,
  caption,
  empty,
  rowClassName,
  className,
  testId,
  rowTestId,
  header,
  headerProps,
}: DataTableProps<T, C>) {
  return (
    <div className="overflow-x-auto">
      <table className={className ? `data-table stack ${className}` : 'data-table stack'} data-testid={testId}>
        {caption && <caption className="sr-only">{caption}</caption>}
        <thead>
          <tr>
            {columns.map((c) => (
              <th key={c.key} scope="col" className={c.className} {...headerProps?.(c)}>
                {header ? header(c) : c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.length === 0 && empty !== undefined ? (
            <tr>
              <td colSpan={columns.length} className="py-6 text-center text-ink-500">
                {empty}
              </td>
            </tr>
          ) : (
            rows.map((row) => (
              <tr key={rowKey(row)} className={rowClassName?.(row)} data-testid={rowTestId?.(row)}>
                {columns.map((c) => (
                  <td key={c.key} className={c.className} data-label={c.label}>
                    {c.render(row)}
                  </td>
                ))}
              </tr>
            ))
          )}
        </tbody>
      </table>
    </div>
  );
}
