/**
 * Predicted lines per room and the flags they raise (issue 8 §2–§3), with shared/emc/room-lines.ts
 * doing the arithmetic.
 *
 * Which readings: while a survey is open, every live reading at a station in the room that its latest
 * decision does not reject (the room is then marked provisional unless all of them are accepted); once
 * submitted or signed off, only accepted readings.
 *
 * Flags are recomputed idempotently by the flag job (emc-flag-job.ts), never on a read: one
 * `line_in_band` flag per room × watch band × species × harmonic (the fingerprint), rewritten only when
 * its numbers change. When a flag's line no longer reaches its band (a reading rejected, a band edited),
 * a flag still `open` is withdrawn (tombstoned, audited as "withdraw"); one a person has acknowledged or
 * resolved stays as they left it — their record of what they did. Acknowledge and resolve are audited.
 * A signed-off survey's flags are not recomputed: the sign-off hash covers them.
 */
import { BUILT_IN_SPECIES, type BuiltInSpeciesId } from '../../../shared/physics/species';
import {
  atVictim,
  bandHits,
  DEFAULT_VICTIM_DISTANCE_M,
  emissionAtVictim,
  predictedBands,
  roomFieldInterval,
  type EmissionAtVictim,
  type FieldInterval,
  type PredictedBand,
} from '../../../shared/emc/room-lines';
import type { EmcFlag, EmcFlagDetails, EmcRoom } from '../../../shared/schemas/emc';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { escapeHtml, type Mailer } from '../../lib/mail';
import type { EmcRepository, FlagRow, FlagValues, SurveyRow } from './emc.repository';

const SYSTEM: AuditContext = { actorUserId: null, requestId: 'emc-flag-job' };

const speciesName = (s: string) => BUILT_IN_SPECIES[s as BuiltInSpeciesId]?.name ?? s;
export const lineLabel = (species: string, harmonic: number) => `${speciesName(species)} line n = ${harmonic}`;
/** JSON with every object's keys in sorted order: jsonb does not keep key order, so stored details come back reordered. */
const sortedJson = (value: unknown) =>
  JSON.stringify(value, (_key, v: unknown) => (v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.keys(v).sort().map((k) => [k, (v as Record<string, unknown>)[k]])) : v));
const mhz = (hz: number) => `${(hz / 1e6).toPrecision(6)} MHz`;

interface RoomPrediction {
  room: { id: string; levelId: string; name: string; use: string | null; sensitivity: string };
  interval: FieldInterval | null;
  provisional: boolean;
  lines: PredictedBand[];
  emitters: { name: string; electronDensityPerM3: number; electronEnergyEv: number; energyKind: 'total' | 'perpendicular'; volumeM3: number }[];
}

export function createEmcService(deps: { repo: EmcRepository; mailer: Mailer; publicUrl: string; logger: Logger }) {
  const { repo, mailer, publicUrl, logger } = deps;

  async function predict(survey: SurveyRow): Promise<{ rooms: RoomPrediction[]; bands: Awaited<ReturnType<EmcRepository['watchBands']>> }> {
    const [roomRows, fields, bands] = await Promise.all([
      repo.rooms(survey.organisationId, survey.levelIds),
      repo.roomFields(survey.organisationId, survey.id),
      repo.watchBands(survey.organisationId, survey.siteId),
    ]);
    const emitterRows = await repo.emitters(
      survey.organisationId,
      roomRows.map((r) => r.id),
    );
    const open = survey.state === 'open';
    const rooms = roomRows.map((room): RoomPrediction => {
      const used = fields.filter((f) => f.roomId === room.id && (open || f.accepted));
      const interval = roomFieldInterval(used.map((f) => ({ fieldT: f.fieldT, relativeStandardUncertainty: f.relativeUncertainty })));
      return {
        room,
        interval,
        provisional: open && used.some((f) => !f.accepted),
        lines: interval ? predictedBands(interval, survey.species as BuiltInSpeciesId[], survey.maxHarmonic) : [],
        emitters: emitterRows.filter((e) => e.roomId === room.id),
      };
    });
    return { rooms, bands };
  }

  function flagValues(survey: SurveyRow, p: RoomPrediction, hit: ReturnType<typeof bandHits<Awaited<ReturnType<EmcRepository['watchBands']>>[number]>>[number]): FlagValues {
    const emission = emissionAtVictim({
      line: hit.line,
      emitters: p.emitters,
      fieldT: p.interval!.maxReadT,
      victimDistanceM: DEFAULT_VICTIM_DISTANCE_M,
      thresholdDbWPerM2Hz: hit.band.thresholdDbWPerM2Hz,
    });
    const details: EmcFlagDetails = {
      roomName: p.room.name,
      bandName: hit.band.name,
      bandLowerHz: hit.band.lowerHz,
      bandUpperHz: hit.band.upperHz,
      lineLowHz: hit.line.lowHz,
      lineHighHz: hit.line.highHz,
      fieldLowT: p.interval!.lowT,
      fieldHighT: p.interval!.highT,
      fieldMaxReadT: p.interval!.maxReadT,
      readings: p.interval!.readings,
      provisional: p.provisional,
      emitters: p.emitters.map((e) => e.name),
      emission,
    };
    return {
      surveyId: survey.id,
      kind: 'line_in_band',
      state: 'open',
      severity: hit.band.severity,
      fingerprint: `line_in_band:${p.room.id}:${hit.band.id}:${hit.line.species}:${hit.line.harmonic}`,
      roomId: p.room.id,
      watchBandId: hit.band.id,
      species: hit.line.species as FlagValues['species'],
      harmonic: hit.line.harmonic,
      overlapLowerHz: hit.overlapLowHz,
      overlapUpperHz: hit.overlapHighHz,
      details: details as unknown as Record<string, unknown>,
    };
  }

  const sameNumbers = (a: FlagRow, b: FlagValues) =>
    a.severity === b.severity && a.overlapLowerHz === b.overlapLowerHz && a.overlapUpperHz === b.overlapUpperHz && sortedJson(a.details) === sortedJson(b.details);

  async function mailNewFlags(survey: SurveyRow, created: FlagRow[]) {
    if (created.length === 0) return;
    const team = await repo.emcTeam(survey.organisationId);
    if (team.length === 0) return;
    const link = `${publicUrl}/surveys/${survey.id}/emc`;
    const lines = created.map((f) => {
      const d = f.details as unknown as EmcFlagDetails;
      return `${lineLabel(f.species ?? '', f.harmonic ?? 1)} in ${d.bandName} (${f.severity}) — ${d.roomName}: overlap ${mhz(f.overlapLowerHz ?? 0)} to ${mhz(f.overlapUpperHz ?? 0)}${d.provisional ? ' (provisional: not all readings reviewed)' : ''}`;
    });
    const subject = created.length === 1 ? `New EMC flag in ${survey.name}` : `${created.length} new EMC flags in ${survey.name}`;
    for (const person of team) {
      try {
        await mailer.send({
          to: person.email,
          subject,
          text: [`Hello ${person.name},`, '', `Predicted cyclotron lines in "${survey.name}" now fall in watched bands:`, ...lines.map((l) => `- ${l}`), '', `Open the flags: ${link}`].join('\n'),
          html: `<p>Hello ${escapeHtml(person.name)},</p><p>Predicted cyclotron lines in “${escapeHtml(survey.name)}” now fall in watched bands:</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join('')}</ul><p><a href="${escapeHtml(link)}">Open the flags</a></p>`,
        });
      } catch (error) {
        logger.error({ err: error, surveyId: survey.id }, 'EMC flag e-mail failed');
      }
    }
  }

  function view(row: FlagRow, victimDistanceM: number): EmcFlag {
    const details = row.details as unknown as EmcFlagDetails;
    // Flags stored before the analyser comparison existed, or a different distance: work it out again.
    const stored = details.emission;
    const emission: EmissionAtVictim | null = stored
      ? victimDistanceM === stored.victimDistanceM && stored.noiseMarginDb !== undefined
        ? stored
        : atVictim(stored.emittedPowerW, stored.fieldT, { lowHz: details.lineLowHz, highHz: details.lineHighHz }, victimDistanceM, stored.thresholdDbWPerM2Hz)
      : null;
    return {
      id: row.id,
      surveyId: row.surveyId,
      kind: row.kind,
      state: row.state,
      severity: row.severity,
      roomId: row.roomId,
      watchBandId: row.watchBandId,
      species: row.species,
      harmonic: row.harmonic,
      label: row.species && row.harmonic ? lineLabel(row.species, row.harmonic) : row.kind,
      overlapLowerHz: row.overlapLowerHz,
      overlapUpperHz: row.overlapUpperHz,
      details: { ...details, emission },
      acknowledgedAt: row.acknowledgedAt?.toISOString() ?? null,
      acknowledgedByUserId: row.acknowledgedByUserId,
      acknowledgementNote: row.acknowledgementNote,
      resolvedAt: row.resolvedAt?.toISOString() ?? null,
      resolvedByUserId: row.resolvedByUserId,
      resolution: row.resolution,
      revision: row.revision,
      createdAt: row.createdAt.toISOString(),
      updatedAt: row.updatedAt.toISOString(),
    };
  }

  async function surveyOrThrow(organisationId: string, surveyId: string) {
    const survey = await repo.survey(organisationId, surveyId);
    if (!survey) throw notFound('That survey');
    return survey;
  }

  return {
    /** Recomputes one survey's line-in-band flags; returns what changed. Safe to run again at any time. */
    async recompute(organisationId: string, surveyId: string): Promise<{ created: number; updated: number; withdrawn: number }> {
      const survey = await repo.survey(organisationId, surveyId);
      // A signed-off survey is read-only, and its report's hash covers its flags: they stay as signed
      // (a reopened survey is recomputed again).
      if (!survey || survey.state === 'signed_off') return { created: 0, updated: 0, withdrawn: 0 };
      const { rooms, bands } = await predict(survey);
      const wanted = new Map<string, FlagValues>();
      for (const p of rooms) for (const hit of bandHits(p.lines, bands)) {
        const values = flagValues(survey, p, hit);
        wanted.set(values.fingerprint, values);
      }
      const result = await repo.applyFlags(
        organisationId,
        surveyId,
        (current) => {
          const byFingerprint = new Map(current.map((f) => [f.fingerprint, f]));
          const creates = [...wanted.values()].filter((v) => !byFingerprint.has(v.fingerprint));
          const updates = [...wanted.values()].flatMap((v) => {
            const before = byFingerprint.get(v.fingerprint);
            if (!before || sameNumbers(before, v)) return [];
            const { state: _keep, ...patch } = v;
            return [{ before, patch }];
          });
          const withdraw = current.filter((f) => f.state === 'open' && !wanted.has(f.fingerprint));
          return { creates, updates, withdraw };
        },
        SYSTEM,
      );
      await mailNewFlags(survey, result.created);
      return { created: result.created.length, updated: result.updated, withdrawn: result.withdrawn };
    },

    /** Each room of the survey with its field interval, predicted bands and the watch bands they touch. */
    async rooms(organisationId: string, surveyId: string): Promise<{ provisional: boolean; rooms: EmcRoom[] }> {
      const survey = await surveyOrThrow(organisationId, surveyId);
      const { rooms, bands } = await predict(survey);
      return {
        provisional: survey.state === 'open',
        rooms: rooms.map((p) => ({
          roomId: p.room.id,
          levelId: p.room.levelId,
          name: p.room.name,
          use: p.room.use,
          sensitivity: p.room.sensitivity as EmcRoom['sensitivity'],
          field: p.interval,
          provisional: p.provisional,
          lines: p.lines.map((l) => ({ ...l, label: lineLabel(l.species, l.harmonic) })),
          hits: bandHits(p.lines, bands).map((h) => ({ species: h.line.species, harmonic: h.line.harmonic, watchBandId: h.band.id, bandName: h.band.name, severity: h.band.severity, overlapLowHz: h.overlapLowHz, overlapHighHz: h.overlapHighHz })),
          emitters: p.emitters.map((e) => e.name),
        })),
      };
    },

    async flags(organisationId: string, surveyId: string, victimDistanceM = DEFAULT_VICTIM_DISTANCE_M): Promise<EmcFlag[]> {
      await surveyOrThrow(organisationId, surveyId);
      const rows = await repo.flags(organisationId, surveyId, 'line_in_band');
      const rank = { critical: 0, high: 1, medium: 2, low: 3 } as const;
      return rows.map((r) => view(r, victimDistanceM)).sort((a, b) => rank[a.severity] - rank[b.severity] || a.details.roomName.localeCompare(b.details.roomName) || a.label.localeCompare(b.label));
    },

    async acknowledge(organisationId: string, flagId: string, note: string, ctx: AuditContext): Promise<EmcFlag> {
      const before = await repo.flag(organisationId, flagId);
      if (!before) throw notFound('That flag');
      if (before.state !== 'open') throw new AppError('CONFLICT', before.state === 'acknowledged' ? 'This flag has been acknowledged already.' : 'This flag is resolved: nothing left to acknowledge.');
      const row = await repo.updateFlag(before, { state: 'acknowledged', acknowledgedAt: new Date(), acknowledgedByUserId: ctx.actorUserId, acknowledgementNote: note }, ctx, 'acknowledge');
      return view(row, DEFAULT_VICTIM_DISTANCE_M);
    },

    async resolve(organisationId: string, flagId: string, resolution: string, ctx: AuditContext): Promise<EmcFlag> {
      const before = await repo.flag(organisationId, flagId);
      if (!before) throw notFound('That flag');
      if (before.state === 'resolved') throw new AppError('CONFLICT', 'This flag is resolved already.');
      if (before.state === 'open') throw new AppError('CONFLICT', 'Acknowledge the flag first, with a note on what is being done; then resolve it.');
      const row = await repo.updateFlag(before, { state: 'resolved', resolvedAt: new Date(), resolvedByUserId: ctx.actorUserId, resolution }, ctx, 'resolve');
      return view(row, DEFAULT_VICTIM_DISTANCE_M);
    },
  };
}
export type EmcService = ReturnType<typeof createEmcService>;
