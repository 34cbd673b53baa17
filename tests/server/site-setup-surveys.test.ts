/**
 * Planning surveys: create on a site, edit while open (409 once submitted), set the team with role
 * checks, and the e-mail a newly assigned surveyor gets (read back from the local SMTP capture).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { SurveyAssignmentsResultSchema, SurveySettingsSchema, ZoneSetListSchema } from '../../shared/schemas/survey-setup';
import { countRows, demoEmail, expectError, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

describe('survey planning', () => {
  let t: InProcessApp;
  let admin: SignedIn;
  let reviewer: SignedIn;
  let surveyor: SignedIn;
  let viewer: SignedIn;
  let orgId: string;
  let siteId: string;

  const post = (who: SignedIn, path: string, body: object = {}) => who.agent.post(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
  const patch = (who: SignedIn, path: string, body: object) => who.agent.patch(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
  const put = (who: SignedIn, path: string, body: object) => who.agent.put(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    admin = await signIn(t.app, demoEmail('admin'));
    reviewer = await signIn(t.app, demoEmail('reviewer'));
    surveyor = await signIn(t.app, demoEmail('surveyor'));
    viewer = await signIn(t.app, demoEmail('viewer'));
    orgId = admin.session.memberships[0]!.organisationId;
    siteId = (await post(admin, '/sites', { name: 'Survey planning hall' }).expect(201)).body.id;
  });
  afterAll(async () => {
    await t?.close();
  });

  it('lists the organisation’s zone sets, the default first', async () => {
    const sets = ZoneSetListSchema.parse((await viewer.agent.get(`/api/orgs/${orgId}/zone-sets`).expect(200)).body).zoneSets;
    expect(sets.length).toBeGreaterThan(0);
    expect(sets[0]!.isDefault).toBe(true);
  });

  it('creates a survey with the default zone set, edits it while open, and refuses edits once submitted', async () => {
    const defaultSet = ZoneSetListSchema.parse((await viewer.agent.get(`/api/orgs/${orgId}/zone-sets`).expect(200)).body).zoneSets[0]!;
    expectError(await post(surveyor, `/sites/${siteId}/surveys`, { name: 'Nope' }), 403, 'FORBIDDEN');
    const created = SurveySettingsSchema.parse(
      (await post(reviewer, `/sites/${siteId}/surveys`, { name: 'Spring check', species: ['electron', 'proton', 'electron'], maxHarmonic: 4, repeatRadiusM: 0.5, startsOn: '2031-04-01' }).expect(201)).body,
    );
    expect(created).toMatchObject({ state: 'open', zoneSetId: defaultSet.id, species: ['electron', 'proton'], maxHarmonic: 4, repeatRadiusM: 0.5, startsOn: '2031-04-01', team: { surveyors: [], reviewers: [] } });
    // It is listed with the others (the existing survey list).
    expect((await viewer.agent.get(`/api/orgs/${orgId}/surveys`).expect(200)).body.surveys.some((s: { id: string }) => s.id === created.id)).toBe(true);

    const edited = SurveySettingsSchema.parse((await patch(admin, `/surveys/${created.id}`, { maxHarmonic: 2, endsOn: '2031-04-30' }).expect(200)).body);
    expect(edited).toMatchObject({ maxHarmonic: 2, endsOn: '2031-04-30', revision: 2 });
    expectError(await patch(admin, `/surveys/${created.id}`, { endsOn: '2031-03-01' }), 400, 'VALIDATION_FAILED');
    expectError(await patch(admin, `/surveys/${created.id}`, { maxHarmonic: 0 }), 400, 'VALIDATION_FAILED');

    await sql(t.databaseUrl, `UPDATE surveys SET state = 'submitted', submitted_at = now(), submitted_by_user_id = $2 WHERE id = $1`, [created.id, admin.session.user.id]);
    expectError(await patch(admin, `/surveys/${created.id}`, { name: 'Too late' }), 409, 'CONFLICT');
  });

  it('refuses a survey on an archived site and a zone set the organisation does not have', async () => {
    const archived = (await post(admin, '/sites', { name: 'Closed wing' }).expect(201)).body.id;
    await post(admin, `/sites/${archived}/archive`).expect(200);
    expectError(await post(admin, `/sites/${archived}/surveys`, { name: 'x' }), 409, 'CONFLICT');
    // A zone set id from nowhere in this organisation (Kestrel's demo has none to borrow).
    const res = await post(admin, `/sites/${siteId}/surveys`, { name: 'x', zoneSetId: '01890000-0000-7000-8000-000000000000' });
    expectError(res, 400, 'VALIDATION_FAILED');
    expect(res.body.error.details.issues[0].path).toBe('zoneSetId');
  });

  it('sets the team, mails newly assigned surveyors a link, and not again when they stay on it', async () => {
    const survey = SurveySettingsSchema.parse((await post(admin, `/sites/${siteId}/surveys`, { name: 'Team survey', startsOn: '2031-05-02' }).expect(201)).body);
    const emc = await signIn(t.app, demoEmail('emc'));

    // Role checks: a viewer may not survey, a surveyor may not review.
    const wrong = await put(admin, `/surveys/${survey.id}/assignments`, { surveyors: [viewer.session.user.id], reviewers: [surveyor.session.user.id] });
    expectError(wrong, 400, 'VALIDATION_FAILED');
    expect(wrong.body.error.details).toMatchObject({ surveyors: [viewer.session.user.id], reviewers: [surveyor.session.user.id] });
    expect(await countRows(t.databaseUrl, 'survey_assignments', `survey_id = '${survey.id}'`)).toBe(0);

    const res = SurveyAssignmentsResultSchema.parse(
      (await put(reviewer, `/surveys/${survey.id}/assignments`, { surveyors: [surveyor.session.user.id, emc.session.user.id], reviewers: [reviewer.session.user.id] }).expect(200)).body,
    );
    expect(new Set(res.mailed)).toEqual(new Set([surveyor.session.user.id, emc.session.user.id]));
    expect(res.survey.team.surveyors.map((m) => m.email).sort()).toEqual(['emc@harrowby.example', 'surveyor@harrowby.example']);
    expect(res.survey.team.reviewers.map((m) => m.email)).toEqual(['reviewer@harrowby.example']);

    const mail = await t.capture.waitFor((m) => m.to.includes('surveyor@harrowby.example') && m.subject.includes('Team survey'));
    expect(mail.text).toContain(`${TRUSTED_ORIGIN}/surveys/${survey.id}`);
    expect(mail.text).toContain('Survey planning hall');
    expect(mail.text).toMatch(/implants/);

    // The surveyor now sees it as theirs.
    const mine = (await surveyor.agent.get(`/api/orgs/${orgId}/surveys`).expect(200)).body.surveys.find((s: { id: string }) => s.id === survey.id);
    expect(mine.assignedToMe).toBe(true);

    // Dropping the EMC engineer and keeping the surveyor mails nobody.
    const before = (await t.capture.list()).length;
    const again = SurveyAssignmentsResultSchema.parse((await put(admin, `/surveys/${survey.id}/assignments`, { surveyors: [surveyor.session.user.id], reviewers: [] }).expect(200)).body);
    expect(again.mailed).toEqual([]);
    expect(again.survey.team).toMatchObject({ surveyors: [{ email: 'surveyor@harrowby.example' }], reviewers: [] });
    await new Promise((r) => setTimeout(r, 200));
    expect((await t.capture.list()).length).toBe(before);
    expect(await countRows(t.databaseUrl, 'survey_assignments', `survey_id = '${survey.id}' AND deleted`)).toBe(2);
    expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'survey_assignments' AND action = 'delete'`)).toBe(2);

    const settings = SurveySettingsSchema.parse((await viewer.agent.get(`/api/orgs/${orgId}/surveys/${survey.id}/settings`).expect(200)).body);
    expect(settings.team.surveyors).toHaveLength(1);
    expectError(await put(viewer, `/surveys/${survey.id}/assignments`, { surveyors: [] }), 403, 'FORBIDDEN');
  });

  it('walks the levels chosen for it: all of the site’s by default, checked against the site, kept while stations stand on them', async () => {
    const ground = (await post(admin, `/sites/${siteId}/levels`, { name: 'Ground', ordinal: 0 }).expect(201)).body.id as string;
    const upper = (await post(admin, `/sites/${siteId}/levels`, { name: 'Upper', ordinal: 1 }).expect(201)).body.id as string;
    const loft = (await post(admin, `/sites/${siteId}/levels`, { name: 'Loft', ordinal: 2 }).expect(201)).body.id as string;
    await patch(admin, `/levels/${loft}`, { archived: true }).expect(200);

    // Left out: every live level of the site, bottom floor first, the archived loft not among them.
    const all = SurveySettingsSchema.parse((await post(admin, `/sites/${siteId}/surveys`, { name: 'Whole building' }).expect(201)).body);
    expect(all.levelIds).toEqual([ground, upper]);

    // Named: kept in floor order whatever order they came in, duplicates dropped.
    const some = SurveySettingsSchema.parse((await post(admin, `/sites/${siteId}/surveys`, { name: 'Upper and ground', levelIds: [upper, ground, upper] }).expect(201)).body);
    expect(some.levelIds).toEqual([ground, upper]);

    // A level of another site, an empty list, and a malformed id are refused with the field named.
    const otherSite = (await post(admin, '/sites', { name: 'Elsewhere' }).expect(201)).body.id;
    const foreign = (await post(admin, `/sites/${otherSite}/levels`, { name: 'Their ground' }).expect(201)).body.id;
    const wrong = await post(admin, `/sites/${siteId}/surveys`, { name: 'x', levelIds: [ground, foreign] });
    expectError(wrong, 400, 'VALIDATION_FAILED');
    expect(wrong.body.error).toMatchObject({ message: 'One of the chosen levels is not a level of this site.', details: { levelIds: [foreign] } });
    const none = await post(admin, `/sites/${siteId}/surveys`, { name: 'x', levelIds: [] });
    expectError(none, 400, 'VALIDATION_FAILED');
    expect(none.body.error.details.issues[0]).toMatchObject({ path: 'levelIds', message: 'Pick at least one level to survey.' });
    expectError(await patch(admin, `/surveys/${some.id}`, { levelIds: ['not-a-level'] }), 400, 'VALIDATION_FAILED');

    // Narrowing is fine until a station of the survey stands on the level being taken out.
    const narrowed = SurveySettingsSchema.parse((await patch(admin, `/surveys/${some.id}`, { levelIds: [upper] }).expect(200)).body);
    expect(narrowed.levelIds).toEqual([upper]);
    await sql(
      t.databaseUrl,
      `INSERT INTO stations (id, organisation_id, change_seq, survey_id, level_id, x_m, y_m) VALUES (gen_random_uuid(), $1, 900001, $2, $3, 1, 2), (gen_random_uuid(), $1, 900002, $2, $3, 3, 4)`,
      [orgId, some.id, upper],
    );
    const refused = await patch(admin, `/surveys/${some.id}`, { levelIds: [ground] });
    expectError(refused, 409, 'CONFLICT');
    expect(refused.body.error.message).toBe('These levels already have stations in this survey and stay in it: Upper (2 stations).');
    expect(SurveySettingsSchema.parse((await admin.agent.get(`/api/orgs/${orgId}/surveys/${some.id}/settings`).expect(200)).body).levelIds).toEqual([upper]);
    // Widening again keeps the level with stations.
    expect(SurveySettingsSchema.parse((await patch(admin, `/surveys/${some.id}`, { levelIds: [ground, upper] }).expect(200)).body).levelIds).toEqual([ground, upper]);
    // The change is audited like every other edit of the survey.
    expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'surveys' AND entity_id = '${some.id}' AND action = 'update'`)).toBe(2);
  });
});
