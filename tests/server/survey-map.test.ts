/**
 * Survey maps (issue 7 §1–2, §6) against the seeded demo on real PostgreSQL: who may see them, that
 * nothing crosses organisations, contours and classes of the demo survey, the stored map reused while
 * the survey's data stays the same and recomputed when a reading arrives, the comparison with the
 * signed-off 2025 survey, and the GeoJSON export.
 *
 * Classes are checked against the zone set's own thresholds as stored (a field at or above a line is
 * inside it: the conservative reading of the standards the demo zone sets follow, REFERENCES.md), not
 * against the code under test.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SurveyCompareSchema, SurveyMapSchema, type SurveyMap } from '../../shared/schemas/survey-map';
import { RepeatListSchema } from '../../shared/schemas/sync';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { makeReading, mutationFor, readDemoIds, type DemoIds } from '../setup/sync-fixtures';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let reviewer: SignedIn;
const mapUrl = (surveyId: string, orgId = ids.orgId) => `/api/orgs/${orgId}/surveys/${surveyId}/map`;

/** Even-odd point-in-multipolygon (every ring toggles). */
function insideMulti(x: number, y: number, polygons: [number, number][][][]): boolean {
  let inside = false;
  for (const polygon of polygons)
    for (const ring of polygon)
      for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
        const [xi, yi] = ring[i]!;
        const [xj, yj] = ring[j]!;
        if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
      }
  return inside;
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  ids = await readDemoIds(t.databaseUrl);
  reviewer = await signIn(t.app, demoEmail('reviewer'));
});
afterAll(async () => {
  await t?.close();
});

describe('who may see a survey map', () => {
  it('answers admins, reviewers, EMC engineers and the assigned surveyor; refuses viewers, other surveyors and the signed-out', async () => {
    for (const role of ['admin', 'reviewer', 'emc', 'surveyor'] as const) {
      const who = await signIn(t.app, demoEmail(role));
      const res = await who.agent.get(mapUrl(ids.openSurveyId));
      expect(res.status, `${role}: ${res.text.slice(0, 200)}`).toBe(200);
    }
    const viewer = await signIn(t.app, demoEmail('viewer'));
    expectError(await viewer.agent.get(mapUrl(ids.openSurveyId)), 403, 'FORBIDDEN');
    // the second demo surveyor is on the 2025 team only
    const bram = await signIn(t.app, 'surveyor2@harrowby.example');
    expectError(await bram.agent.get(mapUrl(ids.openSurveyId)), 403, 'NOT_ASSIGNED');
    expect((await bram.agent.get(mapUrl(ids.signedOffSurveyId))).status).toBe(200);
    expectError(await bram.agent.get(`${mapUrl(ids.openSurveyId).replace('/map', '/exports/survey.geojson')}`), 403, 'NOT_ASSIGNED');
    expectError(await request(t.app).get(mapUrl(ids.openSurveyId)), 401, 'UNAUTHENTICATED');
  });

  it('shows nothing across organisations: 404 under either organisation id, with nothing of the survey in the body', async () => {
    const kestrel = await signIn(t.app, KESTREL_ADMIN);
    const survey = (await sql<{ name: string }>(t.databaseUrl, 'SELECT name FROM surveys WHERE id = $1', [ids.openSurveyId]))[0]!;
    for (const url of [
      mapUrl(ids.openSurveyId),
      mapUrl(ids.openSurveyId, ids.kestrelOrgId),
      `/api/orgs/${ids.kestrelOrgId}/surveys/${ids.openSurveyId}/compare?with=${ids.signedOffSurveyId}`,
      `/api/orgs/${ids.kestrelOrgId}/surveys/${ids.openSurveyId}/exports/survey.geojson`,
    ]) {
      const res = await kestrel.agent.get(url);
      expectError(res, 404, 'NOT_FOUND');
      expect(res.text).not.toContain(survey.name);
    }
    // a Harrowby reviewer cannot compare with a survey of another organisation either
    const [kSurvey] = await sql<{ id: string }>(t.databaseUrl, 'SELECT id FROM surveys WHERE organisation_id = $1 LIMIT 1', [ids.kestrelOrgId]);
    if (kSurvey) expectError(await reviewer.agent.get(`${mapUrl(ids.openSurveyId).replace('/map', '/compare')}?with=${kSurvey.id}`), 404, 'NOT_FOUND');
  });
});

describe('the demo survey map', () => {
  let map: SurveyMap;
  beforeAll(async () => {
    const res = await reviewer.agent.get(mapUrl(ids.openSurveyId));
    expect(res.status).toBe(200);
    map = SurveyMapSchema.parse(res.body);
  });

  it('has isogauss contours at every line of the zone set on a surveyed level, each with a label point', async () => {
    const stored = (await sql<{ thresholds: { fieldT: number }[] }>(t.databaseUrl, 'SELECT z.thresholds FROM zone_sets z JOIN surveys s ON s.zone_set_id = z.id WHERE s.id = $1', [ids.openSurveyId]))[0]!;
    expect(map.zoneSet.thresholds.map((x) => x.fieldT)).toEqual(stored.thresholds.map((x) => x.fieldT).sort((a, b) => a - b));
    const withContours = map.levels.filter((l) => l.contours.some((c) => c.polygons.length > 0));
    expect(withContours.length).toBeGreaterThan(0);
    for (const threshold of map.zoneSet.thresholds) {
      const drawn = map.levels.flatMap((l) => l.contours).filter((c) => c.levelT === threshold.fieldT && c.polygons.length > 0);
      expect(drawn.length, `no contour at ${threshold.fieldT} T`).toBeGreaterThan(0);
      expect(drawn.every((c) => c.labelPoints.length > 0 && c.label === threshold.name)).toBe(true);
    }
    expect(map.cautions.join(' ')).toMatch(/implant/i);
    expect(map.cautions.join(' ')).toMatch(/MR safety officer/);
  });

  it('puts the stations at or above a line inside that line’s contour (nearly all: the grid is a few cm coarse)', () => {
    let checked = 0;
    let agree = 0;
    for (const level of map.levels)
      for (const c of level.contours) {
        if (c.polygons.length === 0) continue;
        for (const s of level.stations) {
          if (s.fieldT === null || Math.abs(Math.log10(s.fieldT / c.levelT)) < 0.1) continue; // skip stations right on the line
          checked++;
          if (insideMulti(s.xM, s.yM, c.polygons as [number, number][][][]) === s.fieldT >= c.levelT) agree++;
        }
      }
    expect(checked).toBeGreaterThan(100);
    expect(agree / checked).toBeGreaterThan(0.97);
  });

  it('classes every station by the highest stored line its field reaches, and every room by its highest station', () => {
    const lines = map.zoneSet.thresholds.map((x) => x.fieldT);
    for (const level of map.levels) {
      for (const s of level.stations) {
        const expected = s.fieldT === null ? null : lines.filter((line) => s.fieldT! >= line).length - 1;
        expect(s.zoneIndex).toBe(expected);
      }
      for (const room of level.rooms) {
        const inRoom = level.stations.filter((s) => s.roomId === room.id && s.zoneIndex !== null);
        expect(room.zoneIndex).toBe(inRoom.length ? Math.max(...inRoom.map((s) => s.zoneIndex!)) : null);
      }
    }
  });

  it('takes each station’s latest reading that is not rejected, and lists repeat groups with their spread', async () => {
    const rows = await sql<{ station_id: string; field_t: number }>(
      t.databaseUrl,
      `SELECT DISTINCT ON (r.station_id) r.station_id, r.field_t FROM field_readings r
       WHERE r.survey_id = $1 AND NOT r.deleted AND NOT EXISTS (
         SELECT 1 FROM decisions d WHERE d.field_reading_id = r.id AND NOT d.deleted AND d.verdict = 'rejected'
           AND d.change_seq = (SELECT max(change_seq) FROM decisions d2 WHERE d2.field_reading_id = r.id AND NOT d2.deleted))
       ORDER BY r.station_id, r.measured_at DESC, r.id DESC`,
      [ids.signedOffSurveyId],
    );
    const old = SurveyMapSchema.parse((await reviewer.agent.get(mapUrl(ids.signedOffSurveyId)).expect(200)).body);
    const byId = new Map(old.levels.flatMap((l) => l.stations).map((s) => [s.id, s]));
    expect(rows.length).toBeGreaterThan(50);
    for (const r of rows) expect(byId.get(r.station_id)?.fieldT).toBe(r.field_t);
    // the 2025 survey has cross-checks by a second surveyor: groups of two with spread |a − b|/√2
    const groups = old.levels.flatMap((l) => l.repeatGroups);
    expect(groups.length).toBeGreaterThan(0);
    for (const g of groups.filter((x) => x.count === 2)) expect(g.spreadT).toBeCloseTo((g.maxT - g.minT) / Math.SQRT2, 12);
  });

  it('shows the same repeat groups, with the same flags, as the sync feature’s GET …/repeats', async () => {
    for (const surveyId of [ids.openSurveyId, ids.signedOffSurveyId]) {
      const listed = RepeatListSchema.parse((await reviewer.agent.get(`/api/orgs/${ids.orgId}/surveys/${surveyId}/repeats`).expect(200)).body);
      const map = SurveyMapSchema.parse((await reviewer.agent.get(mapUrl(surveyId)).expect(200)).body);
      const key = (g: { stationIds: string[]; count: number; meanT: number }) => `${g.stationIds.join(',')}|${g.count}|${g.meanT.toPrecision(12)}`;
      const onMap = map.levels.flatMap((l) => l.repeatGroups);
      expect(onMap.map(key).sort()).toEqual(listed.groups.map(key).sort());
      for (const g of listed.groups) {
        const m = onMap.find((x) => key(x) === key(g))!;
        expect(m.spreadT).toBeCloseTo(g.spreadT, 15);
        expect(m.disagree).toBe(g.disagree);
        expect(m.flagId).toBe(g.disagree ? g.flagId : null);
      }
    }
  });

  it('fits a dipole per placed magnet with enough stations, and gives its residuals per station', () => {
    const fits = map.levels.flatMap((l) => l.dipoles);
    expect(fits.length).toBeGreaterThan(0);
    const good = fits.filter((f) => f.ok);
    expect(good.length).toBeGreaterThan(0);
    for (const f of good) {
      expect(f.residuals.length).toBeGreaterThanOrEqual(4);
      expect(f.contours.length).toBe(map.zoneSet.thresholds.length);
      expect(f.rmsLogResidual).toBeGreaterThanOrEqual(0);
    }
    for (const f of fits.filter((x) => !x.ok)) expect(f.reason).toBeTruthy();
  });

  it('adds levels the reviewer asks for, and refuses levels that are not fields', async () => {
    const res = await reviewer.agent.get(`${mapUrl(ids.openSurveyId)}?levels=0.0002`).expect(200);
    const extra = SurveyMapSchema.parse(res.body);
    expect(extra.extraLevelsT).toEqual([0.0002]);
    expect(extra.levels.flatMap((l) => l.contours).some((c) => c.levelT === 0.0002 && c.zoneIndex === null && c.polygons.length > 0)).toBe(true);
    for (const bad of ['abc', '-1', '0', '1,2,3,4,5,6,7,8,9', '500']) expectError(await reviewer.agent.get(`${mapUrl(ids.openSurveyId)}?levels=${bad}`), 400, 'VALIDATION_FAILED');
  });
});

describe('the stored map', () => {
  it('is reused while the survey’s data stays the same, and recomputed when a reading arrives', async () => {
    const first = await reviewer.agent.get(mapUrl(ids.openSurveyId)).expect(200);
    const again = await reviewer.agent.get(mapUrl(ids.openSurveyId)).expect(200);
    expect(again.headers['x-map-cache']).toBe('hit');
    expect(again.body.computedAt).toBe(first.body.computedAt);
    expect(again.body.dataVersion).toBe(first.body.dataVersion);
    const stored = await sql<{ n: number }>(t.databaseUrl, `SELECT count(*)::int AS n FROM survey_map_cache WHERE survey_id = $1`, [ids.openSurveyId]);
    expect(stored[0]!.n).toBeGreaterThanOrEqual(1);

    // a surveyor pushes a new, later reading at an existing station
    const surveyor = await signIn(t.app, demoEmail('surveyor'));
    const [station] = await sql<{ id: string }>(t.databaseUrl, `SELECT s.id FROM stations s WHERE s.survey_id = $1 AND NOT s.deleted AND EXISTS (SELECT 1 FROM field_readings r WHERE r.station_id = s.id) ORDER BY s.id LIMIT 1`, [ids.openSurveyId]);
    const reading = makeReading({ orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor }, station!.id, { magnitudeT: 7.77e-3, measuredAt: '2026-12-31T09:00:00.000Z' });
    const push = await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId: 'map-test', mutations: [mutationFor('field_readings', reading)] });
    expect(push.status, JSON.stringify(push.body)).toBe(200);
    expect(push.body.results[0].status).toBe('applied');

    const after = await reviewer.agent.get(mapUrl(ids.openSurveyId)).expect(200);
    expect(after.headers['x-map-cache']).toBe('miss');
    expect(after.body.dataVersion).toBeGreaterThan(first.body.dataVersion);
    const map = SurveyMapSchema.parse(after.body);
    const st = map.levels.flatMap((l) => l.stations).find((s) => s.id === station!.id)!;
    expect(st.fieldT).toBeCloseTo(7.77e-3, 12);
    expect(st.readingId).toBe(reading.id);
    // and is stored again under the new version
    expect((await reviewer.agent.get(mapUrl(ids.openSurveyId)).expect(200)).headers['x-map-cache']).toBe('hit');
  });

  it('keeps one stored map per survey and variant', async () => {
    await reviewer.agent.get(`${mapUrl(ids.openSurveyId)}?levels=0.0003`).expect(200);
    await reviewer.agent.get(`${mapUrl(ids.openSurveyId)}?levels=0.0003`).expect(200);
    const rows = await sql<{ variant: string; n: number }>(t.databaseUrl, `SELECT variant, count(*)::int AS n FROM survey_map_cache WHERE survey_id = $1 GROUP BY variant`, [ids.openSurveyId]);
    expect(rows.every((r) => r.n === 1)).toBe(true);
    expect(rows.some((r) => r.variant.includes('0.0003'))).toBe(true);
  });
});

describe('comparing with the signed-off 2025 survey', () => {
  it('draws both surveys’ lines at this survey’s thresholds and measures how far each moved along rays from each magnet', async () => {
    const res = await reviewer.agent.get(`${mapUrl(ids.openSurveyId).replace('/map', '/compare')}?with=${ids.signedOffSurveyId}&bearings=0,90,180,270`).expect(200);
    const compare = SurveyCompareSchema.parse(res.body);
    expect(compare.earlier.id).toBe(ids.signedOffSurveyId);
    expect(compare.bearingsDeg).toEqual([0, 90, 180, 270]);
    const map = SurveyMapSchema.parse((await reviewer.agent.get(mapUrl(ids.openSurveyId)).expect(200)).body);
    expect(compare.levelsT.map((l) => l.levelT)).toEqual(map.zoneSet.thresholds.map((x) => x.fieldT));
    const both = compare.levels.filter((l) => l.currentContours.length > 0 && l.earlierContours.length > 0);
    expect(both.length).toBeGreaterThan(0);
    const rays = compare.levels.flatMap((l) => l.rays);
    expect(rays.length).toBeGreaterThan(0);
    const measured = rays.filter((r) => r.currentM !== null && r.earlierM !== null);
    expect(measured.length).toBeGreaterThan(0);
    for (const r of measured) expect(r.movedM).toBeCloseTo(r.currentM! - r.earlierM!, 9);
    for (const l of compare.levels) for (const c of l.earlierContours) expect(compare.levelsT.map((x) => x.levelT)).toContain(c.levelT);
  });

  it('refuses itself, an open survey, and bad bearings', async () => {
    const base = mapUrl(ids.signedOffSurveyId).replace('/map', '/compare');
    expectError(await reviewer.agent.get(`${base}?with=${ids.signedOffSurveyId}`), 400, 'BAD_REQUEST');
    expectError(await reviewer.agent.get(`${base}?with=${ids.openSurveyId}`), 400, 'BAD_REQUEST');
    expectError(await reviewer.agent.get(`${mapUrl(ids.openSurveyId).replace('/map', '/compare')}?with=${ids.signedOffSurveyId}&bearings=400`), 400, 'VALIDATION_FAILED');
    expectError(await reviewer.agent.get(`${base}`), 400, 'VALIDATION_FAILED');
    expectError(await reviewer.agent.get(`${base}?with=00000000-0000-7000-8000-000000000000`), 404, 'NOT_FOUND');
  });
});

describe('the GeoJSON export', () => {
  it('holds stations, rooms and contours in plan metres, naming each feature’s plan and calibration', async () => {
    const res = await reviewer.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/exports/survey.geojson`).buffer(true).parse((r, cb) => {
      let text = '';
      r.on('data', (c: Buffer) => (text += c.toString('utf8')));
      r.on('end', () => cb(null, text));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/application\/geo\+json/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename=".+\.geojson"/);
    const geo = JSON.parse(res.body as string);
    expect(geo.type).toBe('FeatureCollection');
    expect(geo.coordinateSystem).toMatch(/plan metres/i);
    const kinds = new Set(geo.features.map((f: { properties: { kind: string } }) => f.properties.kind));
    expect([...kinds].sort()).toEqual(['contour', 'room', 'station']);

    const stations = await sql<{ id: string; x_m: number; y_m: number; level_id: string }>(t.databaseUrl, 'SELECT id, x_m, y_m, level_id FROM stations WHERE survey_id = $1 AND NOT deleted', [ids.openSurveyId]);
    const plans = await sql<{ id: string; level_id: string; metres_per_pixel: number; origin_x_px: number; origin_y_px: number; original_name: string | null }>(t.databaseUrl, 'SELECT id, level_id, metres_per_pixel, origin_x_px, origin_y_px, original_name FROM plans WHERE NOT deleted');
    const stationFeatures = geo.features.filter((f: { properties: { kind: string } }) => f.properties.kind === 'station');
    expect(stationFeatures.length).toBe(stations.length);
    for (const s of stations) {
      const f = stationFeatures.find((x: { id: string }) => x.id === s.id);
      expect(f.geometry).toEqual({ type: 'Point', coordinates: [s.x_m, s.y_m] });
      const plan = plans.find((p) => p.level_id === s.level_id);
      expect(f.properties.levelId).toBe(s.level_id);
      if (plan) {
        expect(f.properties.planId).toBe(plan.id);
        expect(f.properties.planName).toBe(plan.original_name);
        expect(f.properties.calibration).toMatchObject({ metresPerPixel: plan.metres_per_pixel, originXPx: plan.origin_x_px, originYPx: plan.origin_y_px });
      }
    }
    for (const room of geo.features.filter((f: { properties: { kind: string } }) => f.properties.kind === 'room')) {
      const ring = room.geometry.coordinates[0];
      expect(ring[0]).toEqual(ring[ring.length - 1]);
    }
    const contour = geo.features.find((f: { properties: { kind: string }; geometry: { coordinates: unknown[] } }) => f.properties.kind === 'contour' && f.geometry.coordinates.length > 0);
    expect(contour.geometry.type).toBe('MultiPolygon');
    expect(contour.properties.calibration).not.toBeUndefined();
    expect(geo.cautions.join(' ')).toMatch(/implant/i);
  });
});
