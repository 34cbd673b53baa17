/**
 * The review table: every reading of a survey in one sortable table (TanStack Table), drawn a screenful
 * at a time (TanStack Virtual), so 100,000 rows scroll as smoothly as 100. Rows have a fixed height and
 * the columns fixed widths; only the rows in view (plus a few) are in the DOM, between two spacer rows.
 * Every column names its sorting function: TanStack's automatic choice for text is its alphanumeric
 * sort, which splits both strings with a regular expression on every comparison — seconds at 100,000 rows.
 */
import { flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type ColumnDef, type RowSelectionState, type SortingState } from '@tanstack/react-table';
import { useVirtualizer } from '@tanstack/react-virtual';
import { useMemo, useRef, useState, type Dispatch, type SetStateAction } from 'react';
import type { ReviewReading } from '@shared/schemas/review';
import { syncText, valueText, VERDICT_LABELS, type FieldUnit } from '../lib/review-rows';

/** Row height, px: one line of text at the 48 px touch size plus padding. */
export const REVIEW_ROW_HEIGHT_PX = 56;

function classTone(index: number | undefined, count: number): string {
  if (index === undefined) return '';
  if (index < 0) return 'border-ok';
  return index >= count - 1 ? 'border-danger' : 'border-warning';
}

const verdictTone = { accepted: 'text-ok', remeasure: 'text-warning', rejected: 'text-danger' } as const;

// One formatter for every cell: toLocaleString with options builds a new Intl.DateTimeFormat per call,
// which was most of a frame's work while scrolling.
const TIME_FORMAT = new Intl.DateTimeFormat(undefined, { dateStyle: 'short', timeStyle: 'short' });
function when(iso: string) {
  return TIME_FORMAT.format(new Date(iso));
}

export interface ReviewTableProps {
  rows: ReviewReading[];
  unit: FieldUnit;
  /** Thresholds of the zone set (for the class colour). */
  classCount: number;
  selection: RowSelectionState;
  onSelectionChange: Dispatch<SetStateAction<RowSelectionState>>;
  /** Height of the scrolling area (CSS length). */
  height?: string;
  /** Rows are not selectable (a signed-off survey). */
  readOnly?: boolean;
}

export function ReviewTable({ rows, unit, classCount, selection, onSelectionChange, height = '70vh', readOnly = false }: ReviewTableProps) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'time', desc: false }]);
  const columns = useMemo<ColumnDef<ReviewReading>[]>(
    () => [
      {
        id: 'select',
        size: 56,
        enableSorting: false,
        header: ({ table }) => (
          <input
            type="checkbox"
            aria-label="Select every reading shown"
            className="h-6 w-6"
            disabled={readOnly}
            checked={table.getIsAllRowsSelected()}
            ref={(el) => {
              if (el) el.indeterminate = table.getIsSomeRowsSelected();
            }}
            onChange={table.getToggleAllRowsSelectedHandler()}
            data-testid="select-all"
          />
        ),
        cell: ({ row }) => (
          <input
            type="checkbox"
            aria-label={`Select the ${row.original.kind === 'sweep' ? 'sweep' : 'reading'} at station ${row.original.stationLabel ?? row.original.stationId.slice(0, 8)}, ${when(row.original.measuredAt)}`}
            className="h-6 w-6"
            disabled={readOnly}
            checked={row.getIsSelected()}
            onChange={row.getToggleSelectedHandler()}
            data-testid="select-row"
          />
        ),
      },
      {
        id: 'station',
        header: 'Station',
        size: 150,
        accessorFn: (r) => r.stationLabel ?? '',
        sortingFn: 'text',
        cell: ({ row }) => (
          <span>
            <span className="font-bold">{row.original.stationLabel ?? row.original.stationId.slice(0, 8)}</span>
            <span className="block truncate text-sm text-fg-muted">{row.original.levelName}</span>
          </span>
        ),
      },
      { id: 'room', header: 'Room', size: 140, accessorFn: (r) => r.roomName ?? '', sortingFn: 'text', cell: ({ getValue }) => (getValue<string>() || <span className="text-fg-muted">—</span>) },
      { id: 'surveyor', header: 'Surveyor', size: 140, accessorFn: (r) => r.surveyorName, sortingFn: 'text' },
      {
        id: 'instrument',
        header: 'Instrument',
        size: 190,
        accessorFn: (r) => r.instrumentLabel ?? '',
        sortingFn: 'text',
        cell: ({ row }) => (
          <span>
            <span className="block truncate">{row.original.instrumentLabel ?? <span className="text-fg-muted">not recorded</span>}</span>
            {row.original.calibrationOverdue && (
              <span className="text-sm font-bold text-danger" data-testid="calibration-overdue">
                Calibration overdue (due {row.original.calibrationDueOn})
              </span>
            )}
          </span>
        ),
      },
      { id: 'time', header: 'Time', size: 140, accessorFn: (r) => r.measuredAt, sortingFn: 'basic', cell: ({ getValue }) => when(getValue<string>()) },
      {
        id: 'value',
        header: `Value (${unit})`,
        size: 200,
        accessorFn: (r) => r.fieldT ?? -1,
        sortingFn: 'basic',
        cell: ({ row }) => <span className="tabular-nums">{valueText(row.original, unit)}</span>,
      },
      {
        id: 'class',
        header: 'Class',
        size: 200,
        accessorFn: (r) => r.safetyClass?.index ?? -2,
        sortingFn: 'basic',
        cell: ({ row }) =>
          row.original.safetyClass ? (
            <span className={`block truncate border-l-4 pl-2 ${classTone(row.original.safetyClass.index, classCount)}`} title={row.original.safetyClass.label}>
              {row.original.safetyClass.label}
            </span>
          ) : (
            <span className="text-fg-muted">—</span>
          ),
      },
      {
        id: 'sync',
        header: 'Sync',
        size: 130,
        accessorFn: (r) => (r.conflicted ? 2 : 0) + (r.attachmentPending ? 1 : 0),
        sortingFn: 'basic',
        cell: ({ row }) => <span className={row.original.conflicted || row.original.attachmentPending ? 'font-bold text-warning' : 'text-fg-muted'}>{syncText(row.original)}</span>,
      },
      {
        id: 'decision',
        header: 'Decision',
        size: 200,
        accessorFn: (r) => r.decision?.verdict ?? '',
        sortingFn: 'basic',
        cell: ({ row }) => {
          const d = row.original.decision;
          if (!d) return <span className="text-fg-muted">Undecided</span>;
          return (
            <span title={d.note ?? undefined}>
              <span className={`font-bold ${verdictTone[d.verdict]}`}>{VERDICT_LABELS[d.verdict]}</span>
              {d.note && <span className="block truncate text-sm text-fg-muted">{d.note}</span>}
            </span>
          );
        },
      },
      { id: 'notes', header: 'Notes', size: 240, accessorFn: (r) => r.notes ?? '', sortingFn: 'text', cell: ({ getValue }) => <span className="block truncate" title={getValue<string>()}>{getValue<string>()}</span> },
    ],
    [unit, classCount, readOnly],
  );

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, rowSelection: selection },
    getRowId: (r) => r.id,
    enableRowSelection: !readOnly,
    onSortingChange: setSorting,
    onRowSelectionChange: onSelectionChange,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const tableRows = table.getRowModel().rows;
  const scrollRef = useRef<HTMLDivElement>(null);
  const virtualizer = useVirtualizer({
    count: tableRows.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => REVIEW_ROW_HEIGHT_PX,
    overscan: 6,
  });
  const items = virtualizer.getVirtualItems();
  const before = items[0]?.start ?? 0;
  const after = virtualizer.getTotalSize() - (items.at(-1)?.end ?? 0);
  const width = table.getTotalSize();

  return (
    <div ref={scrollRef} className="relative overflow-auto rounded-xl border border-border bg-surface" style={{ height }} data-testid="review-table-scroll">
      <table className="border-collapse text-left" style={{ width, tableLayout: 'fixed' }} aria-label="Readings of the survey" aria-rowcount={tableRows.length + 1} data-testid="review-table">
        <colgroup>
          {table.getVisibleLeafColumns().map((c) => (
            <col key={c.id} style={{ width: c.getSize() }} />
          ))}
        </colgroup>
        <thead className="sticky top-0 z-10 bg-surface-sunken">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th key={header.id} scope="col" className="px-2 py-1 font-bold" aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}>
                    {header.column.getCanSort() ? (
                      <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex min-h-touch items-center gap-1 font-bold text-fg hover:underline">
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
          {before > 0 && (
            <tr aria-hidden="true">
              <td style={{ height: before, padding: 0 }} colSpan={columns.length} />
            </tr>
          )}
          {items.map((item) => {
            const row = tableRows[item.index]!;
            return (
              <tr
                key={row.id}
                aria-rowindex={item.index + 2}
                className={`border-t border-border ${row.getIsSelected() ? 'bg-accent-soft' : ''}`}
                style={{ height: REVIEW_ROW_HEIGHT_PX }}
                data-testid="review-row"
                data-reading-id={row.original.id}
                data-station-label={row.original.stationLabel ?? ''}
                data-level-name={row.original.levelName}
                data-verdict={row.original.decision?.verdict ?? 'undecided'}
              >
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="overflow-hidden px-2 align-middle whitespace-nowrap">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            );
          })}
          {after > 0 && (
            <tr aria-hidden="true">
              <td style={{ height: after, padding: 0 }} colSpan={columns.length} />
            </tr>
          )}
        </tbody>
      </table>
      {tableRows.length === 0 && <p className="p-4 text-fg-muted">No reading matches the filter: change or clear the filters to see the rest.</p>}
    </div>
  );
}
