/**
 * The review table: every reading of a survey in one sortable table, drawn a screenful at a time
 * (TanStack Virtual), so 100,000 rows scroll as smoothly as 100. Rows have a fixed height and the
 * columns fixed widths; only the rows in view (plus a few) are in the DOM, each placed by a transform
 * in a box as tall as every row together. It is an ARIA table (role="table", "row", "columnheader",
 * "cell") of positioned boxes, not a <table>: a table lays out all its rows again whenever one changes.
 *
 * Sorting and selection are kept here, over plain arrays, rather than in a table library's row model:
 * that model gives every row some forty closures of its own and caches its cells for good, which for
 * 100,000 rows is hundreds of megabytes that the garbage collector walks — whole frames lost while
 * scrolling. Sorting compares precomputed keys (numbers, or lower-cased text), never a regular
 * expression per comparison. A row is a memoised component, so a small scroll step draws only the rows
 * that came into view.
 *
 * Row boxes are recycled: the table always draws the same number of rows (the most the screen has
 * shown, plus the overscan: `steadyRange`), and a row's React key is its place in that ring of boxes
 * (row index modulo the count), not its reading. A row scrolled out hands its box — its DOM nodes and
 * React fibers — to the row scrolled in, which only changes texts and attributes; a long step (a whole
 * screen at once) reuses every box, and no box is made or thrown away while scrolling. Keyed by
 * reading, every row in a long scroll step was built anew and the old one thrown away: a screenful of
 * new nodes per frame, and the garbage collector's pauses on top. A box that holds the keyboard focus
 * when it is handed over gives the focus to the scrolling area, so a ticked box never comes to stand
 * for another reading.
 */
import { useVirtualizer, type Range } from '@tanstack/react-virtual';
import { memo, useCallback, useLayoutEffect, useMemo, useRef, useState, type Dispatch, type ReactNode, type RefObject, type SetStateAction } from 'react';
import type { ReviewReading } from '@shared/schemas/review';
import { syncText, valueText, VERDICT_LABELS, type FieldUnit } from '../lib/review-rows';

/** Row height, px: one line of text at the 48 px touch size plus padding. */
export const REVIEW_ROW_HEIGHT_PX = 56;

/** Which readings are ticked, by reading id (a missing id is not ticked). */
export type ReviewSelection = Record<string, boolean>;

function classTone(index: number | undefined, count: number): string {
  if (index === undefined) return '';
  if (index < 0) return 'border-ok';
  return index >= count - 1 ? 'border-danger' : 'border-warning';
}

const verdictTone = { accepted: 'text-ok', remeasure: 'text-warning', rejected: 'text-danger' } as const;

// One formatter for every cell: toLocaleString with options builds a new Intl.DateTimeFormat per call,
// which was most of a frame's work while scrolling.
const TIME_FORMAT = new Intl.DateTimeFormat(undefined, { dateStyle: 'short', timeStyle: 'short' });
// Formatting is still the dearest part of a row (each row shows its time twice): keep the latest texts.
const WHEN_CACHE = new Map<string, string>();
function when(iso: string) {
  let text = WHEN_CACHE.get(iso);
  if (text === undefined) {
    if (WHEN_CACHE.size >= 2_000) WHEN_CACHE.clear();
    text = TIME_FORMAT.format(new Date(iso));
    WHEN_CACHE.set(iso, text);
  }
  return text;
}

/**
 * The rows to draw: the visible ones and the overscan, widened to a steady count (`ring.size`, the most
 * ever drawn) wherever the list is long enough, so the ring of boxes keeps all its members (see the
 * module comment). The count only grows, when the screen shows more rows than before.
 */
function steadyRange(range: Range, ring: { size: number }): number[] {
  const natural = range.endIndex - range.startIndex + 1 + 2 * range.overscan;
  ring.size = Math.max(ring.size, natural);
  const size = Math.min(ring.size, range.count);
  let start = Math.max(range.startIndex - range.overscan, 0);
  start = Math.min(start, range.count - size);
  return Array.from({ length: size }, (_, i) => start + i);
}

type ColumnId = 'select' | 'station' | 'room' | 'surveyor' | 'instrument' | 'time' | 'value' | 'class' | 'sync' | 'decision' | 'notes';
type SortKey = (r: ReviewReading) => string | number;

interface Column {
  id: ColumnId;
  header: string;
  widthPx: number;
  /** What the column sorts by (text is compared lower-cased); none: not sortable. */
  sortKey?: SortKey;
  text?: boolean;
}

const COLUMNS: readonly Column[] = [
  { id: 'select', header: '', widthPx: 56 },
  { id: 'station', header: 'Station', widthPx: 150, sortKey: (r) => r.stationLabel ?? '', text: true },
  { id: 'room', header: 'Room', widthPx: 140, sortKey: (r) => r.roomName ?? '', text: true },
  { id: 'surveyor', header: 'Surveyor', widthPx: 140, sortKey: (r) => r.surveyorName, text: true },
  { id: 'instrument', header: 'Instrument', widthPx: 190, sortKey: (r) => r.instrumentLabel ?? '', text: true },
  // ISO-8601 UTC times sort as text in time order.
  { id: 'time', header: 'Time', widthPx: 140, sortKey: (r) => r.measuredAt },
  { id: 'value', header: 'Value', widthPx: 200, sortKey: (r) => r.fieldT ?? -1 },
  { id: 'class', header: 'Class', widthPx: 200, sortKey: (r) => r.safetyClass?.index ?? -2 },
  { id: 'sync', header: 'Sync', widthPx: 130, sortKey: (r) => (r.conflicted ? 2 : 0) + (r.attachmentPending ? 1 : 0) },
  { id: 'decision', header: 'Decision', widthPx: 200, sortKey: (r) => r.decision?.verdict ?? '' },
  { id: 'notes', header: 'Notes', widthPx: 240, sortKey: (r) => r.notes ?? '', text: true },
];
const TABLE_WIDTH_PX = COLUMNS.reduce((sum, c) => sum + c.widthPx, 0);

export interface ReviewSort {
  id: ColumnId;
  desc: boolean;
}

/** The rows in the order of `sort`; rows with equal keys keep their order (Array.prototype.sort is stable). */
export function sortReviewRows(rows: readonly ReviewReading[], sort: ReviewSort): ReviewReading[] {
  const column = COLUMNS.find((c) => c.id === sort.id);
  if (!column?.sortKey) return [...rows];
  const key = column.sortKey;
  const keys = rows.map((r) => {
    const k = key(r);
    return column.text && typeof k === 'string' ? k.toLowerCase() : k;
  });
  const order = rows.map((_, i) => i);
  const sign = sort.desc ? -1 : 1;
  order.sort((a, b) => {
    const ka = keys[a]!;
    const kb = keys[b]!;
    return ka < kb ? -sign : ka > kb ? sign : 0;
  });
  return order.map((i) => rows[i]!);
}

export interface ReviewTableProps {
  rows: ReviewReading[];
  unit: FieldUnit;
  /** Thresholds of the zone set (for the class colour). */
  classCount: number;
  selection: ReviewSelection;
  onSelectionChange: Dispatch<SetStateAction<ReviewSelection>>;
  /** Height of the scrolling area (CSS length). */
  height?: string;
  /** Rows are not selectable (a signed-off survey). */
  readOnly?: boolean;
}

export function ReviewTable({ rows, unit, classCount, selection, onSelectionChange, height = '70vh', readOnly = false }: ReviewTableProps) {
  const [sort, setSort] = useState<ReviewSort>({ id: 'time', desc: false });
  const sorted = useMemo(() => sortReviewRows(rows, sort), [rows, sort]);
  const selectedShown = useMemo(() => rows.reduce((n, r) => n + (selection[r.id] ? 1 : 0), 0), [rows, selection]);
  const allSelected = rows.length > 0 && selectedShown === rows.length;
  const someSelected = selectedShown > 0 && !allSelected;

  const toggleRow = useCallback(
    (id: string) =>
      onSelectionChange((prev) => {
        const next = { ...prev };
        if (next[id]) delete next[id];
        else next[id] = true;
        return next;
      }),
    [onSelectionChange],
  );
  const toggleAll = () => onSelectionChange(allSelected ? {} : Object.fromEntries(rows.map((r) => [r.id, true])));
  const toggleSort = (id: ColumnId) => setSort((prev) => (prev.id === id ? { id, desc: !prev.desc } : { id, desc: false }));

  const scrollRef = useRef<HTMLDivElement>(null);
  const ring = useRef({ size: 0 }).current;
  const virtualizer = useVirtualizer({
    count: sorted.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => REVIEW_ROW_HEIGHT_PX,
    overscan: 3,
    rangeExtractor: useCallback((range: Range) => steadyRange(range, ring), [ring]),
  });
  const items = virtualizer.getVirtualItems();

  return (
    // contain: strict keeps each scroll step's layout and paint inside the table's own box (its height is fixed).
    // tabIndex -1: the focus can be handed to it (a recycled row's, see the module comment), Tab skips it.
    <div ref={scrollRef} tabIndex={-1} className="relative overflow-auto rounded-xl border border-border bg-surface" style={{ height, contain: 'strict' }} data-testid="review-table-scroll">
      {/* ARIA table roles on positioned boxes: each row is laid out alone, which a <table> cannot do. */}
      <div role="table" className="text-left" style={{ width: TABLE_WIDTH_PX }} aria-label="Readings of the survey" aria-rowcount={sorted.length + 1} data-testid="review-table">
        <div role="rowgroup" className="sticky top-0 z-10 bg-surface-sunken">
          <div role="row" aria-rowindex={1} className="flex">
            {COLUMNS.map((column) => {
              if (column.id === 'select') {
                return (
                  <div key={column.id} role="columnheader" className="flex shrink-0 items-center px-2 py-1 font-bold" style={{ width: column.widthPx }}>
                    <input
                      type="checkbox"
                      aria-label="Select every reading shown"
                      className="h-6 w-6"
                      disabled={readOnly}
                      checked={allSelected}
                      ref={(el) => {
                        if (el) el.indeterminate = someSelected;
                      }}
                      onChange={toggleAll}
                      data-testid="select-all"
                    />
                  </div>
                );
              }
              const direction = sort.id === column.id ? (sort.desc ? 'descending' : 'ascending') : undefined;
              return (
                <div key={column.id} role="columnheader" className="flex shrink-0 items-center px-2 py-1 font-bold" style={{ width: column.widthPx }} aria-sort={direction}>
                  <button type="button" onClick={() => toggleSort(column.id)} className="inline-flex min-h-touch items-center gap-1 font-bold text-fg hover:underline">
                    {column.id === 'value' ? `Value (${unit})` : column.header}
                    <span aria-hidden="true">{direction === 'ascending' ? '▲' : direction === 'descending' ? '▼' : '↕'}</span>
                  </button>
                </div>
              );
            })}
          </div>
        </div>
        <div role="rowgroup" className="relative" style={{ height: virtualizer.getTotalSize() }}>
          {items.map((item) => {
            const reading = sorted[item.index]!;
            return (
              <ReviewRow
                key={item.index % items.length}
                reading={reading}
                rowIndex={item.index}
                top={item.start}
                selected={selection[reading.id] === true}
                onToggle={toggleRow}
                unit={unit}
                classCount={classCount}
                readOnly={readOnly}
                focusHome={scrollRef}
              />
            );
          })}
        </div>
      </div>
      {sorted.length === 0 && <p className="p-4 text-fg-muted">No reading matches the filter: change or clear the filters to see the rest.</p>}
    </div>
  );
}

interface CellInput {
  r: ReviewReading;
  selected: boolean;
  onToggle: (id: string) => void;
  unit: FieldUnit;
  classCount: number;
  readOnly: boolean;
}

const muted = (text: string) => <span className="text-fg-muted">{text}</span>;

/** What each column shows for one reading. */
const CELLS: Record<ColumnId, (input: CellInput) => ReactNode> = {
  select: ({ r, selected, onToggle, readOnly }) => (
    <input
      type="checkbox"
      aria-label={`Select the ${r.kind === 'sweep' ? 'sweep' : 'reading'} at station ${r.stationLabel ?? r.stationId.slice(0, 8)}, ${when(r.measuredAt)}`}
      className="h-6 w-6"
      disabled={readOnly}
      checked={selected}
      onChange={() => onToggle(r.id)}
      data-testid="select-row"
    />
  ),
  station: ({ r }) => (
    <span>
      <span className="font-bold">{r.stationLabel ?? r.stationId.slice(0, 8)}</span>
      <span className="block truncate text-sm text-fg-muted">{r.levelName}</span>
    </span>
  ),
  room: ({ r }) => (r.roomName ? <span className="block truncate">{r.roomName}</span> : muted('—')),
  surveyor: ({ r }) => <span className="block truncate">{r.surveyorName}</span>,
  instrument: ({ r }) => (
    <span>
      <span className="block truncate">{r.instrumentLabel ?? muted('not recorded')}</span>
      {r.calibrationOverdue && (
        <span className="text-sm font-bold text-danger" data-testid="calibration-overdue">
          Calibration overdue (due {r.calibrationDueOn})
        </span>
      )}
    </span>
  ),
  time: ({ r }) => when(r.measuredAt),
  value: ({ r, unit }) => <span className="tabular-nums">{valueText(r, unit)}</span>,
  class: ({ r, classCount }) =>
    r.safetyClass ? (
      <span className={`block truncate border-l-4 pl-2 ${classTone(r.safetyClass.index, classCount)}`} title={r.safetyClass.label}>
        {r.safetyClass.label}
      </span>
    ) : (
      muted('—')
    ),
  sync: ({ r }) => <span className={r.conflicted || r.attachmentPending ? 'font-bold text-warning' : 'text-fg-muted'}>{syncText(r)}</span>,
  decision: ({ r }) => {
    const d = r.decision;
    if (!d) return muted('Undecided');
    return (
      <span title={d.note ?? undefined}>
        <span className={`font-bold ${verdictTone[d.verdict]}`}>{VERDICT_LABELS[d.verdict]}</span>
        {d.note && <span className="block truncate text-sm text-fg-muted">{d.note}</span>}
      </span>
    );
  },
  notes: ({ r }) => (
    <span className="block truncate" title={r.notes ?? ''}>
      {r.notes ?? ''}
    </span>
  ),
};

interface ReviewRowProps extends CellInput {
  reading: ReviewReading;
  rowIndex: number;
  /** Offset from the top of the rows, px. */
  top: number;
  /** Where the focus goes when this box is handed to another reading while it holds it. */
  focusHome: RefObject<HTMLDivElement | null>;
}

const ReviewRow = memo(function ReviewRow({ reading: r, rowIndex, top, focusHome, ...rest }: Omit<ReviewRowProps, 'r'>) {
  const input: CellInput = { r, ...rest };
  const rowRef = useRef<HTMLDivElement>(null);
  const shownId = useRef(r.id);
  // The box now shows another reading: if the focus was in it, it must not stay on a control of this one.
  useLayoutEffect(() => {
    if (shownId.current === r.id) return;
    shownId.current = r.id;
    if (rowRef.current?.contains(document.activeElement)) focusHome.current?.focus({ preventScroll: true });
  }, [r.id, focusHome]);
  return (
    <div
      ref={rowRef}
      role="row"
      aria-rowindex={rowIndex + 2}
      aria-selected={rest.readOnly ? undefined : rest.selected}
      className={`absolute left-0 flex border-t border-border ${rest.selected ? 'bg-accent-soft' : ''}`}
      style={{ height: REVIEW_ROW_HEIGHT_PX, width: TABLE_WIDTH_PX, transform: `translateY(${top}px)`, contain: 'strict' }}
      data-testid="review-row"
      data-reading-id={r.id}
      data-station-label={r.stationLabel ?? ''}
      data-level-name={r.levelName}
      data-verdict={r.decision?.verdict ?? 'undecided'}
    >
      {COLUMNS.map((c) => (
        <div key={c.id} role="cell" className="flex shrink-0 items-center overflow-hidden px-2 whitespace-nowrap" style={{ width: c.widthPx, height: REVIEW_ROW_HEIGHT_PX, contain: 'strict' }}>
          <div className="min-w-0">{CELLS[c.id](input)}</div>
        </div>
      ))}
    </div>
  );
});
