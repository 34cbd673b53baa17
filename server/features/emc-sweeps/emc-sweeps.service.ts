/**
 * Sweeps explained (issue 8 §4). For a sweep: the field interval where it was taken — the readings of
 * its own station, or of its room when the station has none — widened by each reading's expanded
 * gaussmeter uncertainty
 * (shared/emc/room-lines.ts, the same rule the room flags use); the predicted lines of the survey's
 * species and harmonics over it; every peak marker and every peak found in the trace file
 * (shared/emc/peaks.ts states the peak-finding and matching rules) matched to those lines within the
 * combined tolerance. While the survey is open every reading not rejected counts (marked so); once
 * submitted, only accepted readings.
 *
 * Why the station first: in a fringe field a room's readings span decades (0.1–90 mT in the demo's etch
 * laboratory), so the room's band of one line covers megahertz to gigahertz and would "explain" almost
 * any peak; the readings where the antenna stood say which line it can see there. The room-wide bands
 * are the flags' business (issue 8 §2–3).
 *
 * Computed on request: a sweep's inputs are a few hundred readings and one trace file of at most a few
 * hundred kilobytes, well inside a request's time.
 */
import { combinePeaks, DEFAULT_ANALYSER_RELATIVE_ACCURACY, explainPeaks, findTracePeaks, downsampleMinMax, PEAK_NOISE_SIGMAS, PEAK_PROMINENCE_DB, PEAK_THRESHOLD_DB, type PeakToExplain, type PredictedLine, type TracePeakResult } from '../../../shared/emc/peaks';
import { EMC_COVERAGE_FACTOR_K, predictedBands, roomFieldInterval } from '../../../shared/emc/room-lines';
import { parseTraceCsv, type Trace } from '../../../shared/emc/trace-csv';
import type { BuiltInSpeciesId } from '../../../shared/physics/species';
import type { FieldInterval, SweepExplained, SweepSummary, SweepTrace } from '../../../shared/schemas/emc-sweep';
import { AppError } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import type { Storage } from '../../lib/storage';
import type { EmcSweepsRepository, SurveyReadingRow, SweepRow } from './emc-sweeps.repository';

/** Points of the trace sent for drawing (min and max of 1,000 buckets). */
export const TRACE_DISPLAY_POINTS = 2000;
/** A trace file larger than this is not read (an analyser export of 100,000 points is about 2.5 MB). */
export const TRACE_MAX_BYTES = 8 * 1024 * 1024;

export const PEAK_RULE =
  `Noise floor = median level of the trace; a peak is a local maximum at least max(${PEAK_THRESHOLD_DB} dB, ${PEAK_NOISE_SIGMAS}σ) above the floor ` +
  `(σ = 1.4826 × median absolute deviation) with a prominence of at least ${PEAK_PROMINENCE_DB} dB; peaks closer than max(RBW, 2 bins) are one peak. ` +
  'A peak is explained when it lies within a predicted line widened by RBW/2, half a trace bin and the analyser frequency accuracy.';

interface Survey {
  id: string;
  siteId: string;
  state: 'open' | 'submitted' | 'signed_off';
  species: BuiltInSpeciesId[];
  maxHarmonic: number;
}

function usable(readings: readonly SurveyReadingRow[], state: Survey['state']): SurveyReadingRow[] {
  return readings.filter((r) => (state === 'open' ? r.verdict !== 'rejected' : r.verdict === 'accepted'));
}

function fieldIntervalFor(sweep: SweepRow, readings: readonly SurveyReadingRow[], survey: Survey): FieldInterval | null {
  const toInput = (rows: readonly SurveyReadingRow[]) => rows.map((r) => ({ fieldT: r.fieldT, relativeStandardUncertainty: r.relativeUncertainty }));
  let basis: FieldInterval['basis'] = 'station';
  let interval = roomFieldInterval(toInput(readings.filter((r) => r.stationId === sweep.stationId)));
  if (!interval && sweep.roomId) {
    basis = 'room';
    interval = roomFieldInterval(toInput(readings.filter((r) => r.roomId === sweep.roomId)));
  }
  if (!interval) return null;
  const includesUnreviewed = survey.state === 'open';
  const where = basis === 'room' ? `the stations of ${sweep.roomName ?? 'the room'} (the sweep’s own station has no usable reading)` : 'the sweep’s station';
  return {
    lowT: interval.lowT,
    highT: interval.highT,
    basis,
    readings: interval.readings,
    includesUnreviewed,
    note:
      `${interval.readings} reading${interval.readings === 1 ? '' : 's'} at ${where}, widened by k = ${EMC_COVERAGE_FACTOR_K} × ${interval.readings === 1 ? 'its' : 'each one’s'} gaussmeter uncertainty` +
      (includesUnreviewed ? '; the survey is open, so readings not yet reviewed count (rejected ones do not).' : '; accepted readings only.'),
  };
}

function linesFor(interval: FieldInterval | null, survey: Survey): PredictedLine[] {
  if (!interval) return [];
  return predictedBands(interval, survey.species, survey.maxHarmonic);
}

function accuracyOf(sweep: SweepRow): { relative: number; source: string } {
  if (sweep.analyserRelativeUncertainty !== null && sweep.analyserId) {
    return {
      relative: EMC_COVERAGE_FACTOR_K * sweep.analyserRelativeUncertainty,
      source: `The analyser’s record (${sweep.analyserModel ?? 'analyser'}, ${sweep.analyserSerial ?? ''}): relative uncertainty ${sweep.analyserRelativeUncertainty}, expanded k = ${EMC_COVERAGE_FACTOR_K}.`,
    };
  }
  return {
    relative: DEFAULT_ANALYSER_RELATIVE_ACCURACY,
    source: `${sweep.analyserId ? 'The analyser’s record states no frequency uncertainty' : 'The sweep names no analyser'}: 10 ppm assumed (recalled typical reference-oscillator accuracy; common practice).`,
  };
}

function explainMarkers(sweep: SweepRow, lines: PredictedLine[]) {
  const peaks: PeakToExplain[] = sweep.peaks.map((p) => ({ frequencyHz: p.frequencyHz, levelDbm: p.levelDbm, source: 'marker' }));
  return explainPeaks({ peaks, lines, rbwHz: sweep.rbwHz, analyserRelativeAccuracy: accuracyOf(sweep).relative });
}

async function readBody(body: NodeJS.ReadableStream, limit: number): Promise<Buffer | null> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of body) {
    const buffer = Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk as string);
    size += buffer.length;
    if (size > limit) return null;
    chunks.push(buffer);
  }
  return Buffer.concat(chunks);
}

export function createEmcSweepsService(deps: { repo: EmcSweepsRepository; storage: Storage; logger: Logger }) {
  const { repo, storage, logger } = deps;

  async function surveyOf(organisationId: string, surveyId: string): Promise<Survey> {
    const survey = await repo.findSurvey(organisationId, surveyId);
    if (!survey) throw new AppError('NOT_FOUND', 'That survey was not found.');
    return survey as Survey;
  }

  async function loadTrace(organisationId: string, sweep: SweepRow): Promise<{ trace: Trace | null; status: SweepTrace['status']; reason: string | null }> {
    if (!sweep.traceObjectKey) return { trace: null, status: 'none', reason: 'This sweep has no trace file; only its peak markers are matched.' };
    if (!(await repo.traceArrived(organisationId, sweep.traceObjectKey))) {
      return { trace: null, status: 'pending', reason: 'The trace file has not reached the server yet; it uploads when the surveyor’s device next syncs.' };
    }
    let object;
    try {
      object = await storage.getObject(sweep.traceObjectKey);
    } catch (error) {
      logger.warn({ err: error, sweepId: sweep.id }, 'trace file could not be read from the object store');
      object = null;
    }
    if (!object) return { trace: null, status: 'unavailable', reason: 'The file store does not have the trace right now. Try again in a moment.' };
    const bytes = await readBody(object.body, TRACE_MAX_BYTES);
    if (!bytes) return { trace: null, status: 'unreadable', reason: `The trace file is larger than ${TRACE_MAX_BYTES / 1024 / 1024} MB and is not read.` };
    const parsed = parseTraceCsv(bytes.toString('utf8'));
    if (!parsed.ok) return { trace: null, status: 'unreadable', reason: `The trace file cannot be read: ${parsed.message}` };
    return { trace: parsed.trace, status: 'shown', reason: null };
  }

  return {
    async list(organisationId: string, surveyId: string): Promise<SweepSummary[]> {
      const survey = await surveyOf(organisationId, surveyId);
      const [rows, readings] = await Promise.all([repo.listSweeps(organisationId, surveyId), repo.surveyReadings(organisationId, surveyId)]);
      const live = usable(readings, survey.state);
      return rows.map((sweep) => {
        const explained = explainMarkers(sweep, linesFor(fieldIntervalFor(sweep, live, survey), survey));
        const n = explained.filter((p) => p.status === 'explained').length;
        return {
          id: sweep.id,
          measuredAt: sweep.measuredAt.toISOString(),
          startHz: sweep.startHz,
          stopHz: sweep.stopHz,
          rbwHz: sweep.rbwHz,
          detector: sweep.detector,
          station: { id: sweep.stationId, label: sweep.stationLabel },
          room: sweep.roomId ? { id: sweep.roomId, name: sweep.roomName ?? '' } : null,
          markerCounts: { explained: n, unexplained: explained.length - n },
          hasTrace: sweep.traceObjectKey !== null,
        };
      });
    },

    async explained(organisationId: string, surveyId: string, sweepId: string): Promise<SweepExplained> {
      const survey = await surveyOf(organisationId, surveyId);
      const sweep = await repo.findSweep(organisationId, surveyId, sweepId);
      if (!sweep) throw new AppError('NOT_FOUND', 'That sweep was not found in this survey.');
      const [readings, bands, loaded] = await Promise.all([
        repo.surveyReadings(organisationId, surveyId),
        repo.watchBandsInSpan(organisationId, survey.siteId, sweep.startHz, sweep.stopHz),
        loadTrace(organisationId, sweep),
      ]);
      const interval = fieldIntervalFor(sweep, usable(readings, survey.state), survey);
      const lines = linesFor(interval, survey);
      const accuracy = accuracyOf(sweep);

      let found: TracePeakResult | null = null;
      if (loaded.trace && loaded.trace.frequencyHz.length > 0) found = findTracePeaks(loaded.trace, { rbwHz: sweep.rbwHz });
      const peaks = explainPeaks({
        peaks: combinePeaks(sweep.peaks, found?.peaks ?? [], found?.mergeDistanceHz ?? sweep.rbwHz),
        lines,
        rbwHz: sweep.rbwHz,
        analyserRelativeAccuracy: accuracy.relative,
      });

      return {
        sweep: {
          id: sweep.id,
          surveyId: sweep.surveyId,
          measuredAt: sweep.measuredAt.toISOString(),
          startHz: sweep.startHz,
          stopHz: sweep.stopHz,
          rbwHz: sweep.rbwHz,
          vbwHz: sweep.vbwHz,
          referenceLevelDbm: sweep.referenceLevelDbm,
          attenuationDb: sweep.attenuationDb,
          detector: sweep.detector,
          notes: sweep.notes,
          station: { id: sweep.stationId, label: sweep.stationLabel },
          room: sweep.roomId ? { id: sweep.roomId, name: sweep.roomName ?? '' } : null,
          analyser: sweep.analyserId ? { id: sweep.analyserId, model: sweep.analyserModel ?? '', serial: sweep.analyserSerial ?? '' } : null,
        },
        fieldInterval: interval,
        frequencyAccuracy: accuracy,
        lines: lines.map((l) => ({
          species: l.species as BuiltInSpeciesId,
          harmonic: l.harmonic,
          lowHz: l.lowHz,
          highHz: l.highHz,
          inSpan: l.lowHz <= sweep.stopHz && l.highHz >= sweep.startHz,
        })),
        watchBands: bands,
        peaks: peaks.map((p) => ({
          frequencyHz: p.frequencyHz,
          levelDbm: p.levelDbm,
          source: p.source,
          toleranceHz: p.toleranceHz,
          status: p.status,
          explainedBy: p.explainedBy ? { ...p.explainedBy, species: p.explainedBy.species as BuiltInSpeciesId } : null,
          alsoWithin: p.alsoWithin.map((m) => ({ ...m, species: m.species as BuiltInSpeciesId })),
          label: p.label,
        })),
        trace: {
          status: loaded.status,
          reason: loaded.reason,
          points: loaded.trace ? downsampleMinMax(loaded.trace, TRACE_DISPLAY_POINTS) : null,
          totalPoints: loaded.trace ? loaded.trace.frequencyHz.length : null,
          noiseFloorDbm: found ? found.noiseFloorDbm : null,
          thresholdDbm: found ? found.thresholdDbm : null,
        },
        peakRule: PEAK_RULE,
      };
    },
  };
}
export type EmcSweepsService = ReturnType<typeof createEmcSweepsService>;
