import type { Role } from '../../../shared/schemas/common';
import type { OfflineBundle } from '../../../shared/schemas/offline';
import { AppError, forbidden, notFound } from '../../lib/errors';
import type { OfflineRepository } from './offline.repository';

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

/** Where the device fetches a plan's image (served by the site-setup feature, issue 6). */
export const planImageUrl = (organisationId: string, planId: string) => `/api/orgs/${organisationId}/plans/${planId}/image?variant=device`;

export function createOfflineService(repo: OfflineRepository) {
  return {
    /**
     * The offline bundle of one survey. Admins and reviewers may take any survey of their organisation
     * offline; a surveyor only one they are assigned to (403 otherwise); other roles never (403).
     */
    async bundle(organisationId: string, surveyId: string, caller: { userId: string; role: Role }): Promise<OfflineBundle> {
      const survey = await repo.findSurvey(organisationId, surveyId);
      if (!survey) throw notFound('That survey');
      const allowed =
        caller.role === 'admin' || caller.role === 'reviewer' || (caller.role === 'surveyor' && (await repo.isAssigned(organisationId, surveyId, caller.userId, 'surveyor')));
      if (!allowed) throw forbidden();

      const data = await repo.loadBundle(organisationId, survey);
      if (!data.site) throw new AppError('CONFLICT', 'That survey’s site is missing.');
      const meta = (r: { id: string; organisationId: string; revision: number }) => ({ id: r.id, organisationId: r.organisationId, revision: r.revision });

      return {
        generatedAt: iso(data.now),
        survey: {
          ...meta(survey),
          siteId: survey.siteId,
          name: survey.name,
          state: survey.state,
          zoneSetId: survey.zoneSetId,
          startsOn: survey.startsOn,
          endsOn: survey.endsOn,
          species: survey.species,
          maxHarmonic: survey.maxHarmonic,
          repeatRadiusM: survey.repeatRadiusM,
          notes: survey.notes,
        },
        site: { ...meta(data.site), name: data.site.name, address: data.site.address, notes: data.site.notes, archived: data.site.archived },
        levels: data.levels.map((l) => ({ ...meta(l), siteId: l.siteId, name: l.name, ordinal: l.ordinal, elevationM: l.elevationM })),
        plans: data.plans.map((p) => ({
          ...meta(p),
          levelId: p.levelId,
          // The original's type; the device keeps whatever Content-Type the image answer carries.
          mime: p.mime,
          widthPx: p.widthPx,
          heightPx: p.heightPx,
          metresPerPixel: p.metresPerPixel,
          originXPx: p.originXPx,
          originYPx: p.originYPx,
          northAngleDeg: p.northAngleDeg,
          // Of the original: the device copy, when there is one, is a different file.
          sha256: p.deviceObjectKey ? null : p.sha256,
          imageUrl: planImageUrl(organisationId, p.id),
        })),
        rooms: data.rooms.map((r) => ({ ...meta(r), levelId: r.levelId, name: r.name, use: r.use, sensitivity: r.sensitivity, polygon: r.polygon })),
        sources: data.sources.map((s) => ({
          ...meta(s),
          siteId: s.siteId,
          levelId: s.levelId,
          name: s.name,
          kind: s.kind,
          state: s.state,
          shielding: s.shielding,
          nominalFieldT: s.nominalFieldT,
          xM: s.xM,
          yM: s.yM,
          zM: s.zM,
          dipoleMomentAM2: s.dipoleMomentAM2,
          axisX: s.axisX,
          axisY: s.axisY,
          axisZ: s.axisZ,
          notes: s.notes,
        })),
        emitters: data.emitters.map((e) => ({
          ...meta(e),
          roomId: e.roomId,
          name: e.name,
          kind: e.kind,
          electronDensityPerM3: e.electronDensityPerM3,
          electronEnergyEv: e.electronEnergyEv,
          energyKind: e.energyKind,
          volumeM3: e.volumeM3,
          xM: e.xM,
          yM: e.yM,
          zM: e.zM,
          notes: e.notes,
        })),
        instruments: data.instruments.map(({ instrument: i, calibrationOverdue }) => ({
          ...meta(i),
          kind: i.kind,
          model: i.model,
          serial: i.serial,
          probe: i.probe,
          calibratedOn: i.calibratedOn,
          calibrationDueOn: i.calibrationDueOn,
          relativeUncertainty: i.relativeUncertainty,
          archived: i.archived,
          calibrationOverdue: Boolean(calibrationOverdue),
        })),
        watchBands: data.watchBands.map((b) => ({
          ...meta(b),
          siteId: b.siteId,
          name: b.name,
          lowerHz: b.lowerHz,
          upperHz: b.upperHz,
          reason: b.reason,
          source: b.source,
          severity: b.severity,
        })),
        zoneSet: data.zoneSet ? { ...meta(data.zoneSet), name: data.zoneSet.name, edition: data.zoneSet.edition, thresholds: data.zoneSet.thresholds } : null,
        stations: data.stations.map(({ station: s, latestFieldT }) => ({
          ...meta(s),
          deleted: false,
          surveyId: s.surveyId,
          levelId: s.levelId,
          walkId: s.walkId,
          roomId: s.roomId,
          label: s.label,
          xM: s.xM,
          yM: s.yM,
          heightM: s.heightM,
          createdByUserId: s.createdByUserId,
          notes: s.notes,
          latestFieldT: latestFieldT === null ? null : Number(latestFieldT),
        })),
        fieldReadings: data.fieldReadings.map((r) => ({
          ...meta(r),
          deleted: false,
          surveyId: r.surveyId,
          stationId: r.stationId,
          walkId: r.walkId,
          instrumentId: r.instrumentId,
          surveyorUserId: r.surveyorUserId,
          magnitudeT: r.magnitudeT,
          bxT: r.bxT,
          byT: r.byT,
          bzT: r.bzT,
          unit: r.unit,
          probeOrientation: r.probeOrientation,
          heightM: r.heightM,
          backgroundT: r.backgroundT,
          zeroed: r.zeroed,
          measuredAt: iso(r.measuredAt),
          notes: r.notes,
          photoObjectKey: r.photoObjectKey,
          photoSha256: r.photoSha256,
        })),
        sweeps: data.sweeps.map((s) => ({
          ...meta(s),
          deleted: false,
          surveyId: s.surveyId,
          stationId: s.stationId,
          walkId: s.walkId,
          analyserId: s.analyserId,
          antennaId: s.antennaId,
          surveyorUserId: s.surveyorUserId,
          measuredAt: iso(s.measuredAt),
          startHz: s.startHz,
          stopHz: s.stopHz,
          rbwHz: s.rbwHz,
          vbwHz: s.vbwHz,
          referenceLevelDbm: s.referenceLevelDbm,
          attenuationDb: s.attenuationDb,
          detector: s.detector,
          peaks: s.peaks,
          traceObjectKey: s.traceObjectKey,
          traceSha256: s.traceSha256,
          heightM: s.heightM,
          notes: s.notes,
        })),
        decisions: data.decisions.map(({ decision: d, stationId }) => ({
          ...meta(d),
          surveyId: d.surveyId,
          fieldReadingId: d.fieldReadingId,
          sweepId: d.sweepId,
          stationId,
          verdict: d.verdict,
          note: d.note,
          reviewerUserId: d.reviewerUserId,
          decidedAt: iso(d.decidedAt),
        })),
      };
    },
  };
}
export type OfflineService = ReturnType<typeof createOfflineService>;
