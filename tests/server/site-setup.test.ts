/**
 * Site setup through the API (real PostgreSQL, real s3rver): sites and levels with archive and role
 * checks, calibration and what re-calibration does to what is placed on the plan, rooms and the station
 * re-assignment, magnets, emitters with their emission, and the per-site audit log.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { AuditListSchema } from '../../shared/schemas/audit';
import { EmitterSchema } from '../../shared/schemas/emitter';
import { CalibrationResultSchema, PlanSchema } from '../../shared/schemas/plan';
import { RoomWriteResultSchema } from '../../shared/schemas/room';
import { SiteDetailSchema, LevelSchema } from '../../shared/schemas/site';
import { SourceSchema } from '../../shared/schemas/source';
import { countRows, demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';
import { planRaster } from '../fixtures/plan-images';

describe('site setup API', () => {
  let t: InProcessApp;
  let admin: SignedIn;
  let reviewer: SignedIn;
  let viewer: SignedIn;
  let surveyor: SignedIn;
  let orgId: string;

  const post = (who: SignedIn, path: string, body: object = {}) => who.agent.post(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
  const patch = (who: SignedIn, path: string, body: object) => who.agent.patch(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
  const put = (who: SignedIn, path: string, body: object) => who.agent.put(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
  const del = (who: SignedIn, path: string) => who.agent.delete(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN);

  /** A station as the capture sync would store it, with a change_seq from the organisation's counter. */
  async function insertStation(surveyId: string, levelId: string, xM: number, yM: number): Promise<string> {
    const [row] = await sql<{ id: string }>(
      t.databaseUrl,
      `WITH seq AS (UPDATE organisations SET change_seq = change_seq + 1 WHERE id = $1 RETURNING change_seq)
       INSERT INTO stations (id, organisation_id, change_seq, survey_id, level_id, x_m, y_m) SELECT gen_random_uuid(), $1, seq.change_seq, $2, $3, $4, $5 FROM seq RETURNING id`,
      [orgId, surveyId, levelId, xM, yM],
    );
    return row!.id;
  }
  const station = async (id: string) => (await sql<{ x_m: number; y_m: number; room_id: string | null; revision: number }>(t.databaseUrl, 'SELECT x_m, y_m, room_id, revision FROM stations WHERE id = $1', [id]))[0]!;

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    admin = await signIn(t.app, demoEmail('admin'));
    reviewer = await signIn(t.app, demoEmail('reviewer'));
    viewer = await signIn(t.app, demoEmail('viewer'));
    surveyor = await signIn(t.app, demoEmail('surveyor'));
    orgId = admin.session.memberships[0]!.organisationId;
  });
  afterAll(async () => {
    await t?.close();
  });

  describe('sites and levels', () => {
    it('creates, reads, edits, archives and unarchives a site, with an audit row and a change_seq each time', async () => {
      const created = SiteDetailSchema.parse((await post(reviewer, '/sites', { name: '  North Annexe ', address: '1 Test Road' }).expect(201)).body);
      expect(created).toMatchObject({ name: 'North Annexe', address: '1 Test Road', archived: false, levels: [], revision: 1 });
      const edited = SiteDetailSchema.parse((await patch(admin, `/sites/${created.id}`, { notes: 'Loading bay on the east side.', address: null }).expect(200)).body);
      expect(edited).toMatchObject({ notes: 'Loading bay on the east side.', address: null, revision: 2 });
      expect(edited.changeSeq).toBeGreaterThan(created.changeSeq);
      const archived = SiteDetailSchema.parse((await post(admin, `/sites/${created.id}/archive`).expect(200)).body);
      expect(archived.archived).toBe(true);
      expect((await viewer.agent.get(`/api/orgs/${orgId}/sites`).expect(200)).body.sites.find((s: { id: string }) => s.id === created.id).archived).toBe(true);
      expect(SiteDetailSchema.parse((await post(admin, `/sites/${created.id}/unarchive`).expect(200)).body).archived).toBe(false);
      const audit = await sql<{ action: string }>(t.databaseUrl, `SELECT action FROM audit_log WHERE entity = 'sites' AND entity_id = $1 ORDER BY id`, [created.id]);
      expect(audit.map((a) => a.action)).toEqual(['create', 'update', 'archive', 'unarchive']);
      expect(await countRows(t.databaseUrl, 'change_log', `entity = 'sites' AND entity_id = '${created.id}'`)).toBe(4);
    });

    it('refuses writes by viewers, surveyors and EMC engineers, and bad input with field paths', async () => {
      for (const role of ['viewer', 'surveyor', 'emc'] as const) {
        const who = await signIn(t.app, demoEmail(role));
        expectError(await post(who, '/sites', { name: 'Nope' }), 403, 'FORBIDDEN');
      }
      const res = await post(admin, '/sites', { name: '   ' });
      expectError(res, 400, 'VALIDATION_FAILED');
      expect(res.body.error.details.issues[0].path).toBe('name');
    });

    it('has no delete route for sites (archive instead)', async () => {
      const site = (await post(admin, '/sites', { name: 'Kept forever' }).expect(201)).body;
      expectError(await del(admin, `/sites/${site.id}`), 404, 'NOT_FOUND');
      expect(await countRows(t.databaseUrl, 'sites', `id = '${site.id}' AND NOT deleted`)).toBe(1);
    });

    it('adds and edits levels, sorted by ordinal, and keeps another organisation out', async () => {
      const site = (await post(admin, '/sites', { name: 'Two floors' }).expect(201)).body;
      const upper = LevelSchema.parse((await post(admin, `/sites/${site.id}/levels`, { name: 'Level 1', ordinal: 1, elevationM: 4.2 }).expect(201)).body);
      await post(admin, `/sites/${site.id}/levels`, { name: 'Ground', ordinal: 0 }).expect(201);
      const list = (await viewer.agent.get(`/api/orgs/${orgId}/sites/${site.id}/levels`).expect(200)).body.levels;
      expect(list.map((l: { name: string }) => l.name)).toEqual(['Ground', 'Level 1']);
      const edited = LevelSchema.parse((await patch(reviewer, `/levels/${upper.id}`, { name: 'First floor', archived: true }).expect(200)).body);
      expect(edited).toMatchObject({ name: 'First floor', archived: true, elevationM: 4.2, revision: 2 });
      const kestrel = await signIn(t.app, KESTREL_ADMIN);
      const kestrelOrg = kestrel.session.memberships[0]!.organisationId;
      expectError(await kestrel.agent.get(`/api/orgs/${kestrelOrg}/sites/${site.id}`), 404, 'NOT_FOUND');
      expectError(await kestrel.agent.patch(`/api/orgs/${kestrelOrg}/levels/${upper.id}`).set('Origin', TRUSTED_ORIGIN).send({ name: 'x' }), 404, 'NOT_FOUND');
    });
  });

  describe('calibration, rooms and what happens to stations', () => {
    let siteId: string;
    let levelId: string;
    let planId: string;
    let openSurveyId: string;
    let closedSurveyId: string;

    beforeAll(async () => {
      siteId = (await post(admin, '/sites', { name: 'Magnet hall' }).expect(201)).body.id;
      levelId = (await post(admin, `/sites/${siteId}/levels`, { name: 'Ground' }).expect(201)).body.id;
      const upload = await admin.agent.post(`/api/orgs/${orgId}/levels/${levelId}/plans`).set('Origin', TRUSTED_ORIGIN).attach('file', await planRaster('png', 1000, 600), 'hall.png').expect(201);
      planId = PlanSchema.parse(upload.body).id;
      openSurveyId = (await post(admin, `/sites/${siteId}/surveys`, { name: 'Open survey' }).expect(201)).body.id;
      closedSurveyId = (await post(admin, `/sites/${siteId}/surveys`, { name: 'Submitted survey' }).expect(201)).body.id;
    });

    it('a first calibration from two points and a distance sets the scale (by hand: 10 m over 500 px = 0.02 m/px) and moves nothing', async () => {
      const res = await put(admin, `/plans/${planId}/calibration`, { pointA: { xPx: 100, yPx: 100 }, pointB: { xPx: 400, yPx: 500 }, distanceM: 10, origin: { xPx: 0, yPx: 600 }, northAngleDeg: -90 }).expect(200);
      const result = CalibrationResultSchema.parse(res.body);
      expect(result.plan.calibration).toEqual({ metresPerPixel: expect.closeTo(0.02, 12), originXPx: 0, originYPx: 600, northAngleDeg: 270 });
      expect(result.reprojection).toMatchObject({ policy: 'keep_pixels', stations: 0, rooms: 0, sources: 0, emitters: 0 });
      expect(result.reprojection.note).toMatch(/First calibration/);
    });

    it('refuses two points on the same pixel with a clear message', async () => {
      const res = await put(admin, `/plans/${planId}/calibration`, { pointA: { xPx: 5, yPx: 5 }, pointB: { xPx: 5, yPx: 5 }, distanceM: 3, origin: { xPx: 0, yPx: 0 } });
      expectError(res, 400, 'VALIDATION_FAILED');
      expect(res.body.error.message).toMatch(/1 px apart/);
    });

    it('assigns stations of open surveys to the room drawn around them, and out again when the outline changes', async () => {
      const inside = await insertStation(openSurveyId, levelId, 2, 2);
      const outside = await insertStation(openSurveyId, levelId, 8, 8);
      const closed = await insertStation(closedSurveyId, levelId, 2.5, 2.5);
      await sql(t.databaseUrl, `UPDATE surveys SET state = 'submitted', submitted_at = now(), submitted_by_user_id = $2 WHERE id = $1`, [closedSurveyId, admin.session.user.id]);

      const created = RoomWriteResultSchema.parse(
        (await post(reviewer, `/levels/${levelId}/rooms`, { name: 'Scanner room', use: 'MR scanner room', sensitivity: 'high', polygonM: [[0, 0], [5, 0], [5, 5], [0, 5]] }).expect(201)).body,
      );
      expect(created.room).toMatchObject({ name: 'Scanner room', sensitivity: 'high', areaM2: 25 });
      expect(created.stationsReassigned).toBe(1);
      expect((await station(inside)).room_id).toBe(created.room.id);
      expect((await station(outside)).room_id).toBeNull();
      expect((await station(closed)).room_id).toBeNull(); // a submitted survey's stations are not touched

      const moved = RoomWriteResultSchema.parse((await patch(admin, `/rooms/${created.room.id}`, { polygonM: [[6, 6], [10, 6], [10, 10], [6, 10]] }).expect(200)).body);
      expect(moved.stationsReassigned).toBe(2);
      expect((await station(inside)).room_id).toBeNull();
      expect((await station(outside)).room_id).toBe(created.room.id);
      expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'stations' AND action = 'assign_room' AND entity_id = '${outside}'`)).toBe(1);
    });

    it('refuses a room outline that crosses itself or has two corners', async () => {
      const bowTie = await post(admin, `/levels/${levelId}/rooms`, { name: 'Bad', polygonM: [[0, 0], [4, 4], [4, 0], [0, 4]] });
      expectError(bowTie, 400, 'VALIDATION_FAILED');
      expect(JSON.stringify(bowTie.body)).toMatch(/crosses itself/);
      expectError(await post(admin, `/levels/${levelId}/rooms`, { name: 'Bad', polygonM: [[0, 0], [4, 4]] }), 400, 'VALIDATION_FAILED');
    });

    it('re-calibration keeps everything on its pixel: doubling the scale doubles stations, outlines and magnet positions of open surveys (by hand)', async () => {
      const stationId = await insertStation(openSurveyId, levelId, 3, 4);
      const closedStation = await insertStation(closedSurveyId, levelId, 3, 4);
      const source = SourceSchema.parse((await post(admin, `/sites/${siteId}/sources`, { name: 'Test magnet', kind: 'test_magnet', nominalFieldT: 1.5, levelId, xM: 1, yM: 2, zM: 1 }).expect(201)).body);
      const room = (await viewer.agent.get(`/api/orgs/${orgId}/levels/${levelId}/rooms`).expect(200)).body.rooms[0];
      const before = await station(stationId);

      // Same origin, the two points now 250 px apart for the same 10 m: 0.04 m/px, twice the old scale.
      const res = await put(admin, `/plans/${planId}/calibration`, { pointA: { xPx: 100, yPx: 100 }, pointB: { xPx: 250, yPx: 300 }, distanceM: 10, origin: { xPx: 0, yPx: 600 }, northAngleDeg: 0 }).expect(200);
      const result = CalibrationResultSchema.parse(res.body);
      expect(result.plan.calibration!.metresPerPixel).toBeCloseTo(0.04, 12);
      expect(result.reprojection.rooms).toBe(1);
      expect(result.reprojection.sources).toBe(1);
      expect(result.reprojection.stationsKeptInClosedSurveys).toBe(2);
      expect(result.reprojection.stations).toBe(3);
      expect(result.reprojection.note).toMatch(/kept its position on the drawing/);

      const after = await station(stationId);
      expect([after.x_m, after.y_m]).toEqual([expect.closeTo(6, 9), expect.closeTo(8, 9)]);
      expect(after.revision).toBe(before.revision + 1);
      const kept = await station(closedStation);
      expect([kept.x_m, kept.y_m]).toEqual([3, 4]);
      const rooms = (await viewer.agent.get(`/api/orgs/${orgId}/levels/${levelId}/rooms`).expect(200)).body.rooms;
      expect(rooms[0].polygonM).toEqual(room.polygonM.map(([x, y]: [number, number]) => [expect.closeTo(2 * x, 9), expect.closeTo(2 * y, 9)]));
      const movedSource = (await viewer.agent.get(`/api/orgs/${orgId}/sites/${siteId}/sources`).expect(200)).body.sources.find((s: { id: string }) => s.id === source.id);
      expect([movedSource.xM, movedSource.yM]).toEqual([expect.closeTo(2, 9), expect.closeTo(4, 9)]);
    });

    it('deletes a room (tombstone) and takes its stations out of it; refuses while an emitter is in it', async () => {
      const room = RoomWriteResultSchema.parse((await post(admin, `/levels/${levelId}/rooms`, { name: 'Lamp store', polygonM: [[-20, -20], [-10, -20], [-10, -10], [-20, -10]] }).expect(201)).body).room;
      const emitter = (await post(admin, `/sites/${siteId}/emitters`, { roomId: room.id, name: 'Lamp', kind: 'discharge_lamp', electronDensityPerM3: 1e18, electronEnergyEv: 2, energyKind: 'total', volumeM3: 1e-4 }).expect(201)).body;
      expectError(await del(admin, `/rooms/${room.id}`), 409, 'CONFLICT');
      await del(admin, `/emitters/${emitter.id}`).expect(204);
      expect((await del(admin, `/rooms/${room.id}`).expect(200)).body).toEqual({ stationsReassigned: 0 });
      expect(await countRows(t.databaseUrl, 'rooms', `id = '${room.id}' AND deleted`)).toBe(1);
      expectError(await patch(admin, `/rooms/${room.id}`, { name: 'gone' }), 404, 'NOT_FOUND');
    });

    it('lists the site’s audit rows (site, level, plan, rooms, stations, magnets) for admins only', async () => {
      const res = await admin.agent.get(`/api/orgs/${orgId}/sites/${siteId}/audit?limit=500`).expect(200);
      const entries = AuditListSchema.parse(res.body).entries;
      const entities = new Set(entries.map((e) => e.entity));
      for (const entity of ['sites', 'levels', 'plans', 'rooms', 'stations', 'sources', 'emitters', 'surveys']) expect(entities, entity).toContain(entity);
      const calibrate = entries.find((e) => e.action === 'calibrate')!;
      expect(calibrate.actorName).toBe('Imogen Thwaite');
      expect((calibrate.after as { metresPerPixel: number }).metresPerPixel).toBeCloseTo(0.04, 12);
      // Nothing from other sites.
      const otherSite = entries.find((e) => e.entity === 'sites' && e.entityId !== siteId);
      expect(otherSite).toBeUndefined();
      expectError(await reviewer.agent.get(`/api/orgs/${orgId}/sites/${siteId}/audit`), 403, 'FORBIDDEN');
    });
  });

  describe('magnets and emitters', () => {
    let siteId: string;
    let levelId: string;
    let roomId: string;

    beforeAll(async () => {
      siteId = (await post(admin, '/sites', { name: 'Plasma lab' }).expect(201)).body.id;
      levelId = (await post(admin, `/sites/${siteId}/levels`, { name: 'Basement', ordinal: -1 }).expect(201)).body.id;
      roomId = (await post(admin, `/levels/${levelId}/rooms`, { name: 'Ion source bay', polygonM: [[0, 0], [6, 0], [6, 4], [0, 4]] }).expect(201)).body.room.id;
    });

    it('creates, edits and deletes a magnet; a position needs its level on the same site', async () => {
      const created = SourceSchema.parse(
        (await post(reviewer, `/sites/${siteId}/sources`, { name: 'NMR 600', kind: 'nmr', state: 'at_field', shielding: 'active', nominalFieldT: 14.1, levelId, xM: 3, yM: 2, axis: { x: 0, y: 0, z: 1 } }).expect(201)).body,
      );
      expect(created).toMatchObject({ kind: 'nmr', nominalFieldT: 14.1, axis: { x: 0, y: 0, z: 1 }, levelId });
      expectError(await post(admin, `/sites/${siteId}/sources`, { name: 'Floating', kind: 'mri', nominalFieldT: 3, xM: 1, yM: 1 }), 400, 'VALIDATION_FAILED');
      const otherLevel = (await viewer.agent.get(`/api/orgs/${orgId}/sites`).expect(200)).body.sites.find((s: { name: string }) => s.name.startsWith('Harrowby'));
      const demoLevel = (await viewer.agent.get(`/api/orgs/${orgId}/sites/${otherLevel.id}/levels`).expect(200)).body.levels[0].id;
      expectError(await patch(admin, `/sources/${created.id}`, { levelId: demoLevel }), 400, 'VALIDATION_FAILED');
      const ramped = SourceSchema.parse((await patch(admin, `/sources/${created.id}`, { state: 'ramped_down' }).expect(200)).body);
      expect(ramped).toMatchObject({ state: 'ramped_down', revision: 2 });
      expectError(await patch(viewer, `/sources/${created.id}`, { state: 'at_field' }), 403, 'FORBIDDEN');
      await del(admin, `/sources/${created.id}`).expect(204);
      expect((await viewer.agent.get(`/api/orgs/${orgId}/sites/${siteId}/sources`).expect(200)).body.sources).toEqual([]);
    });

    it('computes an emitter’s emission with units: P/V = 6.21e-20·nₑ·B²·⟨W⊥⟩ (NRL Plasma Formulary’s law in SI, REFERENCES.md)', async () => {
      // nₑ = 1e18 m⁻³, ⟨W⊥⟩ = 3 eV, at the 1 T reference: 6.21e-20 · 1e18 · 1 · 3 = 0.1863 W/m³; × 2e-3 m³ = 3.726e-4 W.
      const perp = EmitterSchema.parse(
        (await post(admin, `/sites/${siteId}/emitters`, { roomId, name: 'Ion gauge', kind: 'ion_gauge', electronDensityPerM3: 1e18, electronEnergyEv: 3, energyKind: 'perpendicular', volumeM3: 2e-3 }).expect(201)).body,
      );
      expect(perp.emission).toMatchObject({ fieldT: 1, fieldBasis: 'reference_1T', units: { fieldT: 'T', perVolumeWPerM3: 'W/m³', totalW: 'W' } });
      expect(perp.emission!.perVolumeWPerM3 / 0.1863).toBeCloseTo(1, 2);
      expect(perp.emission!.totalW / 3.726e-4).toBeCloseTo(1, 2);
      expect(perp.emissionNote).toMatch(/at 1 T/);

      // A total (isotropic) energy of 3 eV is ⟨W⊥⟩ = 2 eV: two thirds of the figure above (REFERENCES.md).
      const total = EmitterSchema.parse((await patch(admin, `/emitters/${perp.id}`, { energyKind: 'total' }).expect(200)).body);
      expect(total.emission!.perVolumeWPerM3 / perp.emission!.perVolumeWPerM3).toBeCloseTo(2 / 3, 12);

      // At 0.2 T (?fieldT=) the figures scale by B² = 0.04.
      const listed = (await viewer.agent.get(`/api/orgs/${orgId}/sites/${siteId}/emitters?fieldT=0.2`).expect(200)).body.emitters.map((e: unknown) => EmitterSchema.parse(e));
      expect(listed[0].emission.fieldBasis).toBe('query');
      expect(listed[0].emission.perVolumeWPerM3 / total.emission!.perVolumeWPerM3).toBeCloseTo(0.04, 12);
    });

    it('requires the energy kind, refuses energies beyond the non-relativistic law and rooms of other sites', async () => {
      const base = { roomId, name: 'Source', kind: 'ion_source', electronDensityPerM3: 1e16, electronEnergyEv: 50, volumeM3: 1e-3 };
      const noKind = await post(admin, `/sites/${siteId}/emitters`, base);
      expectError(noKind, 400, 'VALIDATION_FAILED');
      expect(noKind.body.error.details.issues[0].path).toBe('energyKind');
      const hot = await post(admin, `/sites/${siteId}/emitters`, { ...base, energyKind: 'perpendicular', electronEnergyEv: 60_000 });
      expectError(hot, 400, 'VALIDATION_FAILED');
      expect(hot.body.error.message).toMatch(/non-relativistic/);
      const demoSites = (await viewer.agent.get(`/api/orgs/${orgId}/sites`).expect(200)).body.sites;
      const other = demoSites.find((s: { id: string }) => s.id !== siteId);
      expectError(await post(admin, `/sites/${other.id}/emitters`, { ...base, energyKind: 'total' }), 400, 'VALIDATION_FAILED');
    });

    it('uses the highest field read in the room when there is one', async () => {
      const survey = (await post(admin, `/sites/${siteId}/surveys`, { name: 'Field check' }).expect(201)).body.id;
      const stationId = await insertStation(survey, levelId, 1, 1);
      await sql(t.databaseUrl, `UPDATE stations SET room_id = $2 WHERE id = $1`, [stationId, roomId]);
      await sql(
        t.databaseUrl,
        `WITH seq AS (UPDATE organisations SET change_seq = change_seq + 1 WHERE id = $1 RETURNING change_seq)
         INSERT INTO field_readings (id, organisation_id, change_seq, survey_id, station_id, surveyor_user_id, magnitude_t, unit, probe_orientation, height_m, measured_at)
         SELECT gen_random_uuid(), $1, seq.change_seq, $2, $3, $4, 0.05, 'mT', 'three_axis', 1, now() FROM seq`,
        [orgId, survey, stationId, surveyor.session.user.id],
      );
      const listed = (await viewer.agent.get(`/api/orgs/${orgId}/sites/${siteId}/emitters`).expect(200)).body.emitters.map((e: unknown) => EmitterSchema.parse(e));
      expect(listed[0].emission).toMatchObject({ fieldT: 0.05, fieldBasis: 'room_readings' });
    });
  });
});
