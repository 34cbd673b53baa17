import { createColumnHelper } from '@tanstack/react-table';
import type { WatchBand } from '@shared/schemas/watch-band';
import { SEVERITIES } from '@shared/schemas/vocabulary';
import { formatFrequency } from '@shared/units';
import { Button } from '@/components/button';
import { ConfirmButton } from '@/components/confirm-button';
import { DataTable } from '@/components/data-table';
import { isRecalled } from './labels';
import { SeverityChip } from './severity-chip';

const column = createColumnHelper<WatchBand>();
const severityRank = (s: WatchBand['severity']) => SEVERITIES.indexOf(s);

export function WatchBandsTable({
  bands,
  onEdit,
  onDelete,
  deleting,
}: {
  bands: WatchBand[];
  onEdit?: (band: WatchBand) => void;
  onDelete?: (band: WatchBand) => void;
  deleting?: string | null;
}) {
  const columns = [
    column.accessor('name', {
      header: 'Band',
      cell: (info) => (
        <span className="flex min-w-[14rem] flex-col gap-1">
          <span className="font-bold">{info.getValue()}</span>
          <span className="text-sm">{info.row.original.reason}</span>
          <span className="text-sm text-fg-muted">{info.row.original.siteName ? `Site: ${info.row.original.siteName}` : 'Whole organisation'}</span>
        </span>
      ),
    }),
    column.accessor('lowerHz', {
      header: 'Edges',
      cell: (info) => (
        <span className="flex flex-col gap-1">
          <span className="whitespace-nowrap">
            {formatFrequency(info.row.original.lowerHz)} – {formatFrequency(info.row.original.upperHz)}
          </span>
          {info.row.original.thresholdDbWPerM2Hz !== null && <span className="whitespace-nowrap text-sm">Threshold {info.row.original.thresholdDbWPerM2Hz} dB(W/(m²·Hz))</span>}
        </span>
      ),
    }),
    column.accessor((b) => severityRank(b.severity), { id: 'severity', header: 'Severity', cell: (info) => <SeverityChip severity={info.row.original.severity} /> }),
    column.accessor('source', {
      header: 'Source of the edges',
      cell: (info) => (
        <span className="flex min-w-[16rem] flex-col gap-1">
          <span className="text-sm">{info.getValue()}</span>
          {isRecalled(info.getValue()) && (
            <span className="w-fit rounded-full bg-warning-soft px-3 py-1 text-sm font-bold text-warning" data-testid="recalled-badge">
              Recalled: check against the source
            </span>
          )}
        </span>
      ),
    }),
    ...(onEdit || onDelete
      ? [
          column.display({
            id: 'actions',
            header: () => <span className="sr-only">Actions</span>,
            cell: (info) => {
              const band = info.row.original;
              return (
                <span className="flex gap-2">
                  {onEdit && (
                    <Button variant="secondary" onClick={() => onEdit(band)} aria-label={`Edit ${band.name}`}>
                      Edit
                    </Button>
                  )}
                  {onDelete && (
                    <ConfirmButton
                      title={`Stop watching ${band.name}?`}
                      body="Predicted lines will no longer be checked against this band. The change is kept in the audit log."
                      confirmLabel="Stop watching"
                      busy={deleting === band.id}
                      onConfirm={() => onDelete(band)}
                    >
                      Remove
                    </ConfirmButton>
                  )}
                </span>
              );
            },
          }),
        ]
      : []),
  ];
  return (
    <DataTable
      label="Watch bands"
      data={bands}
      columns={columns}
      getRowId={(b) => b.id}
      initialSorting={[{ id: 'lowerHz', desc: false }]}
      pageSize={25}
      noMatches="No band matches the filter."
    />
  );
}
