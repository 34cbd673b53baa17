/**
 * EMC flags through the API and the flag job (real PostgreSQL, demo seed). Expected numbers are worked
 * out here from the readings in the database with f = eB/(2πmₑ) (CODATA 2018: e = 1.602 176 634e-19 C,
 * mₑ = 9.109 383 7015e-31 kg) and an expanded uncertainty of k = 2 times the gaussmeter's standard one
 * (2 % when it states none), independently of shared/emc.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { v7 as uuidv7 } from 'uuid';
import { EmcFlagListSchema, EmcRoomListSchema, type EmcFlag } from '../../shared/schemas/emc';
import { PushResponseSchema } from '../../shared/schemas/sync';
import { seedDemo } from '../../server/db/seed/demo';
import { startEmcFlagJob, type EmcFlagJob } from '../../server/features/emc/emc-flag-job';
import { createEmcRepository } from '../../server/features/emc/emc.repository';
import { createMailer } from '../../server/lib/mail';
import { countRows, demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { makeReading, makeStation, mutationFor, readDemoIds, type DemoIds } from '../setup/sync-fixtures';
import { createTestApp, RELAXED_RATE_LIMITS, testLogger, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

const E = 1.602176634e-19;
const ME = 9.1093837015e-31;
const fe = (b: number) => (E * b) / (2 * Math.PI * ME);

let t: InProcessApp;
let ids: DemoIds;
let job: EmcFlagJob;
let closeMailer: () => void;
let emc: SignedIn;
let admin: SignedIn;
let reviewer: SignedIn;
let surveyor: SignedIn;
let kestrel: SignedIn;

const flagsUrl = (query = '') => `/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/emc/flags${query}`;
const listFlags = async (who: SignedIn = emc, query = '') => EmcFlagListSchema.parse((await who.agent.get(flagsUrl(query)).expect(200)).body).flags;
const post = (who: SignedIn, path: string, body: object) => who.agent.post(`/api/orgs/${ids.orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
const flagChanges = () => countRows(t.databaseUrl, 'change_log', `entity = 'flags'`);

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  ids = await readDemoIds(t.databaseUrl);
  const mailer = createMailer({ smtpUrl: t.capture.url, from: 'Fringewalk test <no-reply@fringewalk.invalid>' });
  closeMailer = () => mailer.close();
  // A long interval: the test runs each pass itself.
  job = startEmcFlagJob({ db: t.db, mailer, publicUrl: TRUSTED_ORIGIN, logger: testLogger(), intervalMs: 3_600_000 });
  await job.runOnce();
  emc = await signIn(t.app, demoEmail('emc'));
  admin = await signIn(t.app, demoEmail('admin'));
  reviewer = await signIn(t.app, demoEmail('reviewer'));
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  kestrel = await signIn(t.app, KESTREL_ADMIN);
});
afterAll(async () => {
  await job?.stop();
  closeMailer?.();
  await t?.close();
});

describe('the demo survey', () => {
  it('flags the etch room: the electron line at the ECR field falls in ISM 2.4 GHz, with the numbers worked out from its readings', async () => {
    const flags = await listFlags();
    const flag = flags.find((f) => f.details.roomName.toLowerCase().includes('etch') && f.details.bandName === 'ISM 2.4 GHz' && f.species === 'electron' && f.harmonic === 1);
    expect(flag, JSON.stringify(flags.map((f) => [f.details.roomName, f.details.bandName, f.label]))).toBeDefined();
    const readings = await sql<{ field_t: number; u: number | null }>(
      t.databaseUrl,
      `SELECT fr.field_t, i.relative_uncertainty AS u FROM field_readings fr JOIN stations st ON st.id = fr.station_id
       LEFT JOIN instruments i ON i.id = fr.instrument_id WHERE st.room_id = $1 AND fr.survey_id = $2 AND NOT fr.deleted AND NOT st.deleted`,
      [flag!.roomId, ids.openSurveyId],
    );
    const U = (u: number | null) => 2 * (u ?? 0.02);
    const low = Math.min(...readings.map((r) => r.field_t * (1 - U(r.u))));
    const high = Math.max(...readings.map((r) => r.field_t * (1 + U(r.u))));
    expect(flag!.details.fieldLowT).toBeCloseTo(low, 12);
    expect(flag!.details.fieldHighT).toBeCloseTo(high, 12);
    expect(flag!.overlapLowerHz! / Math.max(fe(low), 2400e6)).toBeCloseTo(1, 9);
    expect(flag!.overlapUpperHz! / Math.min(fe(high), 2500e6)).toBeCloseTo(1, 9);
    // The open survey's readings are not all reviewed: provisional.
    expect(flag!.details.provisional).toBe(true);
    // The ECR tool is in the room: the fundamental's power is estimated, at the room's highest field.
    expect(flag!.details.emitters.length).toBeGreaterThan(0);
    expect(flag!.details.emission!.emittedPowerW).toBeGreaterThan(0);
    expect(flag!.details.emission!.fieldT).toBe(Math.max(...readings.map((r) => r.field_t)));
    expect(flag!.severity).toBe('medium'); // the demo band's severity
  });

  it('a chosen victim distance scales the flux density by the inverse square', async () => {
    const near = (await listFlags(emc, '?victimDistanceM=5')).find((f) => f.details.emission)!;
    const far = (await listFlags(emc, '?victimDistanceM=50')).find((f) => f.id === near.id)!;
    expect(near.details.emission!.fluxDensityWPerM2 / far.details.emission!.fluxDensityWPerM2).toBeCloseTo(100, 9);
    expect(near.details.emission!.spectralFluxDensityDbWPerM2Hz - far.details.emission!.spectralFluxDensityDbWPerM2Hz).toBeCloseTo(20, 9);
    // And on the reference analyser: 20 dB less received, the same noise floor.
    expect(near.details.emission!.receivedInRbwDbm - far.details.emission!.receivedInRbwDbm).toBeCloseTo(20, 9);
    expect(near.details.emission!.analyserNoiseFloorDbm).toBeCloseTo(-100, 9);
    expectError(await emc.agent.get(flagsUrl('?victimDistanceM=-3')), 400, 'VALIDATION_FAILED');
  });

  it('running the job again changes nothing', async () => {
    const before = await flagChanges();
    await job.runOnce();
    await job.runOnce();
    expect(await flagChanges()).toBe(before);
  });

  it('lists each room with its field interval, lines and hits for every member, and keeps other organisations out', async () => {
    const body = EmcRoomListSchema.parse((await surveyor.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/emc/rooms`).expect(200)).body);
    const etch = body.rooms.find((r) => r.name.toLowerCase().includes('etch'))!;
    expect(etch.lines.map((l) => l.label)).toContain('electron line n = 1');
    expect(etch.hits.some((h) => h.bandName === 'ISM 2.4 GHz')).toBe(true);
    expectError(await kestrel.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/emc/rooms`), 404, 'NOT_FOUND');
    expectError(await kestrel.agent.get(`/api/orgs/${ids.kestrelOrgId}/surveys/${ids.openSurveyId}/emc/flags`), 404, 'NOT_FOUND');
  });
});

describe('flags follow the readings', () => {
  it('a reading that moves a room’s line into a band raises a flag (and mails the EMC team); rejecting it withdraws the flag', async () => {
    // A band no room reaches yet: 100.5–110 GHz needs about 3.6 T.
    const band = await post(emc, '/watch-bands', { name: 'Test band 100 GHz', lowerHz: 100.5e9, upperHz: 110e9, reason: 'Test', source: 'Invented test data', severity: 'critical' }).expect(201);
    await job.runOnce();
    expect((await listFlags()).some((f) => f.watchBandId === band.body.id)).toBe(false);

    // The surveyor pushes a 3.6 T reading at a new station in the cyclotron control room.
    const [room] = await sql<{ id: string; level_id: string }>(t.databaseUrl, `SELECT id, level_id FROM rooms WHERE organisation_id = $1 AND name = 'Cyclotron control room'`, [ids.orgId]);
    const scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: room!.level_id, userId: ids.users.surveyor };
    const station = makeStation(scope, { id: uuidv7(), roomId: room!.id, xM: 20, yM: 7 });
    const reading = makeReading(scope, station.id, { magnitudeT: 3.6, bxT: null, byT: null, bzT: null, instrumentId: ids.gaussmeterId, unit: 'T' });
    const pushed = await surveyor.agent
      .post(`/api/orgs/${ids.orgId}/sync/push`)
      .set('Origin', TRUSTED_ORIGIN)
      .send({ deviceId: 'emc-test', mutations: [mutationFor('stations', station), mutationFor('field_readings', reading)] });
    expect(PushResponseSchema.parse(pushed.body).results.map((r) => r.status)).toEqual(['applied', 'applied']);
    await job.runOnce();

    const raised = (await listFlags()).find((f) => f.watchBandId === band.body.id)!;
    expect(raised).toMatchObject({ state: 'open', severity: 'critical', roomId: room!.id, species: 'electron', harmonic: 1 });
    expect(raised.details.fieldMaxReadT).toBe(3.6);
    const U = 2 * ids.gaussmeterRelativeUncertainty;
    expect(raised.overlapLowerHz).toBe(100.5e9);
    expect(raised.overlapUpperHz! / fe(3.6 * (1 + U))).toBeCloseTo(1, 9);
    const mail = await t.capture.waitFor((m) => m.to.includes('emc@harrowby.example') && m.text.includes('Test band 100 GHz'));
    expect(mail.text).toContain(`${TRUSTED_ORIGIN}/surveys/${ids.openSurveyId}/emc`);
    expect(mail.text).toContain('electron line n = 1 in Test band 100 GHz (critical) — Cyclotron control room');

    // A reviewer rejects the reading: the line falls back below the band and the open flag is withdrawn.
    await post(reviewer, `/surveys/${ids.openSurveyId}/decisions`, { readingIds: [reading.id], verdict: 'rejected', note: 'Probe touched the magnet yoke.' }).expect(200);
    await job.runOnce();
    expect((await listFlags()).some((f) => f.watchBandId === band.body.id)).toBe(false);
    expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'flags' AND entity_id = '${raised.id}' AND action = 'withdraw'`)).toBe(1);
  });
});

describe('a signed-off survey', () => {
  it('keeps its flags as they were at sign-off (its report hash covers them), while an open survey gets new ones', async () => {
    const countFor = (surveyId: string) => countRows(t.databaseUrl, 'flags', `survey_id = '${surveyId}' AND kind = 'line_in_band' AND NOT deleted`);
    const signedBefore = await countFor(ids.signedOffSurveyId);
    const openBefore = await countFor(ids.openSurveyId);
    // A band every room's electron line reaches (1 kHz – 1 THz).
    await post(emc, '/watch-bands', { name: 'Everything', lowerHz: 1e3, upperHz: 1e12, reason: 'Test', source: 'Invented test data', severity: 'low' }).expect(201);
    await job.runOnce();
    expect(await countFor(ids.signedOffSurveyId)).toBe(signedBefore);
    expect(await countFor(ids.openSurveyId)).toBeGreaterThan(openBefore);
  });
});

describe('working a flag', () => {
  let flag: EmcFlag;
  beforeAll(async () => {
    flag = (await listFlags()).find((f) => f.state === 'open')!;
  });

  it('only EMC engineers and admins acknowledge and resolve, with a note; the order is open → acknowledged → resolved', async () => {
    expectError(await post(surveyor, `/flags/${flag.id}/acknowledge`, { note: 'x' }), 403, 'FORBIDDEN');
    expectError(await post(reviewer, `/flags/${flag.id}/acknowledge`, { note: 'x' }), 403, 'FORBIDDEN');
    expectError(await post(emc, `/flags/${flag.id}/acknowledge`, { note: '  ' }), 400, 'VALIDATION_FAILED');
    const early = await post(emc, `/flags/${flag.id}/resolve`, { resolution: 'Lamp replaced.' });
    expectError(early, 409, 'CONFLICT');
    expect(early.body.error.message).toMatch(/Acknowledge the flag first/);

    const acked = (await post(emc, `/flags/${flag.id}/acknowledge`, { note: 'Etch tool owner told; shielding quote requested.' }).expect(200)).body as EmcFlag;
    expect(acked).toMatchObject({ state: 'acknowledged', acknowledgementNote: 'Etch tool owner told; shielding quote requested.', acknowledgedByUserId: emc.session.user.id });
    expectError(await post(admin, `/flags/${flag.id}/acknowledge`, { note: 'again' }), 409, 'CONFLICT');
    const resolved = (await post(admin, `/flags/${flag.id}/resolve`, { resolution: 'Shielding added around the applicator.' }).expect(200)).body as EmcFlag;
    expect(resolved).toMatchObject({ state: 'resolved', resolution: 'Shielding added around the applicator.', resolvedByUserId: admin.session.user.id });
    expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'flags' AND entity_id = '${flag.id}' AND action IN ('acknowledge', 'resolve')`)).toBe(2);
  });

  it('a resolved flag stays as it was left when the job runs again', async () => {
    await job.runOnce();
    expect((await listFlags()).find((f) => f.id === flag.id)).toMatchObject({ state: 'resolved' });
  });

  it('another organisation cannot touch it; a bad id is 400', async () => {
    expectError(await kestrel.agent.post(`/api/orgs/${ids.kestrelOrgId}/flags/${flag.id}/acknowledge`).set('Origin', TRUSTED_ORIGIN).send({ note: 'x' }), 404, 'NOT_FOUND');
    expectError(await post(emc, `/flags/not-a-uuid/acknowledge`, { note: 'x' }), 400, 'VALIDATION_FAILED');
  });
});

describe('flags of a signed-off survey', () => {
  it('are never written by a recomputation that reaches the survey after its sign-off', async () => {
    // The job reads the survey before it computes, and sign-off may commit in between: applying the
    // flags looks at the state again under the survey's row lock and writes nothing once it is signed.
    const repo = createEmcRepository(t.db);
    const before = await countRows(t.databaseUrl, 'flags', `survey_id = '${ids.signedOffSurveyId}'`);
    let decided = false;
    const out = await repo.applyFlags(
      ids.orgId,
      ids.signedOffSurveyId,
      () => {
        decided = true;
        return { creates: [], updates: [], withdraw: [] };
      },
      { actorUserId: null, requestId: undefined },
    );
    expect(out).toEqual({ created: [], updated: 0, withdrawn: 0 });
    expect(decided).toBe(false);
    expect(await countRows(t.databaseUrl, 'flags', `survey_id = '${ids.signedOffSurveyId}'`)).toBe(before);
  });
});
