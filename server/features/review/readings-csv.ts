/**
 * The readings CSV (issue 7 §6): RFC 4180 text (CRLF line ends, fields with a comma, quote or line
 * break quoted, quotes doubled — papaparse's unparse with `quotes` on the text columns), one row per
 * live field reading, units in the header (`field_mT`, `x_m`). Text cells that a spreadsheet would run
 * as a formula are written with a leading apostrophe, and read back without it (shared/csv/formula.ts).
 *
 * Field values are written in millitesla by moving the decimal point of the stored tesla value's
 * shortest round-trip text (shared/review/decimal-shift.ts), so importing an exported file gives back
 * bit-for-bit the same doubles. On import, value columns may carry any of the field units as their
 * suffix (`field_G`, `bx_uT`): all are powers of ten of the tesla, so they are read by the same shift.
 *
 * Import columns: level_id or level (name), x_m, y_m, station_height_m, station_label, station_id (used
 * when it is a station of this survey), surveyor_email, instrument_id or instrument_serial (+
 * instrument_model), measured_at (ISO 8601 with offset), magnitude_<unit> or bx/by/bz_<unit> (or
 * field_<unit> alone, read as a magnitude), unit_entered, probe_orientation, probe_height_m,
 * background_<unit>, zeroed, notes. The other exported columns (ids, names, class, decision) are for
 * people reading the file: an imported reading is a new fact in the target survey, with a new id and no
 * decision until a reviewer makes one.
 */
import Papa from 'papaparse';
import { v7 as uuidv7 } from 'uuid';
import { protectCell, unprotectCell } from '../../../shared/csv/formula';
import { roomForPoint } from '../../../shared/plans/polygon';
import { FieldReadingSchema } from '../../../shared/schemas/capture';
import type { ImportReport } from '../../../shared/schemas/review';
import { FIELD_UNITS, PROBE_ORIENTATIONS, type FieldUnitSchema } from '../../../shared/schemas/vocabulary';
import { formatScaled, parseScaled } from '../../../shared/review/decimal-shift';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { FieldReadingInsert, ReviewRepository, StationInsert } from './review.repository';
import type { ReviewService } from './review.service';
import type { z } from 'zod';

export const READINGS_CSV_COLUMNS = [
  'reading_id',
  'station_id',
  'station_label',
  'level_id',
  'level',
  'room',
  'x_m',
  'y_m',
  'station_height_m',
  'surveyor_email',
  'surveyor',
  'instrument_id',
  'instrument_model',
  'instrument_serial',
  'measured_at',
  'field_mT',
  'magnitude_mT',
  'bx_mT',
  'by_mT',
  'bz_mT',
  'unit_entered',
  'probe_orientation',
  'probe_height_m',
  'background_mT',
  'zeroed',
  'notes',
  'safety_class',
  'verdict',
  'decision_note',
  'reviewer',
  'decided_at',
] as const;

/** Powers of ten from each field unit to tesla (1 G = 10⁻⁴ T: BIPM SI Brochure, 9th ed., table 9 note). */
const TESLA_EXPONENT: Record<string, number> = { T: 0, mT: -3, µT: -6, uT: -6, nT: -9, G: -4, mG: -7, kG: -1 };

const mT = (tesla: number | null) => (tesla === null ? '' : formatScaled(tesla, 3));
const num = (value: number | null) => (value === null ? '' : String(value));

/** Most rows one import takes. */
export const IMPORT_MAX_ROWS = 50_000;

export function createReadingsCsv(deps: { repo: ReviewRepository; review: ReviewService }) {
  const { repo, review } = deps;

  async function exportCsv(organisationId: string, surveyId: string): Promise<{ filename: string; csv: string }> {
    const { survey, data, rows } = await review.exportData(organisationId, surveyId);
    const stations = new Map(data.stations.map((s) => [s.id, s]));
    const people = new Map(data.people.map((p) => [p.userId, p]));
    const instruments = new Map(data.instruments.map((i) => [i.id, i]));
    const review_ = new Map(rows.map((r) => [r.id, r]));
    const body = data.readings.map(({ reading: r }) => {
      const st = stations.get(r.stationId);
      const row = review_.get(r.id)!;
      const inst = r.instrumentId ? instruments.get(r.instrumentId) : undefined;
      const d = row.decision;
      const text = (v: string | null | undefined) => protectCell(v ?? '');
      return [
        r.id,
        r.stationId,
        text(st?.label),
        row.levelId,
        text(row.levelName),
        text(row.roomName),
        num(st?.xM ?? null),
        num(st?.yM ?? null),
        num(st?.heightM ?? null),
        text(people.get(r.surveyorUserId)?.email),
        text(row.surveyorName),
        r.instrumentId ?? '',
        text(inst?.model),
        text(inst?.serial),
        r.measuredAt.toISOString(),
        mT(r.fieldT),
        mT(r.magnitudeT),
        mT(r.bxT),
        mT(r.byT),
        mT(r.bzT),
        r.unit,
        r.probeOrientation,
        num(r.heightM),
        mT(r.backgroundT),
        r.zeroed ? 'true' : 'false',
        text(r.notes),
        text(row.safetyClass?.label),
        d?.verdict ?? '',
        text(d?.note),
        text(d?.reviewerName),
        d?.decidedAt ?? '',
      ];
    });
    // Text cells are protected above (protectCell); papaparse's own escaping would also turn negative numbers into text.
    const csv = Papa.unparse({ fields: [...READINGS_CSV_COLUMNS], data: body }, { newline: '\r\n', quotes: false, escapeFormulae: false });
    const slug = survey.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'survey';
    return { filename: `${slug}-readings.csv`, csv: `${csv}\r\n` };
  }

  async function importCsv(organisationId: string, surveyId: string, text: string, mode: ImportReport['mode'], ctx: AuditContext): Promise<ImportReport> {
    const survey = await repo.findSurvey(organisationId, surveyId);
    if (!survey) throw notFound('That survey');
    if (survey.state !== 'open') throw new AppError('SURVEY_NOT_OPEN', `The survey is ${survey.state === 'signed_off' ? 'signed off' : survey.state}: it takes no more readings.`, { state: survey.state });

    const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim() });
    const errors: ImportReport['errors'] = [];
    const headers = parsed.meta.fields ?? [];
    const has = (name: string) => headers.includes(name);
    const unitColumn = (base: string) => headers.find((h) => h.startsWith(`${base}_`) && h.slice(base.length + 1) in TESLA_EXPONENT) ?? null;
    const fieldCol = unitColumn('field');
    const magnitudeCol = unitColumn('magnitude');
    const bxCol = unitColumn('bx');
    const byCol = unitColumn('by');
    const bzCol = unitColumn('bz');
    const backgroundCol = unitColumn('background');
    for (const h of headers) {
      const m = /^(field|magnitude|bx|by|bz|background)_(.+)$/.exec(h);
      if (m && !(m[2]! in TESLA_EXPONENT)) errors.push({ row: 0, column: h, message: `Unknown field unit “${m[2]}” in the header (use T, mT, µT, nT, G, mG or kG).` });
    }
    if (!has('level_id') && !has('level')) errors.push({ row: 0, column: 'level_id', message: 'The file needs a level_id or level column.' });
    for (const c of ['x_m', 'y_m', 'surveyor_email', 'measured_at']) if (!has(c)) errors.push({ row: 0, column: c, message: `The file needs a ${c} column.` });
    if (!fieldCol && !magnitudeCol && !(bxCol && byCol && bzCol)) errors.push({ row: 0, column: 'magnitude_mT', message: 'The file needs magnitude_<unit>, field_<unit> or all of bx/by/bz_<unit> (e.g. magnitude_mT).' });
    const rows = parsed.data;
    if (rows.length > IMPORT_MAX_ROWS) throw new AppError('PAYLOAD_TOO_LARGE', `Import at most ${IMPORT_MAX_ROWS} rows at a time.`);
    for (const e of parsed.errors) errors.push({ row: (e.row ?? -1) + 1, column: null, message: `CSV: ${e.message}` });
    if (errors.some((e) => e.row === 0)) {
      return finish({ rows: rows.length, bad: new Set(rows.map((_, i) => i + 1)), errors, mode, committed: false, readings: 0, stations: 0 });
    }

    const [{ levels, rooms }, members, gaussmeters, existing] = await Promise.all([
      repo.siteLevelsAndRooms(organisationId, survey.siteId),
      repo.membersByEmail(organisationId),
      repo.gaussmeters(organisationId),
      repo.surveyStationsAndReadings(organisationId, surveyId),
    ]);
    const levelById = new Map(levels.map((l) => [l.id, l]));
    const levelByName = new Map(levels.map((l) => [l.name.trim().toLowerCase(), l]));
    const memberByEmail = new Map(members.map((m) => [m.email.trim().toLowerCase(), m]));
    const stationById = new Map(existing.stations.map((s) => [s.id, s]));
    const stationKey = (levelId: string, label: string | null, x: number, y: number) => `${levelId}|${label ?? ''}|${x}|${y}`;
    const stationByKey = new Map(existing.stations.map((s) => [stationKey(s.levelId, s.label, s.xM, s.yM), s.id]));
    const readingKey = (stationId: string, surveyorUserId: string, at: number, v: (number | null)[]) => `${stationId}|${surveyorUserId}|${at}|${v.join('|')}`;
    const seenReadings = new Set(existing.readings.map((r) => readingKey(r.stationId, r.surveyorUserId, r.measuredAt.getTime(), [r.magnitudeT, r.bxT, r.byT, r.bzT])));

    const newStations: StationInsert[] = [];
    const newReadings: FieldReadingInsert[] = [];
    const rowOf = new Map<string, number>();
    const bad = new Set<number>();
    const fail = (row: number, column: string | null, message: string) => {
      errors.push({ row, column, message });
      bad.add(row);
    };

    rows.forEach((raw, index) => {
      const rowNo = index + 1;
      const cell = (c: string | null) => (c ? unprotectCell(raw[c] ?? '').trim() : '');
      const before = errors.length;
      const number = (c: string, required: boolean, min?: number): number | null => {
        const v = cell(c);
        if (v === '') {
          if (required) fail(rowNo, c, `${c} is empty.`);
          return null;
        }
        const n = Number(v);
        if (!Number.isFinite(n) || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(v)) {
          fail(rowNo, c, `${c} “${v}” is not a number (use a point for decimals).`);
          return null;
        }
        if (min !== undefined && n < min) {
          fail(rowNo, c, `${c} cannot be below ${min}.`);
          return null;
        }
        return n;
      };
      const tesla = (c: string | null): number | null => {
        if (!c) return null;
        const v = cell(c);
        if (v === '') return null;
        const exponent = TESLA_EXPONENT[c.slice(c.indexOf('_') + 1)]!;
        const t = parseScaled(v, exponent);
        if (!Number.isFinite(t)) {
          fail(rowNo, c, `${c} “${v}” is not a number (use a point for decimals).`);
          return null;
        }
        return t;
      };

      // Level and station.
      let levelId: string | null = null;
      const levelIdText = cell('level_id');
      if (levelIdText) {
        if (levelById.has(levelIdText)) levelId = levelIdText;
        else fail(rowNo, 'level_id', 'No such level on this survey’s site.');
      } else if (cell('level')) {
        const l = levelByName.get(cell('level').toLowerCase());
        if (l) levelId = l.id;
        else fail(rowNo, 'level', `No level called “${cell('level')}” on this survey’s site.`);
      } else fail(rowNo, 'level_id', 'Give the level (level_id or level).');
      const xM = number('x_m', true);
      const yM = number('y_m', true);
      const stationHeightM = has('station_height_m') && cell('station_height_m') !== '' ? number('station_height_m', false, 0) : 1;
      const label = cell('station_label') || null;
      if (label && label.length > 80) fail(rowNo, 'station_label', 'Station labels are at most 80 characters.');

      // Person and instrument.
      const email = cell('surveyor_email').toLowerCase();
      const surveyor = email ? memberByEmail.get(email) : undefined;
      if (!email) fail(rowNo, 'surveyor_email', 'Give the surveyor’s e-mail.');
      else if (!surveyor) fail(rowNo, 'surveyor_email', `${email} is not a member of this organisation.`);
      let instrumentId: string | null = null;
      const instText = cell('instrument_id');
      if (instText) {
        const inst = gaussmeters.find((g) => g.id === instText && g.kind === 'gaussmeter');
        if (inst) instrumentId = inst.id;
        else fail(rowNo, 'instrument_id', 'No such gaussmeter in this organisation.');
      } else if (cell('instrument_serial')) {
        const model = cell('instrument_model').toLowerCase();
        const matches = gaussmeters.filter((g) => g.kind === 'gaussmeter' && g.serial === cell('instrument_serial') && (!model || g.model.toLowerCase() === model));
        if (matches.length === 1) instrumentId = matches[0]!.id;
        else fail(rowNo, 'instrument_serial', matches.length === 0 ? `No gaussmeter with serial ${cell('instrument_serial')}.` : 'Several gaussmeters share that serial: give instrument_model too.');
      }

      // Values.
      let magnitudeT = tesla(magnitudeCol);
      const bxT = tesla(bxCol);
      const byT = tesla(byCol);
      const bzT = tesla(bzCol);
      const anyComponent = bxT !== null || byT !== null || bzT !== null;
      if (magnitudeT === null && !anyComponent) magnitudeT = tesla(fieldCol);
      const unit = (cell('unit_entered') || 'mT') as z.infer<typeof FieldUnitSchema>;
      if (!(FIELD_UNITS as readonly string[]).includes(unit)) fail(rowNo, 'unit_entered', `unit_entered must be one of ${FIELD_UNITS.join(', ')}.`);
      const orientation = cell('probe_orientation') || 'other';
      if (!(PROBE_ORIENTATIONS as readonly string[]).includes(orientation)) fail(rowNo, 'probe_orientation', `probe_orientation must be one of ${PROBE_ORIENTATIONS.join(', ')}.`);
      const heightM = has('probe_height_m') && cell('probe_height_m') !== '' ? number('probe_height_m', false, 0) : (stationHeightM ?? 1);
      const backgroundT = tesla(backgroundCol);
      const zeroedText = cell('zeroed').toLowerCase();
      if (!['', 'true', 'false', 'yes', 'no', '1', '0'].includes(zeroedText)) fail(rowNo, 'zeroed', 'zeroed must be true or false.');
      const zeroed = ['true', 'yes', '1'].includes(zeroedText);
      const measuredText = cell('measured_at');
      const measured = new Date(measuredText);
      if (!measuredText) fail(rowNo, 'measured_at', 'Give the time of the reading (ISO 8601, e.g. 2026-11-17T09:30:00Z).');
      else if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/.test(measuredText) || Number.isNaN(measured.getTime()))
        fail(rowNo, 'measured_at', `measured_at “${measuredText}” is not an ISO 8601 time with a zone (e.g. 2026-11-17T09:30:00Z).`);
      const notes = cell('notes') ? unprotectCell(raw['notes'] ?? '').trim() : null;

      if (errors.length > before || !levelId || xM === null || yM === null || !surveyor) {
        bad.add(rowNo);
        return;
      }

      // The same checks a pushed reading passes.
      const readingId = uuidv7();
      let stationId: string | null = null;
      const givenStation = cell('station_id');
      if (givenStation && stationById.has(givenStation)) stationId = givenStation;
      const key = stationKey(levelId, label, xM, yM);
      if (!stationId) stationId = stationByKey.get(key) ?? null;
      const check = FieldReadingSchema.safeParse({
        id: readingId,
        organisationId,
        revision: 1,
        deleted: false,
        surveyId,
        stationId: stationId ?? uuidv7(),
        walkId: null,
        instrumentId,
        surveyorUserId: surveyor.userId,
        magnitudeT,
        bxT,
        byT,
        bzT,
        unit,
        probeOrientation: orientation,
        heightM,
        backgroundT,
        zeroed,
        measuredAt: measured.toISOString(),
        notes,
        photoObjectKey: null,
        photoSha256: null,
      });
      if (!check.success) {
        for (const issue of check.error.issues) fail(rowNo, columnOf(String(issue.path[0] ?? '')), issue.message);
        return;
      }
      if (!stationId) {
        stationId = uuidv7();
        const room = roomForPoint(
          rooms.filter((r) => r.levelId === levelId),
          xM,
          yM,
        );
        newStations.push({ id: stationId, organisationId, surveyId, levelId, walkId: null, roomId: room?.id ?? null, label, xM, yM, heightM: stationHeightM ?? 1, createdByUserId: ctx.actorUserId, notes: null, changeSeq: 0 });
        stationByKey.set(key, stationId);
      }
      const dupKey = readingKey(stationId, surveyor.userId, measured.getTime(), [magnitudeT, bxT, byT, bzT]);
      if (seenReadings.has(dupKey)) {
        fail(rowNo, null, 'This reading is already in the survey (same station, surveyor, time and value).');
        return;
      }
      seenReadings.add(dupKey);
      newReadings.push({
        id: readingId,
        organisationId,
        surveyId,
        stationId,
        walkId: null,
        instrumentId,
        surveyorUserId: surveyor.userId,
        magnitudeT,
        bxT,
        byT,
        bzT,
        unit,
        probeOrientation: orientation as FieldReadingInsert['probeOrientation'],
        heightM: heightM!,
        backgroundT,
        zeroed,
        measuredAt: measured,
        notes,
        changeSeq: 0,
      });
      // Remember which rows made which records, for `valid` mode.
      rowOf.set(readingId, rowNo);
    });

    // A station is only created if a good row uses it.
    const goodReadings = newReadings.filter((r) => !bad.has(rowOf.get(r.id!)!));
    const usedStations = new Set(goodReadings.map((r) => r.stationId));
    const goodStations = newStations.filter((s) => usedStations.has(s.id!));
    const commit = mode === 'valid' || (mode === 'all' && bad.size === 0);
    if (mode === 'all' && bad.size > 0) {
      const report = finish({ rows: rows.length, bad, errors, mode, committed: false, readings: 0, stations: 0 });
      throw new AppError('VALIDATION_FAILED', `${bad.size} of ${rows.length} rows have problems: nothing was imported. Fix them, or import the good rows only.`, { report });
    }
    if (!commit || goodReadings.length === 0) return finish({ rows: rows.length, bad, errors, mode, committed: false, readings: 0, stations: 0 });
    const done = await repo.importRecords(organisationId, surveyId, goodStations, goodReadings, ctx, (locked) => {
      if (locked.state !== 'open') throw new AppError('SURVEY_NOT_OPEN', 'The survey was closed while the file was checked: nothing was imported.', { state: locked.state });
    });
    if (!done) throw notFound('That survey');
    return finish({ rows: rows.length, bad, errors, mode, committed: true, readings: done.readings, stations: done.stations });
  }

  return { exportCsv, importCsv };
}

function columnOf(field: string): string | null {
  const map: Record<string, string> = { magnitudeT: 'magnitude_mT', bxT: 'bx_mT', byT: 'by_mT', bzT: 'bz_mT', heightM: 'probe_height_m', backgroundT: 'background_mT', notes: 'notes', measuredAt: 'measured_at', unit: 'unit_entered', probeOrientation: 'probe_orientation' };
  return map[field] ?? (field || null);
}

function finish(r: { rows: number; bad: Set<number>; errors: ImportReport['errors']; mode: ImportReport['mode']; committed: boolean; readings: number; stations: number }): ImportReport {
  const errors = [...r.errors].sort((a, b) => a.row - b.row);
  return {
    mode: r.mode,
    rows: r.rows,
    goodRows: r.rows - r.bad.size,
    badRows: r.bad.size,
    errors,
    committed: r.committed,
    importedReadings: r.readings,
    createdStations: r.stations,
  };
}
