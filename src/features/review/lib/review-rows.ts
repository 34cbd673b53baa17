/**
 * Pure helpers of the review table: which rows a filter keeps, the search over notes (every word must
 * appear, in any order, case- and accent-insensitive), and how a reading's value reads in the chosen unit.
 */
import { formatFluxDensity, formatFrequency } from '@shared/units';
import type { ReviewReading } from '@shared/schemas/review';
import type { FIELD_UNITS, VERDICTS } from '@shared/schemas/vocabulary';

export type FieldUnit = (typeof FIELD_UNITS)[number];
export type DecisionFilter = 'all' | 'undecided' | (typeof VERDICTS)[number];
export type SyncFilter = 'all' | 'conflicted' | 'attachment_pending' | 'clean';

export interface ReviewFilter {
  /** Words to find in the notes (and the station label, room and surveyor). */
  search: string;
  decision: DecisionFilter;
  kind: 'all' | ReviewReading['kind'];
  levelId: string | 'all';
  surveyorUserId: string | 'all';
  sync: SyncFilter;
  /** Only readings at or above this class index (−1: everything). */
  minClassIndex: number;
}

export const EMPTY_FILTER: ReviewFilter = { search: '', decision: 'all', kind: 'all', levelId: 'all', surveyorUserId: 'all', sync: 'all', minClassIndex: -1 };

const fold = (text: string) => text.normalize('NFD').replace(/\p{Diacritic}/gu, '').toLowerCase();

/** The text the search looks in for one row. */
export function searchText(row: ReviewReading): string {
  return fold([row.notes ?? '', row.decision?.note ?? '', row.stationLabel ?? '', row.roomName ?? '', row.surveyorName].join(' \u0001 '));
}

export function filterRows(rows: readonly ReviewReading[], filter: ReviewFilter, index?: Map<string, string>): ReviewReading[] {
  const words = fold(filter.search).split(/\s+/).filter(Boolean);
  return rows.filter((row) => {
    if (filter.kind !== 'all' && row.kind !== filter.kind) return false;
    if (filter.levelId !== 'all' && row.levelId !== filter.levelId) return false;
    if (filter.surveyorUserId !== 'all' && row.surveyorUserId !== filter.surveyorUserId) return false;
    if (filter.decision === 'undecided' ? row.decision !== null : filter.decision !== 'all' && row.decision?.verdict !== filter.decision) return false;
    if (filter.sync === 'conflicted' && !row.conflicted) return false;
    if (filter.sync === 'attachment_pending' && !row.attachmentPending) return false;
    if (filter.sync === 'clean' && (row.conflicted || row.attachmentPending)) return false;
    if (filter.minClassIndex >= 0 && (row.safetyClass === null || row.safetyClass.index < filter.minClassIndex)) return false;
    if (words.length > 0) {
      const text = index?.get(row.id) ?? searchText(row);
      if (!words.every((w) => text.includes(w))) return false;
    }
    return true;
  });
}

/** |B| in the chosen unit (4 significant digits), or a sweep's span and peaks. */
export function valueText(row: ReviewReading, unit: FieldUnit): string {
  if (row.kind === 'sweep' && row.sweep) {
    const peaks = `${row.sweep.peakCount} ${row.sweep.peakCount === 1 ? 'peak' : 'peaks'}`;
    return `${formatFrequency(row.sweep.startHz)} – ${formatFrequency(row.sweep.stopHz)} · ${peaks}`;
  }
  return row.fieldT === null ? '—' : formatFluxDensity(row.fieldT, { unit });
}

export function syncText(row: ReviewReading): string {
  const parts = [row.conflicted ? 'Conflict' : null, row.attachmentPending ? (row.kind === 'sweep' ? 'Trace missing' : 'Photo missing') : null].filter(Boolean);
  return parts.length ? parts.join(' · ') : 'Synced';
}

export const VERDICT_LABELS: Record<(typeof VERDICTS)[number], string> = { accepted: 'Accepted', remeasure: 'Re-measure', rejected: 'Rejected' };
