/**
 * Planning surveys: create one on a site, edit it while it is open, set its team. Surveyors must be
 * members whose role walks surveys (surveyor, emc), reviewers members who review (reviewer, admin).
 * Newly assigned surveyors get an e-mail with a link to /surveys/<id>; someone already on the team is
 * not mailed again. A survey walks the levels chosen for it (all the site's levels when none are
 * named at creation); a level that already has the survey's stations cannot be taken out of it.
 */
import type { SpeciesSchema } from '../../../shared/schemas/vocabulary';
import {
  ASSIGNABLE_REVIEWER_ROLES,
  ASSIGNABLE_SURVEYOR_ROLES,
  type SurveyAssignmentsInput,
  type SurveyCreate,
  type SurveySettings,
  type SurveyUpdate,
} from '../../../shared/schemas/survey-setup';
import type { z } from 'zod';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { escapeHtml, type Mailer } from '../../lib/mail';
import type { SurveySetupRepository, SurveyValues } from './survey-setup.repository';

type Species = z.infer<typeof SpeciesSchema>;

function invalid(path: string, message: string, extra: Record<string, unknown> = {}): AppError {
  return new AppError('VALIDATION_FAILED', message, { issues: [{ in: 'body', path, message }], ...extra });
}

export function createSurveySetupService(deps: { repo: SurveySetupRepository; mailer: Mailer; publicUrl: string; logger: Logger }) {
  const { repo, mailer, publicUrl, logger } = deps;

  async function checkZoneSet(organisationId: string, zoneSetId: string | null | undefined): Promise<string | null> {
    const sets = await repo.zoneSets(organisationId);
    if (zoneSetId === undefined) return sets.find((s) => s.isDefault)?.id ?? null;
    if (zoneSetId === null) return null;
    if (!sets.some((s) => s.id === zoneSetId)) throw invalid('zoneSetId', 'That zone set does not exist in this organisation.');
    return zoneSetId;
  }

  const dedupe = (species: Species[]) => [...new Set(species)];

  /** The chosen levels, in the site's floor order, after checking each is a live level of the site. */
  async function checkLevels(organisationId: string, siteId: string, levelIds: string[] | undefined, creating: boolean): Promise<string[] | undefined> {
    if (levelIds === undefined && !creating) return undefined;
    const siteLevels = await repo.siteLevels(organisationId, siteId);
    if (levelIds === undefined) return siteLevels.filter((l) => !l.archived).map((l) => l.id);
    const wanted = new Set(levelIds);
    const known = new Set(siteLevels.map((l) => l.id));
    const unknown = [...wanted].filter((id) => !known.has(id));
    if (unknown.length > 0) throw invalid('levelIds', unknown.length === 1 ? 'One of the chosen levels is not a level of this site.' : `${unknown.length} of the chosen levels are not levels of this site.`, { levelIds: unknown });
    return siteLevels.filter((l) => wanted.has(l.id)).map((l) => l.id);
  }

  return {
    zoneSets: (organisationId: string) => repo.zoneSets(organisationId),

    async create(organisationId: string, siteId: string, input: SurveyCreate, ctx: AuditContext): Promise<SurveySettings> {
      const site = await repo.site(organisationId, siteId);
      if (!site) throw notFound('That site');
      if (site.archived) throw new AppError('CONFLICT', 'This site is archived: unarchive it before planning a survey there.');
      const values: SurveyValues = {
        name: input.name,
        zoneSetId: await checkZoneSet(organisationId, input.zoneSetId),
        levelIds: (await checkLevels(organisationId, siteId, input.levelIds, true))!,
        species: dedupe(input.species),
        maxHarmonic: input.maxHarmonic,
        repeatRadiusM: input.repeatRadiusM,
        startsOn: input.startsOn ?? null,
        endsOn: input.endsOn ?? null,
        notes: input.notes ?? null,
      };
      return repo.create(organisationId, siteId, values, ctx);
    },

    async settings(organisationId: string, surveyId: string): Promise<SurveySettings> {
      const row = await repo.findRow(organisationId, surveyId);
      if (!row) throw notFound('That survey');
      return repo.settings(row);
    },

    async update(organisationId: string, surveyId: string, patch: SurveyUpdate, ctx: AuditContext): Promise<SurveySettings> {
      const before = await repo.findRow(organisationId, surveyId);
      if (!before) throw notFound('That survey');
      const startsOn = patch.startsOn !== undefined ? patch.startsOn : before.startsOn;
      const endsOn = patch.endsOn !== undefined ? patch.endsOn : before.endsOn;
      if (startsOn && endsOn && startsOn > endsOn) throw invalid('endsOn', 'The end date must not be before the start date.');
      const values: Partial<SurveyValues> = { ...patch, ...(patch.species ? { species: dedupe(patch.species) } : {}) };
      if (patch.zoneSetId !== undefined) values.zoneSetId = await checkZoneSet(organisationId, patch.zoneSetId);
      if (patch.levelIds !== undefined) {
        const levelIds = (await checkLevels(organisationId, before.siteId, patch.levelIds, false))!;
        const dropped = before.levelIds.filter((id) => !levelIds.includes(id));
        const inUse = await repo.stationCounts(organisationId, surveyId, dropped);
        if (inUse.length > 0) {
          const names = new Map((await repo.siteLevels(organisationId, before.siteId)).map((l) => [l.id, l.name]));
          const which = inUse.map((u) => `${names.get(u.levelId) ?? 'a level'} (${u.stations} station${u.stations === 1 ? '' : 's'})`).join(', ');
          throw new AppError('CONFLICT', `These levels already have stations in this survey and stay in it: ${which}.`, { levelIds: inUse.map((u) => u.levelId) });
        }
        values.levelIds = levelIds;
      }
      const result = await repo.update(organisationId, surveyId, values, ctx);
      if (result === 'not_open') throw new AppError('CONFLICT', 'This survey has been submitted or signed off; its settings can no longer change.');
      if (!result) throw notFound('That survey');
      return result;
    },

    async setTeam(organisationId: string, surveyId: string, input: SurveyAssignmentsInput, ctx: AuditContext): Promise<{ survey: SurveySettings; mailed: string[] }> {
      const survey = await repo.findRow(organisationId, surveyId);
      if (!survey) throw notFound('That survey');
      if (survey.state === 'signed_off') throw new AppError('CONFLICT', 'This survey is signed off; its team can no longer change.');
      const wanted = { surveyors: [...new Set(input.surveyors)], reviewers: [...new Set(input.reviewers)] };
      const members = new Map((await repo.members(organisationId, [...wanted.surveyors, ...wanted.reviewers])).map((m) => [m.userId, m]));
      const badSurveyors = wanted.surveyors.filter((id) => !ASSIGNABLE_SURVEYOR_ROLES.includes(members.get(id)?.role ?? 'viewer'));
      const badReviewers = wanted.reviewers.filter((id) => !ASSIGNABLE_REVIEWER_ROLES.includes(members.get(id)?.role ?? 'viewer'));
      if (badSurveyors.length > 0 || badReviewers.length > 0) {
        const issues = [
          ...badSurveyors.map((id) => ({ in: 'body', path: 'surveyors', message: `${members.get(id)?.name ?? id} cannot be a surveyor: surveyors must be members with the surveyor or EMC engineer role.` })),
          ...badReviewers.map((id) => ({ in: 'body', path: 'reviewers', message: `${members.get(id)?.name ?? id} cannot be a reviewer: reviewers must be members with the reviewer or admin role.` })),
        ];
        throw new AppError('VALIDATION_FAILED', issues[0]!.message, { issues, surveyors: badSurveyors, reviewers: badReviewers });
      }
      const result = await repo.setTeam(organisationId, surveyId, wanted, ctx);
      if (!result) throw notFound('That survey');
      const site = await repo.site(organisationId, survey.siteId);
      const link = `${publicUrl}/surveys/${surveyId}`;
      const mailed: string[] = [];
      for (const userId of result.addedSurveyors) {
        const person = members.get(userId)!;
        const subject = `You are surveying: ${survey.name}`;
        const where = site ? ` at ${site.name}` : '';
        const when = survey.startsOn ? ` starting ${survey.startsOn}` : '';
        const text = [
          `Hello ${person.name},`,
          '',
          `You have been assigned as a surveyor to "${survey.name}"${where}${when}.`,
          `Open the survey: ${link}`,
          '',
          'Open it once while you have a connection so the plans and stations are on your device before you walk the building.',
          'Follow the site\'s access rules for strong-field areas: people with implants or ferromagnetic objects must not enter controlled zones without clearance.',
        ].join('\n');
        const html = `<p>Hello ${escapeHtml(person.name)},</p><p>You have been assigned as a surveyor to “${escapeHtml(survey.name)}”${escapeHtml(where)}${escapeHtml(when)}.</p><p><a href="${escapeHtml(link)}">Open the survey</a></p><p>Open it once while you have a connection so the plans and stations are on your device before you walk the building.</p><p>Follow the site's access rules for strong-field areas: people with implants or ferromagnetic objects must not enter controlled zones without clearance.</p>`;
        try {
          await mailer.send({ to: person.email, subject, text, html });
          mailed.push(userId);
        } catch (error) {
          // The assignment stands; the answer's `mailed` shows who was not told.
          logger.error({ err: error, userId, surveyId }, 'survey assignment e-mail failed');
        }
      }
      return { survey: result.settings, mailed };
    },
  };
}
export type SurveySetupService = ReturnType<typeof createSurveySetupService>;
