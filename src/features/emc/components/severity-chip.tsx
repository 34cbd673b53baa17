import type { WatchBand } from '@shared/schemas/watch-band';
import { SEVERITY_CHIP, SEVERITY_LABELS } from './labels';

export function SeverityChip({ severity }: { severity: WatchBand['severity'] }) {
  return <span className={`rounded-full px-3 py-1 text-sm font-bold ${SEVERITY_CHIP[severity]}`}>{SEVERITY_LABELS[severity]}</span>;
}
