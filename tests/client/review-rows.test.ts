/** The review table's filter, note search and value formatting (src/features/review/lib/review-rows.ts). */
import { describe, expect, it } from 'vitest';
import { ReviewReadingSchema, type ReviewReading } from '@shared/schemas/review';
import { sortReviewRows } from '@/features/review/components/review-table';
import { compactReadings } from '@/features/review/data/get-review-readings';
import { EMPTY_FILTER, filterRows, syncText, valueText } from '@/features/review/lib/review-rows';

let n = 0;
function reading(over: Partial<ReviewReading> = {}): ReviewReading {
  n += 1;
  return {
    id: `00000000-0000-7000-8000-${String(n).padStart(12, '0')}`,
    kind: 'field_reading',
    revision: 1,
    stationId: '00000000-0000-7000-8000-0000000000aa',
    stationLabel: `S${n}`,
    levelId: '00000000-0000-7000-8000-0000000000b1',
    levelName: 'Basement',
    roomId: null,
    roomName: null,
    surveyorUserId: '00000000-0000-7000-8000-0000000000c1',
    surveyorName: 'Ada Surveyor',
    instrumentId: null,
    instrumentLabel: null,
    calibrationDueOn: null,
    calibrationOverdue: false,
    measuredAt: '2026-11-17T09:00:00.000Z',
    fieldT: 0.5e-3,
    enteredUnit: 'mT',
    sweep: null,
    safetyClass: { index: 0, label: 'Implant line' },
    notes: null,
    conflicted: false,
    attachmentPending: false,
    decision: null,
    ...over,
  };
}

describe('review rows', () => {
  const rows = [
    reading({ notes: 'Probe resting on the steel trolley' }),
    reading({ notes: 'Café door, re-zeroed', decision: { id: '00000000-0000-7000-8000-0000000000d1', verdict: 'remeasure', note: 'Repeat away from the frame', reviewerUserId: '00000000-0000-7000-8000-0000000000c2', reviewerName: 'R', decidedAt: '2026-11-18T09:00:00.000Z', revision: 1 } }),
    reading({ kind: 'sweep', fieldT: null, safetyClass: null, enteredUnit: null, sweep: { startHz: 2.3e9, stopHz: 2.6e9, peakCount: 2, strongestPeakDbm: -27.5 }, conflicted: true }),
  ];

  it('finds every word of the search in the notes, in any order, ignoring case and accents', () => {
    expect(filterRows(rows, { ...EMPTY_FILTER, search: 'trolley STEEL' }).map((r) => r.id)).toEqual([rows[0]!.id]);
    expect(filterRows(rows, { ...EMPTY_FILTER, search: 'cafe' }).map((r) => r.id)).toEqual([rows[1]!.id]);
    // The decision's note is searched too.
    expect(filterRows(rows, { ...EMPTY_FILTER, search: 'frame' }).map((r) => r.id)).toEqual([rows[1]!.id]);
    expect(filterRows(rows, { ...EMPTY_FILTER, search: 'trolley cafe' })).toEqual([]);
  });

  it('filters by decision, kind, sync state and class', () => {
    expect(filterRows(rows, { ...EMPTY_FILTER, decision: 'undecided' })).toHaveLength(2);
    expect(filterRows(rows, { ...EMPTY_FILTER, decision: 'remeasure' })).toEqual([rows[1]]);
    expect(filterRows(rows, { ...EMPTY_FILTER, kind: 'sweep' })).toEqual([rows[2]]);
    expect(filterRows(rows, { ...EMPTY_FILTER, sync: 'conflicted' })).toEqual([rows[2]]);
    expect(filterRows(rows, { ...EMPTY_FILTER, sync: 'clean' })).toHaveLength(2);
    expect(filterRows(rows, { ...EMPTY_FILTER, minClassIndex: 0 })).toHaveLength(2);
    expect(filterRows(rows, { ...EMPTY_FILTER, minClassIndex: 1 })).toEqual([]);
  });

  it('shows |B| in the chosen unit (1 G = 10⁻⁴ T, BIPM SI Brochure 9th ed., table 9) and a sweep’s span', () => {
    expect(valueText(rows[0]!, 'mT')).toBe('0.5000 mT');
    expect(valueText(rows[0]!, 'G')).toBe('5.000 G');
    expect(valueText(rows[0]!, 'µT')).toBe('500.0 µT');
    expect(valueText(rows[2]!, 'mT')).toBe('2.300 GHz – 2.600 GHz · 2 peaks');
    expect(syncText(rows[2]!)).toBe('Conflict');
    expect(syncText({ ...rows[0]!, attachmentPending: true })).toBe('Photo missing');
  });
});

describe('review table sorting', () => {
  // Expected orders written out by hand for these few rows (common practice: ties keep their order).
  const a = reading({ stationLabel: 'b-2', fieldT: 2e-3, measuredAt: '2026-11-17T10:00:00.000Z', notes: 'Door' });
  const b = reading({ stationLabel: 'A-1', fieldT: null, measuredAt: '2026-11-17T08:00:00.000Z', notes: null });
  const c = reading({ stationLabel: 'a-3', fieldT: 0.3e-3, measuredAt: '2026-11-17T09:00:00.000Z', notes: 'door' });
  const d = reading({ stationLabel: 'B-1', fieldT: 2e-3, measuredAt: '2026-11-17T11:00:00.000Z', notes: 'Window' });
  const rows = [a, b, c, d];
  const ids = (list: ReviewReading[]) => list.map((r) => r.stationLabel);

  it('sorts text without regard to case, and numbers as numbers, with no value last going down', () => {
    expect(ids(sortReviewRows(rows, { id: 'station', desc: false }))).toEqual(['A-1', 'a-3', 'B-1', 'b-2']);
    expect(ids(sortReviewRows(rows, { id: 'value', desc: false }))).toEqual(['A-1', 'a-3', 'b-2', 'B-1']);
    expect(ids(sortReviewRows(rows, { id: 'value', desc: true }))).toEqual(['b-2', 'B-1', 'a-3', 'A-1']);
    expect(ids(sortReviewRows(rows, { id: 'time', desc: false }))).toEqual(['A-1', 'a-3', 'b-2', 'B-1']);
  });

  it('keeps equal keys in their order and leaves the input alone', () => {
    expect(ids(sortReviewRows(rows, { id: 'notes', desc: false }))).toEqual(['A-1', 'b-2', 'a-3', 'B-1']);
    expect(ids(rows)).toEqual(['b-2', 'A-1', 'a-3', 'B-1']);
  });
});

describe('compacting a large answer', () => {
  it('changes no value, and rows share one copy of each class', () => {
    // Parsed from JSON, as the answer arrives: every row has its own copies.
    const rows = JSON.parse(
      JSON.stringify([
        reading({ levelName: 'Ground' }),
        reading({ levelName: 'Ground', decision: { id: '0190a000-0000-7000-8000-0000000000d1', verdict: 'remeasure', note: 'Again, away from the door', reviewerUserId: '0190a000-0000-7000-8000-0000000000e1', reviewerName: 'Rhea Reviewer', decidedAt: '2026-11-20T09:00:00.000Z', revision: 2 } }),
        reading({ safetyClass: { index: 2, label: 'Projectile risk' } }),
      ]),
    ) as ReviewReading[];
    const before = structuredClone(rows);
    expect(rows[0]!.safetyClass).not.toBe(rows[1]!.safetyClass);
    const compact = compactReadings(rows);
    expect(compact).toEqual(before);
    expect(rows).toEqual(before);
    expect(compact[0]!.safetyClass).toBe(compact[1]!.safetyClass);
    expect(compact[2]!.safetyClass).not.toBe(compact[0]!.safetyClass);
  });

  it('keeps every field of a reading, in one order for every row', () => {
    const [one] = compactReadings([reading({})]);
    expect(Object.keys(one!)).toEqual(Object.keys(ReviewReadingSchema.shape));
  });
});
