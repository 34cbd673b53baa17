import { memo } from 'react';
import type { DecisionRow } from '@/db';
import { Button } from '@/components/button';
import { formatFluxDensity } from '@shared/units';
import type { FieldUnit } from '../lib/reading-form';

export type StationTarget =
  | { kind: 'existing'; stationId: string; label: string; roomName: string | null; latestFieldT: number | null }
  | { kind: 'new'; xM: number; yM: number; roomName: string | null };

export interface StationPanelProps {
  target: StationTarget | null;
  unit: FieldUnit;
  remeasure: readonly DecisionRow[];
  onClear: () => void;
}

/** Which station the form will save to: the one picked, or the new one placed by the last tap. */
export const StationPanel = memo(function StationPanel({ target, unit, remeasure, onClear }: StationPanelProps) {
  if (!target) {
    return (
      <div className="rounded-lg border-2 border-dashed border-field-border p-3" data-testid="station-panel">
        <p className="font-bold">No station chosen</p>
        <p className="text-fg-muted">Tap the plan to place a new station, or tap a dot to take another reading there.</p>
      </div>
    );
  }
  return (
    <div className="flex flex-wrap items-center gap-3 rounded-lg border-2 border-ring bg-surface p-3" data-testid="station-panel">
      <div className="min-w-0 flex-1">
        {target.kind === 'new' ? (
          <>
            <p className="font-bold">New station{target.roomName ? ` in ${target.roomName}` : ' (outside every room)'}</p>
            <p className="text-sm text-fg-muted">
              x {target.xM.toFixed(2)} m, y {target.yM.toFixed(2)} m · saved with the first reading
            </p>
          </>
        ) : (
          <>
            <p className="font-bold">
              {target.label}
              {target.roomName ? ` · ${target.roomName}` : ''}
            </p>
            <p className="text-sm text-fg-muted">Latest |B|: {target.latestFieldT === null ? 'no reading yet' : formatFluxDensity(target.latestFieldT, { unit })}</p>
          </>
        )}
        {remeasure.map((d) => (
          <p key={d.id} className="mt-1 rounded bg-offline-soft px-2 py-1 text-sm font-bold text-offline" data-testid="remeasure-request">
            ↻ Re-measure requested{d.note ? `: ${d.note}` : ''}
          </p>
        ))}
      </div>
      <Button variant="secondary" onClick={onClear}>
        Clear
      </Button>
    </div>
  );
});
