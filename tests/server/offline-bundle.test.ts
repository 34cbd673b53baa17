/**
 * GET /api/orgs/:orgId/surveys/:surveyId/offline — the bundle a device stores to work with no network.
 * Real app, real PostgreSQL with the demo seed; contents are checked against the database with SQL
 * written here independently of the repository's Drizzle queries.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readingFieldTesla } from '../../shared/schemas/capture';
import { OfflineBundleSchema, type OfflineBundle } from '../../shared/schemas/offline';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, expectError, KESTREL_ADMIN, signIn, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let sql: pg.Client;
let orgId: string;
let openSurveyId: string;
let signedOffSurveyId: string;
const sessions = new Map<string, SignedIn>();
let bundle: OfflineBundle;

const url = (surveyId = openSurveyId, org = orgId) => `/api/orgs/${org}/surveys/${surveyId}/offline`;

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  sql = new pg.Client({ connectionString: t.databaseUrl });
  await sql.connect();
  for (const email of [demoEmail('admin'), demoEmail('reviewer'), demoEmail('surveyor'), demoEmail('emc'), demoEmail('viewer'), 'surveyor2@harrowby.example', KESTREL_ADMIN]) {
    sessions.set(email, await signIn(t.app, email));
  }
  const admin = sessions.get(demoEmail('admin'))!;
  orgId = admin.session.memberships[0]!.organisationId;
  const surveys = (await admin.agent.get(`/api/orgs/${orgId}/surveys`).expect(200)).body.surveys as { id: string; state: string }[];
  openSurveyId = surveys.find((s) => s.state === 'open')!.id;
  signedOffSurveyId = surveys.find((s) => s.state === 'signed_off')!.id;
  const res = await sessions.get(demoEmail('surveyor'))!.agent.get(url()).expect(200);
  bundle = OfflineBundleSchema.parse(res.body);
});
afterAll(async () => {
  await sql?.end();
  await t?.close();
});

const rows = async <T = Record<string, unknown>>(text: string, values: unknown[] = []) => (await sql.query(text, values)).rows as T[];

describe('who may take a survey offline', () => {
  it('the assigned surveyor, a reviewer and an admin get the bundle', async () => {
    for (const email of [demoEmail('surveyor'), demoEmail('reviewer'), demoEmail('admin')]) {
      const res = await sessions.get(email)!.agent.get(url());
      expect(res.status, email).toBe(200);
      expect(OfflineBundleSchema.safeParse(res.body).success, email).toBe(true);
      expect(res.headers['cache-control']).toContain('no-store');
    }
  });

  it('a surveyor who is not assigned to the survey gets 403 FORBIDDEN', async () => {
    // The second demo surveyor worked the 2025 survey only.
    const [assigned] = await rows<{ n: number }>(
      `SELECT count(*)::int AS n FROM survey_assignments sa JOIN users u ON u.id = sa.user_id WHERE u.email = 'surveyor2@harrowby.example' AND sa.survey_id = $1 AND NOT sa.deleted`,
      [openSurveyId],
    );
    expect(assigned!.n).toBe(0);
    expectError(await sessions.get('surveyor2@harrowby.example')!.agent.get(url()), 403, 'FORBIDDEN');
    // …while the survey they are assigned to is theirs to take.
    expect((await sessions.get('surveyor2@harrowby.example')!.agent.get(url(signedOffSurveyId))).status).toBe(200);
  });

  it('emc and viewer roles get 403, a signed-out caller 401', async () => {
    expectError(await sessions.get(demoEmail('emc'))!.agent.get(url()), 403, 'FORBIDDEN');
    expectError(await sessions.get(demoEmail('viewer'))!.agent.get(url()), 403, 'FORBIDDEN');
    expectError(await (await import('supertest')).default(t.app).get(url()), 401, 'UNAUTHENTICATED');
  });

  it('another organisation gets 404, whether it names the survey’s organisation or its own', async () => {
    const kestrel = sessions.get(KESTREL_ADMIN)!;
    expectError(await kestrel.agent.get(url()), 404, 'NOT_FOUND');
    const kestrelOrg = kestrel.session.memberships[0]!.organisationId;
    expectError(await kestrel.agent.get(url(openSurveyId, kestrelOrg)), 404, 'NOT_FOUND');
  });

  it('an unknown survey is 404 and a malformed id 400', async () => {
    const admin = sessions.get(demoEmail('admin'))!;
    expectError(await admin.agent.get(url('01900000-0000-7000-8000-000000000000')), 404, 'NOT_FOUND');
    expectError(await admin.agent.get(url('not-a-uuid')), 400, 'VALIDATION_FAILED');
  });
});

describe('what the bundle holds matches the database', () => {
  it('the survey, its site and the site’s live levels, plans, rooms, sources and emitters', async () => {
    const [survey] = await rows<{ site_id: string; name: string; zone_set_id: string; max_harmonic: number }>(`SELECT * FROM surveys WHERE id = $1`, [openSurveyId]);
    expect(bundle.survey).toMatchObject({ id: openSurveyId, siteId: survey!.site_id, name: survey!.name, state: 'open', maxHarmonic: survey!.max_harmonic });
    expect(bundle.site.id).toBe(survey!.site_id);
    const ids = async (table: string, where: string) => (await rows<{ id: string }>(`SELECT id FROM ${table} WHERE ${where} AND NOT deleted ORDER BY id`, [survey!.site_id])).map((r) => r.id);
    const sorted = (list: { id: string }[]) => list.map((r) => r.id).sort();
    const walked = `site_id = $1 AND NOT archived AND id = ANY((SELECT level_ids FROM surveys WHERE id = '${openSurveyId}')::uuid[])`;
    expect(sorted(bundle.levels)).toEqual(await ids('levels', walked));
    expect(bundle.levels.length).toBeGreaterThan(0);
    expect(sorted(bundle.plans)).toEqual(await ids('plans', `level_id IN (SELECT id FROM levels WHERE ${walked} AND NOT deleted)`));
    expect(sorted(bundle.rooms)).toEqual(await ids('rooms', `level_id IN (SELECT id FROM levels WHERE ${walked} AND NOT deleted)`));
    expect(sorted(bundle.sources)).toEqual(await ids('sources', 'site_id = $1'));
    expect(sorted(bundle.emitters)).toEqual(await ids('emitters', 'room_id IN (SELECT r.id FROM rooms r JOIN levels l ON l.id = r.level_id WHERE l.site_id = $1 AND NOT r.deleted)'));
    for (const plan of bundle.plans) expect(plan.imageUrl).toBe(`/api/orgs/${orgId}/plans/${plan.id}/image?variant=device`);
  });

  it('the zone set is the survey’s, and the watch bands are the organisation’s plus the site’s own', async () => {
    const [survey] = await rows<{ zone_set_id: string; site_id: string }>(`SELECT zone_set_id, site_id FROM surveys WHERE id = $1`, [openSurveyId]);
    expect(bundle.zoneSet?.id).toBe(survey!.zone_set_id);
    const bands = await rows<{ id: string }>(`SELECT id FROM watch_bands WHERE organisation_id = $1 AND NOT deleted AND (site_id IS NULL OR site_id = $2) ORDER BY id`, [orgId, survey!.site_id]);
    expect(bundle.watchBands.map((b) => b.id).sort()).toEqual(bands.map((b) => b.id));
    expect(bands.length).toBeGreaterThan(0);
  });

  it('instruments say whether calibration is overdue today, by the database’s calendar', async () => {
    const expected = await rows<{ id: string; overdue: boolean }>(
      `SELECT id, coalesce(calibration_due_on < current_date, false) AS overdue FROM instruments WHERE organisation_id = $1 AND NOT deleted`,
      [orgId],
    );
    expect(bundle.instruments).toHaveLength(expected.length);
    for (const e of expected) expect(bundle.instruments.find((i) => i.id === e.id)?.calibrationOverdue, e.id).toBe(e.overdue);
    // The demo keeps one overdue instrument so the warning can be seen; if it did not, this check would prove nothing.
    expect(expected.some((e) => e.overdue)).toBe(true);
  });

  it('stations, readings and sweeps are the survey’s live ones, with each station’s newest |B|', async () => {
    const [counts] = await rows<{ stations: number; readings: number; sweeps: number }>(
      `SELECT (SELECT count(*)::int FROM stations WHERE survey_id = $1 AND NOT deleted) AS stations,
              (SELECT count(*)::int FROM field_readings WHERE survey_id = $1 AND NOT deleted) AS readings,
              (SELECT count(*)::int FROM sweeps WHERE survey_id = $1 AND NOT deleted) AS sweeps`,
      [openSurveyId],
    );
    // The seed's numbers for the open 2026 survey (server/db/seed): 122 stations, 141 readings, 3 sweeps.
    expect(counts).toEqual({ stations: 122, readings: 141, sweeps: 3 });
    expect(bundle.stations).toHaveLength(122);
    expect(bundle.fieldReadings).toHaveLength(141);
    expect(bundle.sweeps).toHaveLength(3);

    const latest = await rows<{ id: string; field_t: number | null }>(
      `SELECT s.id, (SELECT fr.field_t FROM field_readings fr WHERE fr.station_id = s.id AND NOT fr.deleted ORDER BY fr.measured_at DESC LIMIT 1) AS field_t
         FROM stations s WHERE s.survey_id = $1 AND NOT s.deleted`,
      [openSurveyId],
    );
    for (const l of latest) {
      const station = bundle.stations.find((s) => s.id === l.id)!;
      if (l.field_t === null) expect(station.latestFieldT).toBeNull();
      else expect(station.latestFieldT!).toBeCloseTo(l.field_t, 15);
    }
    // |B| of each reading as the device computes it equals the database's generated field_t.
    const fieldT = new Map((await rows<{ id: string; field_t: number }>(`SELECT id, field_t FROM field_readings WHERE survey_id = $1`, [openSurveyId])).map((r) => [r.id, r.field_t]));
    for (const r of bundle.fieldReadings) expect(readingFieldTesla(r)).toBeCloseTo(fieldT.get(r.id)!, 15);
  });

  it('re-measure decisions carry the station of the reading they judge', async () => {
    const expected = await rows<{ id: string; station_id: string; verdict: string }>(
      `SELECT d.id, coalesce(fr.station_id, sw.station_id) AS station_id, d.verdict FROM decisions d
         LEFT JOIN field_readings fr ON fr.id = d.field_reading_id LEFT JOIN sweeps sw ON sw.id = d.sweep_id
        WHERE d.survey_id = $1 AND NOT d.deleted`,
      [openSurveyId],
    );
    expect(expected.some((d) => d.verdict === 'remeasure')).toBe(true);
    expect(bundle.decisions.map((d) => ({ id: d.id, station_id: d.stationId, verdict: d.verdict })).sort((a, b) => a.id.localeCompare(b.id))).toEqual(
      expected.sort((a, b) => a.id.localeCompare(b.id)),
    );
  });

  it('a tombstoned reading leaves the bundle and its station falls back to the next newest', async () => {
    const [station] = await rows<{ station_id: string }>(
      `SELECT station_id FROM field_readings WHERE survey_id = $1 AND NOT deleted GROUP BY station_id HAVING count(*) >= 2 LIMIT 1`,
      [openSurveyId],
    );
    const readings = await rows<{ id: string; field_t: number }>(
      `SELECT id, field_t FROM field_readings WHERE station_id = $1 AND NOT deleted ORDER BY measured_at DESC`,
      [station!.station_id],
    );
    await sql.query(`UPDATE field_readings SET deleted = true, revision = revision + 1 WHERE id = $1`, [readings[0]!.id]);
    const after = OfflineBundleSchema.parse((await sessions.get(demoEmail('surveyor'))!.agent.get(url()).expect(200)).body);
    expect(after.fieldReadings.some((r) => r.id === readings[0]!.id)).toBe(false);
    expect(after.stations.find((s) => s.id === station!.station_id)!.latestFieldT!).toBeCloseTo(readings[1]!.field_t, 15);
    await sql.query(`UPDATE field_readings SET deleted = false, revision = revision - 1 WHERE id = $1`, [readings[0]!.id]);
  });
});

describe('a survey that walks some of its site’s levels', () => {
  it('carries only those levels, with their plans and rooms, and every source of the site', async () => {
    const admin = sessions.get(demoEmail('admin'))!;
    const siteId = bundle.site.id;
    const siteLevels = await rows<{ id: string; name: string }>(`SELECT id, name FROM levels WHERE site_id = $1 AND NOT deleted AND NOT archived ORDER BY ordinal`, [siteId]);
    expect(siteLevels.length).toBeGreaterThan(1);
    const chosen = siteLevels[1]!;
    const created = await admin.agent
      .post(`/api/orgs/${orgId}/sites/${siteId}/surveys`)
      .set('Origin', TRUSTED_ORIGIN)
      .send({ name: 'One floor only', levelIds: [chosen.id] })
      .expect(201);
    const partial = OfflineBundleSchema.parse((await admin.agent.get(url(created.body.id)).expect(200)).body);
    expect(partial.levels.map((l) => l.id)).toEqual([chosen.id]);
    expect(partial.plans.every((p) => p.levelId === chosen.id)).toBe(true);
    expect(partial.plans.length).toBe((await rows(`SELECT id FROM plans WHERE level_id = $1 AND NOT deleted`, [chosen.id])).length);
    expect(new Set(partial.rooms.map((r) => r.levelId))).toEqual(new Set([chosen.id]));
    expect(partial.sources.length).toBe(bundle.sources.length);
  });
});
