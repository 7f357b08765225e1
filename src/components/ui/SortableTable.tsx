import { useMemo, useState, type ReactNode } from 'react';
import { DataTable, type TableColumn } from './DataTable';

export interface Column<T> extends TableColumn<T> {
  /** Value used for sorting; columns without it are not sortable. */
  sortValue?: (row: T) => string | number | null;
}

interface Props<T> {
  rows: T[];
  columns: Column<T>[];
  rowKey: (row: T) => string;
  initialSort?: { key: string; dir: 'asc' | 'desc' };
  empty?: ReactNode;
  caption?: string;
  rowClassName?: (row: T) => string | undefined;
}

/** A table whose headers sort by click or keyboard; below 640 px each row is a card (global.css `.stack`). */
export function SortableTable<T>({ rows, columns, rowKey, initialSort, empty, caption, rowClassName }: Props<T>) {
  const [sort, setSort] = useState(initialSort ?? null);
  const sorted = useMemo(() => {
    const col = columns.find((c) => c.key === sort?.key);
    if (!sort || !col?.sortValue) return rows;
    const dir = sort.dir === 'asc' ? 1 : -1;
    return [...rows].sort((a, b) => {
      const va = col.sortValue!(a);
      const vb = col.sortValue!(b);
      if (va === vb) return 0;
      if (va === null) return 1;
      if (vb === null) return -1;
      return (typeof va === 'number' && typeof vb === 'number' ? va - vb : String(va).localeCompare(String(vb))) * dir;
    });
  }, [rows, columns, sort]);

  const toggle = (key: string) => setSort((s) => (s?.key === key ? { key, dir: s.dir === 'asc' ? 'desc' : 'asc' } : { key, dir: 'asc' }));

  return (
    <DataTable
      rows={sorted}
      columns={columns}
      rowKey={rowKey}
      caption={caption}
      empty={empty ?? 'Nothing to show'}
      rowClassName={rowClassName}
      headerProps={(c) => ({ 'aria-sort': sort?.key === c.key ? (sort.dir === 'asc' ? 'ascending' : 'descending') : undefined })}
      header={(c) =>
        c.sortValue ? (
          <button type="button" className="inline-flex items-center gap-1 font-semibold" onClick={() => toggle(c.key)}>
            {c.label}
            <span aria-hidden="true" className="text-ink-400">
              {sort?.key === c.key ? (sort.dir === 'asc' ? '▲' : '▼') : '↕'}
            </span>
          </button>
        ) : (
          c.label
        )
      }
    />
  );
}
