import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { useId, useState, type ReactNode } from 'react';
import { Button } from '@/components/button';

export const TABLE_PAGE_SIZE = 10;

export interface DataTableProps<T> {
  /** Names the table for screen readers and the filter box ("Sites", "Instruments"). */
  label: string;
  data: T[];
  // TanStack's column type needs `any` for mixed value types; every column here is display-only.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  columns: ColumnDef<T, any>[];
  /** Shown when the filter matches nothing. */
  noMatches?: ReactNode;
  getRowId?: (row: T) => string;
  initialSorting?: SortingState;
  pageSize?: number;
}

/** A sortable, filterable, paged table (TanStack Table v8) that scrolls sideways on a phone. */
export function DataTable<T>({ label, data, columns, noMatches, getRowId, initialSorting = [], pageSize = TABLE_PAGE_SIZE }: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const [globalFilter, setGlobalFilter] = useState('');
  const filterId = useId();
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setGlobalFilter,
    getRowId,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize, pageIndex: 0 } },
  });
  const rows = table.getRowModel().rows;
  const filteredCount = table.getFilteredRowModel().rows.length;
  const { pageIndex } = table.getState().pagination;
  const pageCount = table.getPageCount();

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-col gap-1 sm:max-w-sm">
        <label htmlFor={filterId} className="font-bold">
          Filter {label.toLowerCase()}
        </label>
        <input
          id={filterId}
          type="search"
          value={globalFilter}
          onChange={(event) => {
            setGlobalFilter(event.target.value);
            table.setPageIndex(0);
          }}
          className="min-h-touch rounded-lg border-2 border-field-border bg-surface px-3 text-lg text-fg"
          placeholder="Type to filter"
        />
      </div>
      {/* relative: screen-reader-only header text is absolutely positioned and would otherwise
          escape the sideways scroll and widen the whole page on a phone. */}
      <div className="relative overflow-x-auto rounded-xl border border-border bg-surface">
        <table className="w-full min-w-[36rem] border-collapse text-left" aria-label={label}>
          <thead className="bg-surface-sunken">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="px-3 py-1 font-bold"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                    >
                      {header.isPlaceholder ? null : canSort ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="inline-flex min-h-touch items-center gap-1 font-bold text-fg hover:underline"
                        >
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} className="border-t border-border" data-testid="table-row">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-middle">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {filteredCount === 0 && <div className="p-4 text-fg-muted">{noMatches ?? `Nothing matches “${globalFilter}”.`}</div>}
      </div>
      {pageCount > 1 && (
        <nav aria-label={`${label} pages`} className="flex flex-wrap items-center gap-3">
          <Button variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
            Previous
          </Button>
          <span role="status">
            Page {pageIndex + 1} of {pageCount}
          </span>
          <Button variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
            Next
          </Button>
        </nav>
      )}
    </div>
  );
}
