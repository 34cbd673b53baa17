/**
 * The reviewer's rules (issue 7 §3, §4, §7).
 *
 * - Decisions: admins and reviewers of the organisation decide on readings and sweeps of a survey that
 *   is open or submitted (a signed-off survey is read-only: SURVEY_NOT_OPEN). `remeasure` and
 *   `rejected` need a note. A reading has one live decision: deciding again writes a new revision of it
 *   (the audit log keeps every earlier verdict). Decisions are synced records, so a surveyor's device
 *   pulls a re-measure request and shows it at the station; the reading's surveyor is also e-mailed.
 * - Submit: an open survey goes to `submitted` (admins, reviewers, or a surveyor assigned to it); the
 *   survey's reviewers are e-mailed (the organisation's reviewers when it has none assigned). Capture
 *   stops: sync refuses pushes into a survey that is not open.
 * - Sign-off: only a submitted survey with at least one reading, every reading and sweep accepted or
 *   rejected (none undecided, none waiting for re-measure) and no open sync conflict. It records who,
 *   when and the SHA-256 of the report's data (shared/schemas/review.ts says what is hashed), makes the
 *   survey read-only, and e-mails the team.
 * - Reopen: a submitted or signed-off survey goes back to `open` (admins and reviewers, with a reason);
 *   the audit log keeps the reason and the sign-off it undid.
 */
import { createHash } from 'node:crypto';
import { classifyField, createZoneSet, GENERAL_SAFETY_CAUTIONS, type ZoneSet } from '../../../shared/physics';
import type { Role } from '../../../shared/schemas/common';
import type { DecisionsInput, ReportData, ReviewReading, ReviewReadings, ReviewStatus, SignOffBlocker, SurveyReport } from '../../../shared/schemas/review';
import { canonicalJson } from '../../../shared/review/canonical-json';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { escapeHtml, type Mailer } from '../../lib/mail';
import type { DecisionRow, ReviewRepository, SurveyRow } from './review.repository';

export interface ReviewActor {
  organisationId: string;
  userId: string;
  role: Role;
}

export const REVIEW_ROLES = ['admin', 'reviewer'] as const satisfies readonly Role[];
export const SUBMIT_ROLES = ['admin', 'reviewer', 'surveyor'] as const satisfies readonly Role[];

export const REPORT_HASH_SCHEME = 'fringewalk-report-v1: SHA-256 of RFC 8785 canonical JSON of data' as const;

/** SHA-256 (hex) of the UTF-8 bytes of the report data's canonical JSON. */
export function reportDataSha256(data: ReportData): string {
  return createHash('sha256').update(canonicalJson(data), 'utf8').digest('hex');
}

type ZoneRow = { id: string; name: string; edition: string; thresholds: { name: string; fieldT: number; caution: string }[] };

function physicsZoneSet(zone: ZoneRow | null): ZoneSet | null {
  if (!zone || zone.thresholds.length === 0) return null;
  const thresholds = [...zone.thresholds].sort((a, b) => a.fieldT - b.fieldT);
  try {
    return createZoneSet({
      id: zone.id,
      name: zone.name,
      follows: zone.edition,
      belowLabel: `Below the lowest line (${thresholds[0]!.name})`,
      thresholds: thresholds.map((t, i) => ({ id: `${zone.id}-${i}`, label: t.name, thresholdTesla: t.fieldT, source: zone.edition, caution: t.caution || zone.edition, recalled: false })),
    });
  } catch {
    return null;
  }
}

function classOf(fieldT: number | null, zone: ZoneSet | null) {
  if (fieldT === null || !zone || !Number.isFinite(fieldT) || fieldT < 0) return null;
  const c = classifyField(fieldT, zone);
  return { index: c.zoneIndex, label: c.label };
}

const iso = (d: Date) => d.toISOString();
const dateOf = (d: Date) => d.toISOString().slice(0, 10);

function decisionKey(d: DecisionRow) {
  return (d.fieldReadingId ?? d.sweepId)!;
}

function stateWords(state: SurveyRow['state']) {
  return state === 'signed_off' ? 'signed off' : state;
}

export function createReviewService(deps: { repo: ReviewRepository; mailer: Mailer; publicUrl: string; logger: Logger }) {
  const { repo, mailer, publicUrl, logger } = deps;

  async function requireSurvey(organisationId: string, surveyId: string): Promise<SurveyRow> {
    const survey = await repo.findSurvey(organisationId, surveyId);
    if (!survey) throw notFound('That survey');
    return survey;
  }

  type SurveyData = Awaited<ReturnType<ReviewRepository['surveyData']>>;

  function blockersOf(survey: SurveyRow, data: SurveyData): SignOffBlocker[] {
    const out: SignOffBlocker[] = [];
    if (survey.state === 'signed_off') return [{ code: 'signed_off', message: 'The survey is already signed off.', count: 0 }];
    if (survey.state !== 'submitted') out.push({ code: 'not_submitted', message: 'Submit the survey for review first.', count: 0 });
    const total = data.readings.length + data.sweeps.length;
    if (total === 0) out.push({ code: 'no_readings', message: 'The survey has no readings to sign off.', count: 0 });
    const live = new Map(data.decisions.map((d) => [decisionKey(d), d]));
    const ids = [...data.readings.map((r) => r.reading.id), ...data.sweeps.map((s) => s.sweep.id)];
    const undecided = ids.filter((id) => !live.has(id)).length;
    const remeasure = ids.filter((id) => live.get(id)?.verdict === 'remeasure').length;
    if (undecided > 0) out.push({ code: 'undecided', message: `${undecided} ${undecided === 1 ? 'reading has' : 'readings have'} no decision yet.`, count: undecided });
    if (remeasure > 0) out.push({ code: 'remeasure', message: `${remeasure} ${remeasure === 1 ? 'reading waits' : 'readings wait'} for re-measurement: accept or reject ${remeasure === 1 ? 'it' : 'them'} once the new reading is in.`, count: remeasure });
    if (data.conflicts.length > 0) out.push({ code: 'open_conflicts', message: `${data.conflicts.length} sync ${data.conflicts.length === 1 ? 'conflict is' : 'conflicts are'} open: choose a revision for each.`, count: data.conflicts.length });
    return out;
  }

  function statusOf(survey: SurveyRow, data: SurveyData): ReviewStatus {
    const names = new Map(data.people.map((p) => [p.userId, p.name]));
    const ref = (id: string | null) => (id ? { userId: id, name: names.get(id) ?? 'Unknown person' } : null);
    return {
      surveyId: survey.id,
      name: survey.name,
      siteName: data.site?.name ?? '',
      state: survey.state,
      revision: survey.revision,
      submittedAt: survey.submittedAt ? iso(survey.submittedAt) : null,
      submittedBy: ref(survey.submittedByUserId),
      signedOffAt: survey.signedOffAt ? iso(survey.signedOffAt) : null,
      signedOffBy: ref(survey.signedOffByUserId),
      reportSha256: survey.reportSha256,
      signOffBlockers: blockersOf(survey, data),
      openConflicts: data.conflicts.length,
    };
  }

  function reviewRows(data: SurveyData): ReviewReading[] {
    const zone = physicsZoneSet(data.zoneSet);
    const people = new Map(data.people.map((p) => [p.userId, p.name]));
    const levelNames = new Map(data.levels.map((l) => [l.id, l.name]));
    const roomNames = new Map(data.rooms.map((r) => [r.id, r.name]));
    const instrumentsById = new Map(data.instruments.map((i) => [i.id, i]));
    const live = new Map(data.decisions.map((d) => [decisionKey(d), d]));
    const conflicted = new Set(data.conflicts.map((c) => c.recordId));
    const decisionView = (id: string) => {
      const d = live.get(id);
      return d
        ? { id: d.id, verdict: d.verdict, note: d.note, reviewerUserId: d.reviewerUserId, reviewerName: people.get(d.reviewerUserId) ?? 'Unknown person', decidedAt: iso(d.decidedAt), revision: d.revision }
        : null;
    };
    const instrumentOf = (id: string | null, measuredAt: Date) => {
      const inst = id ? instrumentsById.get(id) : undefined;
      return {
        instrumentId: id,
        instrumentLabel: inst ? `${inst.model} · ${inst.serial}` : null,
        calibrationDueOn: inst?.calibrationDueOn ?? null,
        calibrationOverdue: Boolean(inst?.calibrationDueOn && inst.calibrationDueOn < dateOf(measuredAt)),
      };
    };
    const rows: ReviewReading[] = [];
    for (const { reading: r, stationLabel, levelId, roomId, attachmentArrived } of data.readings) {
      rows.push({
        id: r.id,
        kind: 'field_reading',
        revision: r.revision,
        stationId: r.stationId,
        stationLabel,
        levelId,
        levelName: levelNames.get(levelId) ?? '',
        roomId,
        roomName: roomId ? (roomNames.get(roomId) ?? null) : null,
        surveyorUserId: r.surveyorUserId,
        surveyorName: people.get(r.surveyorUserId) ?? 'Unknown person',
        ...instrumentOf(r.instrumentId, r.measuredAt),
        measuredAt: iso(r.measuredAt),
        fieldT: r.fieldT,
        enteredUnit: r.unit,
        sweep: null,
        safetyClass: classOf(r.fieldT, zone),
        notes: r.notes,
        conflicted: conflicted.has(r.id),
        attachmentPending: r.photoObjectKey !== null && !attachmentArrived,
        decision: decisionView(r.id),
      });
    }
    for (const { sweep: s, stationLabel, levelId, roomId, attachmentArrived } of data.sweeps) {
      const strongest = s.peaks.length ? Math.max(...s.peaks.map((p) => p.levelDbm)) : null;
      rows.push({
        id: s.id,
        kind: 'sweep',
        revision: s.revision,
        stationId: s.stationId,
        stationLabel,
        levelId,
        levelName: levelNames.get(levelId) ?? '',
        roomId,
        roomName: roomId ? (roomNames.get(roomId) ?? null) : null,
        surveyorUserId: s.surveyorUserId,
        surveyorName: people.get(s.surveyorUserId) ?? 'Unknown person',
        ...instrumentOf(s.analyserId, s.measuredAt),
        measuredAt: iso(s.measuredAt),
        fieldT: null,
        enteredUnit: null,
        sweep: { startHz: s.startHz, stopHz: s.stopHz, peakCount: s.peaks.length, strongestPeakDbm: strongest },
        safetyClass: null,
        notes: s.notes,
        conflicted: conflicted.has(s.id),
        attachmentPending: s.traceObjectKey !== null && !attachmentArrived,
        decision: decisionView(s.id),
      });
    }
    return rows;
  }

  /** The report's data: everything it states, each number with the reading, instrument and person behind it. */
  function reportData(survey: SurveyRow, data: SurveyData): ReportData {
    const zone = physicsZoneSet(data.zoneSet);
    const live = new Map(data.decisions.map((d) => [decisionKey(d), d]));
    const decisionOf = (id: string) => {
      const d = live.get(id);
      return d ? { id: d.id, verdict: d.verdict, note: d.note, reviewerUserId: d.reviewerUserId, decidedAt: iso(d.decidedAt) } : null;
    };
    const byId = <T extends { id: string }>(a: T, b: T) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
    const readings = data.readings.map(({ reading: r }) => ({
      id: r.id,
      revision: r.revision,
      stationId: r.stationId,
      surveyorUserId: r.surveyorUserId,
      instrumentId: r.instrumentId,
      measuredAt: iso(r.measuredAt),
      fieldT: r.fieldT ?? 0,
      magnitudeT: r.magnitudeT,
      bxT: r.bxT,
      byT: r.byT,
      bzT: r.bzT,
      unit: r.unit,
      probeOrientation: r.probeOrientation,
      heightM: r.heightM,
      backgroundT: r.backgroundT,
      zeroed: r.zeroed,
      notes: r.notes,
      safetyClass: classOf(r.fieldT, zone),
      decision: decisionOf(r.id),
    }));
    const stationRoom = new Map(data.stations.map((s) => [s.id, s.roomId]));
    // A room's class: the highest |B| among its readings that were not rejected.
    const roomMax = new Map<string, number>();
    for (const r of readings) {
      const roomId = stationRoom.get(r.stationId);
      if (!roomId || r.decision?.verdict === 'rejected') continue;
      roomMax.set(roomId, Math.max(roomMax.get(roomId) ?? 0, r.fieldT));
    }
    const lastUse = new Map<string, { at: Date; count: number }>();
    const use = (id: string | null, at: Date) => {
      if (!id) return;
      const u = lastUse.get(id);
      lastUse.set(id, { at: u && u.at > at ? u.at : at, count: (u?.count ?? 0) + 1 });
    };
    data.readings.forEach(({ reading: r }) => use(r.instrumentId, r.measuredAt));
    data.sweeps.forEach(({ sweep: s }) => {
      use(s.analyserId, s.measuredAt);
      use(s.antennaId, s.measuredAt);
    });
    const times = data.readings.map(({ reading: r }) => r.measuredAt.getTime()).concat(data.sweeps.map(({ sweep: s }) => s.measuredAt.getTime()));
    const cautions = [...(data.zoneSet?.thresholds ?? []).map((t) => `${t.name}: ${t.caution}`).filter((c) => c.trim().length > 0), ...GENERAL_SAFETY_CAUTIONS];
    return {
      hashScheme: REPORT_HASH_SCHEME,
      survey: {
        id: survey.id,
        name: survey.name,
        startsOn: survey.startsOn,
        endsOn: survey.endsOn,
        notes: survey.notes,
        species: survey.species,
        maxHarmonic: survey.maxHarmonic,
        repeatRadiusM: survey.repeatRadiusM,
      },
      site: data.site ? { id: data.site.id, name: data.site.name, address: data.site.address } : { id: survey.siteId, name: '', address: null },
      zoneSet: data.zoneSet ? { id: data.zoneSet.id, name: data.zoneSet.name, edition: data.zoneSet.edition, thresholds: [...data.zoneSet.thresholds].sort((a, b) => a.fieldT - b.fieldT).map((t) => ({ name: t.name, fieldT: t.fieldT, caution: t.caution })) } : null,
      levels: data.levels.map((l) => ({ id: l.id, name: l.name })),
      rooms: data.rooms.map((r) => ({ id: r.id, name: r.name, levelId: r.levelId, maxFieldT: roomMax.get(r.id) ?? null, highestClass: classOf(roomMax.get(r.id) ?? null, zone) })).sort(byId),
      people: data.people.map((p) => ({ userId: p.userId, name: p.name, email: p.email })).sort((a, b) => (a.userId < b.userId ? -1 : 1)),
      instruments: data.instruments
        .map((i) => {
          const u = lastUse.get(i.id);
          const calibration: 'in_date' | 'overdue' | 'unknown' = !i.calibrationDueOn ? 'unknown' : u && i.calibrationDueOn < dateOf(u.at) ? 'overdue' : 'in_date';
          return {
            id: i.id,
            kind: i.kind,
            model: i.model,
            serial: i.serial,
            probe: i.probe,
            calibratedOn: i.calibratedOn,
            calibrationDueOn: i.calibrationDueOn,
            calibrationCertificate: i.calibrationCertificate,
            relativeUncertainty: i.relativeUncertainty,
            calibration,
            readingCount: u?.count ?? 0,
          };
        })
        .sort(byId),
      method: {
        fieldReadingCount: data.readings.length,
        sweepCount: data.sweeps.length,
        stationCount: data.stations.length,
        probeOrientations: [...new Set(data.readings.map(({ reading: r }) => r.probeOrientation))].sort(),
        enteredUnits: [...new Set(data.readings.map(({ reading: r }) => r.unit))].sort(),
        firstMeasuredAt: times.length ? new Date(Math.min(...times)).toISOString() : null,
        lastMeasuredAt: times.length ? new Date(Math.max(...times)).toISOString() : null,
        zeroedCount: data.readings.filter(({ reading: r }) => r.zeroed).length,
      },
      stations: data.stations.map((s) => ({ id: s.id, label: s.label, levelId: s.levelId, roomId: s.roomId, xM: s.xM, yM: s.yM, heightM: s.heightM })).sort(byId),
      readings: readings.sort(byId),
      sweeps: data.sweeps
        .map(({ sweep: s }) => ({
          id: s.id,
          revision: s.revision,
          stationId: s.stationId,
          surveyorUserId: s.surveyorUserId,
          analyserId: s.analyserId,
          antennaId: s.antennaId,
          measuredAt: iso(s.measuredAt),
          startHz: s.startHz,
          stopHz: s.stopHz,
          rbwHz: s.rbwHz,
          detector: s.detector,
          peaks: s.peaks.map((p) => ({ frequencyHz: p.frequencyHz, levelDbm: p.levelDbm })),
          notes: s.notes,
          decision: decisionOf(s.id),
        }))
        .sort(byId),
      flags: data.flags
        .map((f) => ({
          id: f.id,
          kind: f.kind,
          state: f.state,
          severity: f.severity,
          roomId: f.roomId,
          stationId: f.stationId,
          species: f.species,
          harmonic: f.harmonic,
          details: f.details,
          acknowledgementNote: f.acknowledgementNote,
          resolution: f.resolution,
        }))
        .sort(byId),
      submitted: survey.submittedAt && survey.submittedByUserId ? { at: iso(survey.submittedAt), byUserId: survey.submittedByUserId } : null,
      cautions,
    };
  }

  async function status(organisationId: string, surveyId: string): Promise<ReviewStatus> {
    const survey = await requireSurvey(organisationId, surveyId);
    return statusOf(survey, await repo.surveyData(organisationId, survey));
  }

  function surveyLink(surveyId: string, page = '') {
    return `${publicUrl.replace(/\/$/, '')}/surveys/${surveyId}${page}`;
  }

  async function sendAll(mails: { to: string; subject: string; text: string; html: string }[], what: string, surveyId: string): Promise<string[]> {
    const sent: string[] = [];
    for (const mail of mails) {
      try {
        await mailer.send(mail);
        sent.push(mail.to);
      } catch (error) {
        // The decision or state change stands; `mailed` in the answer shows who was not told.
        logger.error({ err: error, surveyId, to: mail.to }, `${what} e-mail failed`);
      }
    }
    return sent;
  }

  return {
    status,

    async readings(organisationId: string, surveyId: string): Promise<ReviewReadings> {
      const survey = await requireSurvey(organisationId, surveyId);
      const data = await repo.surveyData(organisationId, survey);
      return {
        status: statusOf(survey, data),
        zoneSet: data.zoneSet ? { name: data.zoneSet.name, edition: data.zoneSet.edition, thresholds: [...data.zoneSet.thresholds].sort((a, b) => a.fieldT - b.fieldT).map((t) => ({ name: t.name, fieldT: t.fieldT })) } : null,
        readings: reviewRows(data),
      };
    },

    async decide(actor: ReviewActor, surveyId: string, input: DecisionsInput, ctx: AuditContext) {
      const ids = [...new Set(input.readingIds)];
      const note = input.note ? input.note : null;
      const out = await repo.withLockedSurvey(actor.organisationId, surveyId, async (tx, survey) => {
        if (survey.state === 'signed_off') throw new AppError('SURVEY_NOT_OPEN', 'The survey is signed off: reopen it to change decisions.', { state: survey.state });
        const targets = await repo.targets(tx, actor.organisationId, surveyId, ids);
        const known = new Map<string, { kind: 'field_reading' | 'sweep'; surveyorUserId: string; stationId: string }>();
        targets.readings.forEach((r) => known.set(r.id, { kind: 'field_reading', surveyorUserId: r.surveyorUserId, stationId: r.stationId }));
        targets.sweeps.forEach((s) => known.set(s.id, { kind: 'sweep', surveyorUserId: s.surveyorUserId, stationId: s.stationId }));
        const missing = ids.filter((id) => !known.has(id));
        if (missing.length > 0) throw new AppError('NOT_FOUND', `${missing.length === 1 ? 'A reading was' : `${missing.length} readings were`} not found in this survey.`, { readingIds: missing.slice(0, 50) });
        const live = new Map(targets.live.map((d) => [decisionKey(d), d]));
        const decidedAt = new Date();
        const written: { id: string; readingId: string; verdict: DecisionRow['verdict']; revision: number }[] = [];
        let unchanged = 0;
        const remeasured: { surveyorUserId: string; stationId: string }[] = [];
        for (const id of ids) {
          const target = known.get(id)!;
          const before = live.get(id);
          if (before && before.verdict === input.verdict && (before.note ?? null) === note) {
            unchanged += 1;
            continue;
          }
          const patch = { verdict: input.verdict, note, reviewerUserId: actor.userId, decidedAt };
          const row = before
            ? await repo.updateDecision(tx, before, patch, ctx)
            : await repo.createDecision(tx, actor.organisationId, { surveyId, fieldReadingId: target.kind === 'field_reading' ? id : null, sweepId: target.kind === 'sweep' ? id : null, ...patch }, ctx);
          written.push({ id: row.id, readingId: id, verdict: row.verdict, revision: row.revision });
          if (input.verdict === 'remeasure') remeasured.push({ surveyorUserId: target.surveyorUserId, stationId: target.stationId });
        }
        return { survey, written, unchanged, remeasured };
      });
      if (!out) throw notFound('That survey');
      let mailed: string[] = [];
      if (out.remeasured.length > 0) {
        const bySurveyor = new Map<string, number>();
        for (const r of out.remeasured) bySurveyor.set(r.surveyorUserId, (bySurveyor.get(r.surveyorUserId) ?? 0) + 1);
        const people = await repo.usersById([...bySurveyor.keys()]);
        const link = surveyLink(surveyId);
        mailed = await sendAll(
          people.map((p) => {
            const n = bySurveyor.get(p.userId)!;
            const what = `${n} of your ${n === 1 ? 'reading' : 'readings'} in “${out.survey.name}”`;
            const text = `Hello ${p.name},\n\nA reviewer asked for ${what} to be measured again.\n\nReviewer's note: ${note}\n\nThe request shows at the station in capture once your device has synced: ${link}\n\nFollow the site's access rules for strong-field areas.\n`;
            const html = `<p>Hello ${escapeHtml(p.name)},</p><p>A reviewer asked for ${escapeHtml(what)} to be measured again.</p><p>Reviewer's note: ${escapeHtml(note ?? '')}</p><p>The request shows at the station in capture once your device has synced: <a href="${escapeHtml(link)}">open the survey</a>.</p><p>Follow the site's access rules for strong-field areas.</p>`;
            return { to: p.email, subject: `Re-measure requested: ${out.survey.name}`, text, html };
          }),
          're-measure',
          surveyId,
        );
      }
      return { decided: out.written.length, unchanged: out.unchanged, decisions: out.written, mailed };
    },

    async submit(actor: ReviewActor, surveyId: string, ctx: AuditContext): Promise<ReviewStatus> {
      if (actor.role === 'surveyor') {
        const team = await repo.team(actor.organisationId, surveyId);
        if (!team.some((m) => m.userId === actor.userId && m.as === 'surveyor')) {
          if (!(await repo.findSurvey(actor.organisationId, surveyId))) throw notFound('That survey');
          throw new AppError('NOT_ASSIGNED', 'Only a surveyor assigned to this survey may submit it.');
        }
      }
      const out = await repo.withLockedSurvey(actor.organisationId, surveyId, async (tx, survey) => {
        if (survey.state !== 'open') throw new AppError('SURVEY_NOT_OPEN', `The survey is ${stateWords(survey.state)} already.`, { state: survey.state });
        return repo.updateSurvey(tx, survey, { state: 'submitted', submittedAt: new Date(), submittedByUserId: actor.userId }, ctx, 'submit');
      });
      if (!out) throw notFound('That survey');
      const team = await repo.team(actor.organisationId, surveyId);
      let reviewers = team.filter((m) => m.as === 'reviewer');
      if (reviewers.length === 0) reviewers = (await repo.membersWithRoles(actor.organisationId, ['reviewer'])).map((m) => ({ ...m, as: 'reviewer' as const }));
      const [submitter] = await repo.usersById([actor.userId]);
      const link = surveyLink(surveyId, '/review');
      const mailed = await sendAll(
        reviewers.map((r) => ({
          to: r.email,
          subject: `Survey submitted for review: ${out.name}`,
          text: `Hello ${r.name},\n\n${submitter?.name ?? 'Someone'} submitted “${out.name}” for review. Capture has stopped; decide on its readings and sign it off here: ${link}\n`,
          html: `<p>Hello ${escapeHtml(r.name)},</p><p>${escapeHtml(submitter?.name ?? 'Someone')} submitted “${escapeHtml(out.name)}” for review. Capture has stopped; decide on its readings and sign it off <a href="${escapeHtml(link)}">in the review screen</a>.</p>`,
        })),
        'submission',
        surveyId,
      );
      return { ...(await status(actor.organisationId, surveyId)), mailed };
    },

    async signOff(actor: ReviewActor, surveyId: string, ctx: AuditContext): Promise<ReviewStatus> {
      const out = await repo.withLockedSurvey(actor.organisationId, surveyId, async (tx, survey) => {
        const data = await repo.surveyDataIn(tx, actor.organisationId, survey);
        const blockers = blockersOf(survey, data);
        if (blockers.length > 0) {
          const code = survey.state === 'signed_off' ? 'SURVEY_NOT_OPEN' : 'CONFLICT';
          throw new AppError(code, `The survey cannot be signed off yet: ${blockers.map((b) => b.message).join(' ')}`, { blockers });
        }
        const sha = reportDataSha256(reportData(survey, data));
        return repo.updateSurvey(tx, survey, { state: 'signed_off', signedOffAt: new Date(), signedOffByUserId: actor.userId, reportSha256: sha }, ctx, 'sign_off');
      });
      if (!out) throw notFound('That survey');
      const team = await repo.team(actor.organisationId, surveyId);
      const unique = [...new Map(team.map((m) => [m.userId, m])).values()];
      const [signer] = await repo.usersById([actor.userId]);
      const link = surveyLink(surveyId, '/report');
      const mailed = await sendAll(
        unique.map((m) => ({
          to: m.email,
          subject: `Survey signed off: ${out.name}`,
          text: `Hello ${m.name},\n\n${signer?.name ?? 'A reviewer'} signed off “${out.name}” on ${out.signedOffAt!.toISOString()}. The survey is now read-only.\n\nReport: ${link}\nReport data SHA-256: ${out.reportSha256}\n`,
          html: `<p>Hello ${escapeHtml(m.name)},</p><p>${escapeHtml(signer?.name ?? 'A reviewer')} signed off “${escapeHtml(out.name)}” on ${escapeHtml(out.signedOffAt!.toISOString())}. The survey is now read-only.</p><p><a href="${escapeHtml(link)}">Open the report</a></p><p>Report data SHA-256: <code>${escapeHtml(out.reportSha256 ?? '')}</code></p>`,
        })),
        'sign-off',
        surveyId,
      );
      return { ...(await status(actor.organisationId, surveyId)), mailed };
    },

    async reopen(actor: ReviewActor, surveyId: string, reason: string, ctx: AuditContext): Promise<ReviewStatus> {
      const out = await repo.withLockedSurvey(actor.organisationId, surveyId, async (tx, survey) => {
        if (survey.state === 'open') throw new AppError('CONFLICT', 'The survey is open already.', { state: survey.state });
        const undone = { state: survey.state, submittedAt: survey.submittedAt, submittedByUserId: survey.submittedByUserId, signedOffAt: survey.signedOffAt, signedOffByUserId: survey.signedOffByUserId, reportSha256: survey.reportSha256 };
        const row = await repo.updateSurvey(tx, survey, { state: 'open', submittedAt: null, submittedByUserId: null, signedOffAt: null, signedOffByUserId: null, reportSha256: null }, ctx, 'reopen');
        await repo.audit(tx, { organisationId: actor.organisationId, actorUserId: actor.userId, action: 'reopen_reason', entity: 'surveys', entityId: surveyId, before: undone, after: { reason }, requestId: ctx.requestId ?? null });
        return row;
      });
      if (!out) throw notFound('That survey');
      return status(actor.organisationId, surveyId);
    },

    async report(organisationId: string, surveyId: string): Promise<SurveyReport> {
      const survey = await requireSurvey(organisationId, surveyId);
      const data = await repo.surveyData(organisationId, survey);
      const report = reportData(survey, data);
      return { status: statusOf(survey, data), data: report, dataSha256: reportDataSha256(report) };
    },

    /** For the CSV export: the review rows plus the station coordinates and people's e-mails. */
    async exportData(organisationId: string, surveyId: string) {
      const survey = await requireSurvey(organisationId, surveyId);
      const data = await repo.surveyData(organisationId, survey);
      return { survey, data, rows: reviewRows(data) };
    },

    requireSurvey,
  };
}

export type ReviewService = ReturnType<typeof createReviewService>;
