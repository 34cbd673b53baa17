import { createColumnHelper } from '@tanstack/react-table';
import type { Instrument } from '@shared/schemas/instrument';
import { Button } from '@/components/button';
import { CalibrationBadge } from './calibration-badge';
import { DataTable } from '@/components/data-table';
import { INSTRUMENT_KIND_LABELS } from './labels';

const column = createColumnHelper<Instrument>();

export function InstrumentsTable({ instruments, onEdit }: { instruments: Instrument[]; onEdit?: (instrument: Instrument) => void }) {
  const columns = [
    // Model and due date first: on a phone the table scrolls sideways, and an overdue mark must show without scrolling.
    column.accessor('model', { header: 'Model', cell: (info) => <span className="font-bold">{info.getValue()}</span> }),
    column.accessor((i) => i.calibrationDueOn ?? '', {
      id: 'due',
      header: 'Calibration due',
      cell: (info) => (
        <span className="flex flex-wrap items-center gap-2">
          {info.getValue() || '—'} <CalibrationBadge instrument={info.row.original} />
        </span>
      ),
    }),
    column.accessor('serial', { header: 'Serial' }),
    column.accessor((i) => INSTRUMENT_KIND_LABELS[i.kind], { id: 'kind', header: 'Kind' }),
    column.accessor((i) => (i.relativeUncertainty === null ? '' : `${(i.relativeUncertainty * 100).toPrecision(2)} %`), { id: 'uncertainty', header: 'Uncertainty' }),
    column.accessor((i) => (i.kind !== 'antenna' ? '' : i.antennaFactors ? `${i.antennaFactors.points} points, ${i.antennaFactors.minFrequencyMHz}–${i.antennaFactors.maxFrequencyMHz} MHz` : 'None yet'), {
      id: 'factors',
      header: 'Antenna factors',
    }),
    ...(onEdit
      ? [
          column.display({
            id: 'actions',
            header: () => <span className="sr-only">Actions</span>,
            cell: (info) => (
              <Button variant="secondary" onClick={() => onEdit(info.row.original)} aria-label={`Edit ${info.row.original.model} ${info.row.original.serial}`}>
                Edit
              </Button>
            ),
          }),
        ]
      : []),
  ];
  return <DataTable label="Instruments" data={instruments} columns={columns} getRowId={(i) => i.id} initialSorting={[{ id: 'due', desc: false }]} />;
}
