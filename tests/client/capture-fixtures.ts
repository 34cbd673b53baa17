/** Inputs for the capture store tests: a made-up organisation, survey and level (ids only; the device store has no foreign keys). */
import { v7 as uuidv7 } from 'uuid';
import type { FieldReadingInput } from '@/features/capture/data/save-field-reading';
import type { StationInput } from '@/features/capture/data/save-station';
import type { SweepInput } from '@/features/capture/data/save-sweep';

export function captureContext() {
  return { orgId: uuidv7(), surveyId: uuidv7(), levelId: uuidv7(), userId: uuidv7() };
}
export type CaptureContext = ReturnType<typeof captureContext>;

export const stationInput = (c: CaptureContext, over: Partial<StationInput> = {}): StationInput => ({
  organisationId: c.orgId,
  surveyId: c.surveyId,
  levelId: c.levelId,
  walkId: null,
  roomId: null,
  label: 'S1',
  xM: 3.2,
  yM: -1.5,
  heightM: 1,
  createdByUserId: c.userId,
  notes: null,
  ...over,
});

export const readingInput = (c: CaptureContext, stationId: string, over: Partial<FieldReadingInput> = {}): FieldReadingInput => ({
  organisationId: c.orgId,
  surveyId: c.surveyId,
  stationId,
  walkId: null,
  instrumentId: null,
  surveyorUserId: c.userId,
  magnitudeT: 0.5e-3,
  bxT: null,
  byT: null,
  bzT: null,
  unit: 'mT',
  probeOrientation: 'three_axis',
  heightM: 1,
  backgroundT: null,
  zeroed: true,
  measuredAt: '2026-11-17T09:00:00.000Z',
  notes: null,
  photoObjectKey: null,
  photoSha256: null,
  ...over,
});

export const sweepInput = (c: CaptureContext, stationId: string, over: Partial<SweepInput> = {}): SweepInput => ({
  organisationId: c.orgId,
  surveyId: c.surveyId,
  stationId,
  walkId: null,
  analyserId: null,
  antennaId: null,
  surveyorUserId: c.userId,
  measuredAt: '2026-11-17T09:05:00.000Z',
  startHz: 2.3e9,
  stopHz: 2.6e9,
  rbwHz: 100e3,
  vbwHz: null,
  referenceLevelDbm: -20,
  attenuationDb: null,
  detector: 'peak',
  peaks: [{ frequencyHz: 2.45e9, levelDbm: -61.5 }],
  traceObjectKey: null,
  traceSha256: null,
  heightM: 1.2,
  notes: null,
  ...over,
});
