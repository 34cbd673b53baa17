/**
 * Sweeps explained through the API (real PostgreSQL, demo seed with its trace files in the local object
 * store): the etch laboratory's electron-line marker explained by the electron line n = 1, the 2.45 GHz
 * magnetron peak judged against the station's predicted band, the corridor's 7.05 MHz peak unexplained,
 * a sweep without a trace, one whose trace has not arrived and one whose file the store lacks saying so,
 * a peak found only in the trace, isolation between organisations, and bad ids.
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { synthesiseTrace } from '../../shared/emc/synthetic-trace';
import { traceToCsv } from '../../shared/emc/trace-csv';
import { SweepExplainedSchema, SweepListSchema, type SweepExplained } from '../../shared/schemas/emc-sweep';
import { attachmentObjectKey } from '../../shared/sync/attachment-key';
import { seedDemo } from '../../server/db/seed/demo';
import { demoId } from '../../server/db/seed/ids';
import { demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let emc: SignedIn;
let viewer: SignedIn;
let surveyor: SignedIn;
let kestrel: SignedIn;
let orgId: string;
const surveyId = demoId('harrowby:survey:2026');
const sweepId = (key: string) => demoId(`harrowby:survey:2026:sweep:${key}`);
const base = (org = orgId, survey = surveyId) => `/api/orgs/${org}/surveys/${survey}/sweeps`;
const explained = async (who: SignedIn, key: string): Promise<SweepExplained> => SweepExplainedSchema.parse((await who.agent.get(`${base()}/${sweepId(key)}/explained`).expect(200)).body);

// CODATA 2018 (NIST listing): e/(2π mₑ) = 27.992 489 872 GHz/T.
const ELECTRON_HZ_PER_T = 27.992_489_872e9;
/** The demo gaussmeter's relative standard uncertainty (1 %, its instrument record) expanded with k = 2 (JCGM 100:2008 §6.3, recalled). */
const U_EXPANDED = 2 * 0.01;
/** The demo analyser's relative frequency uncertainty (1 ppm, its record) expanded with k = 2. */
const A_EXPANDED = 2 * 1e-6;

/** |B| of the (single) reading at a sweep's station, T. */
async function stationFieldT(key: string): Promise<number> {
  const rows = await sql<{ field_t: number }>(t.databaseUrl, 'SELECT fr.field_t FROM field_readings fr JOIN sweeps s ON s.station_id = fr.station_id WHERE s.id = $1 AND NOT fr.deleted', [sweepId(key)]);
  expect(rows).toHaveLength(1);
  return Number(rows[0]!.field_t);
}

/** Is f within electron line n at field B, widened by U, plus RBW/2 and the analyser accuracy? (closed form, by hand) */
function withinElectronLine(frequencyHz: number, n: number, fieldT: number, rbwHz: number): boolean {
  const tol = rbwHz / 2 + A_EXPANDED * frequencyHz;
  return frequencyHz >= n * ELECTRON_HZ_PER_T * fieldT * (1 - U_EXPANDED) - tol && frequencyHz <= n * ELECTRON_HZ_PER_T * fieldT * (1 + U_EXPANDED) + tol;
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  emc = await signIn(t.app, demoEmail('emc'));
  viewer = await signIn(t.app, demoEmail('viewer'));
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  kestrel = await signIn(t.app, KESTREL_ADMIN);
  orgId = emc.session.memberships[0]!.organisationId;
});
afterAll(async () => {
  await t?.close();
});

describe('the etch laboratory sweep at the ECR tool', () => {
  it('predicts the electron line n = 1 from the station reading, widened by the gaussmeter uncertainty', async () => {
    const fieldT = await stationFieldT('etch');
    const e = await explained(emc, 'etch');
    expect(e.fieldInterval).toMatchObject({ basis: 'station', readings: 1, includesUnreviewed: true });
    expect(e.fieldInterval!.lowT).toBeCloseTo(fieldT * (1 - U_EXPANDED), 12);
    expect(e.fieldInterval!.highT).toBeCloseTo(fieldT * (1 + U_EXPANDED), 12);
    const inSpan = e.lines.filter((l) => l.inSpan);
    expect(inSpan.map((l) => `${l.species} ${l.harmonic}`)).toEqual(['electron 1']);
    expect(inSpan[0]!.lowHz / (ELECTRON_HZ_PER_T * fieldT * (1 - U_EXPANDED))).toBeCloseTo(1, 9);
    expect(inSpan[0]!.highHz / (ELECTRON_HZ_PER_T * fieldT * (1 + U_EXPANDED))).toBeCloseTo(1, 9);
    // The survey predicts electrons and protons, n = 1…3: six lines in all, the others outside 2.3–2.6 GHz.
    expect(e.lines).toHaveLength(6);
    expect(e.frequencyAccuracy.relative).toBeCloseTo(A_EXPANDED, 15);
    expect(e.watchBands.map((b) => b.name)).toContain('ISM 2.4 GHz');
  });

  it('explains the line marker by the electron line n = 1', async () => {
    const fieldT = await stationFieldT('etch');
    const e = await explained(emc, 'etch');
    const marker = e.peaks.find((p) => p.source === 'marker' && p.frequencyHz !== 2.45e9)!;
    // The seed put the marker at the cold electron line of the station reading (six digits).
    expect(marker.frequencyHz / (ELECTRON_HZ_PER_T * fieldT)).toBeCloseTo(1, 5);
    expect(marker.status).toBe('explained');
    expect(marker.explainedBy).toMatchObject({ species: 'electron', harmonic: 1, distanceHz: 0 });
    expect(marker.label).toMatch(/^explained by the electron line n = 1 at 2\.\d+–2\.\d+ GHz$/);
    expect(marker.toleranceHz).toBeCloseTo(100e3 / 2 + A_EXPANDED * marker.frequencyHz, 3);
  });

  it('finds the 2.45 GHz magnetron within the electron line n = 1: the ECR tool runs at resonance by design, so the frequency alone cannot tell them apart', async () => {
    const fieldT = await stationFieldT('etch');
    // 2.45 GHz is the electron line at 87.5 mT (the ECR resonance); the port reads ≈ 88.5 mT, about 1.1 % higher,
    // inside the ±2 % expanded gaussmeter uncertainty — so by the physics the peak lies within the line's band.
    expect(withinElectronLine(2.45e9, 1, fieldT, 100e3)).toBe(true);
    expect(Math.abs(2.45e9 / (ELECTRON_HZ_PER_T * fieldT) - 1)).toBeLessThan(U_EXPANDED);
    const e = await explained(emc, 'etch');
    const magnetron = e.peaks.find((p) => p.frequencyHz === 2.45e9)!;
    expect(magnetron).toMatchObject({ source: 'marker', status: 'explained', explainedBy: { species: 'electron', harmonic: 1 } });
  });

  it('draws the trace thinned to 2,000 points, keeps its highest point, and adds no duplicate of the markers from it', async () => {
    const e = await explained(emc, 'etch');
    expect(e.trace).toMatchObject({ status: 'shown', reason: null, totalPoints: 3001 });
    expect(e.trace.points!.frequencyHz.length).toBeLessThanOrEqual(2000);
    expect(e.trace.points!.frequencyHz[0]).toBeCloseTo(2.3e9, 0);
    // The magnetron peak (−27.5 dBm) drawn through the 100 kHz filter: at most 3.01 dB lower half a bin away (Gaussian).
    expect(Math.max(...e.trace.points!.levelDbm)).toBeGreaterThan(-27.5 - 3.02 - 0.2);
    // Displayed noise of the invented −160 dBm/Hz DANL at 100 kHz: −160 + 10·log₁₀(1e5) = −110 dBm.
    expect(e.trace.noiseFloorDbm!).toBeGreaterThan(-110.5);
    expect(e.trace.noiseFloorDbm!).toBeLessThan(-109.5);
    expect(e.peaks.filter((p) => p.source === 'trace')).toEqual([]);
    expect(e.peakRule).toMatch(/median/);
  });
});

describe('the corridor sweep under the lamps', () => {
  it('leaves the 7.05 MHz peak unexplained: it is on no electron line n = 1…3 at the station', async () => {
    const fieldT = await stationFieldT('corridor');
    for (const n of [1, 2, 3]) expect(withinElectronLine(7.05e6, n, fieldT, 9e3)).toBe(false);
    const e = await explained(emc, 'corridor');
    const spurious = e.peaks.find((p) => p.frequencyHz === 7.05e6)!;
    expect(spurious).toMatchObject({ source: 'marker', status: 'unexplained', explainedBy: null, label: 'unexplained' });
    const line = e.peaks.find((p) => p.frequencyHz !== 7.05e6 && p.source === 'marker')!;
    expect(line.explainedBy).toMatchObject({ species: 'electron', harmonic: 1 });
    expect(e.trace.status).toBe('shown');
  });
});

describe('the list of a survey’s sweeps', () => {
  it('gives each sweep its station, room and counts of explained and unexplained markers, to every member', async () => {
    for (const who of [emc, viewer, surveyor]) {
      const { sweeps } = SweepListSchema.parse((await who.agent.get(base()).expect(200)).body);
      const byId = new Map(sweeps.map((s) => [s.id, s]));
      expect(byId.get(sweepId('etch'))).toMatchObject({ room: { name: 'Plasma-etch laboratory' }, markerCounts: { explained: 2, unexplained: 0 }, hasTrace: true });
      expect(byId.get(sweepId('corridor'))).toMatchObject({ markerCounts: { explained: 1, unexplained: 1 }, hasTrace: true });
      expect(byId.get(sweepId('vault'))).toMatchObject({ room: { name: 'Cyclotron vault' }, markerCounts: { explained: 1, unexplained: 0 }, hasTrace: false });
      expect(byId.get(sweepId('etch'))!.station.label).toMatch(/^L1-\d{3}$/);
    }
  });

  it('is empty for a survey without sweeps', async () => {
    const { sweeps } = SweepListSchema.parse((await emc.agent.get(base(orgId, demoId('harrowby:survey:2025'))).expect(200)).body);
    expect(sweeps).toEqual([]);
  });
});

describe('a sweep whose trace is missing', () => {
  it('says when the sweep has no trace file', async () => {
    const e = await explained(emc, 'vault');
    expect(e.trace).toMatchObject({ status: 'none', points: null, totalPoints: null });
    expect(e.trace.reason).toMatch(/no trace file/);
  });

  it('says when the trace has not reached the server yet, then when the store lacks it', async () => {
    const sha = 'a'.repeat(64);
    const key = attachmentObjectKey(orgId, 'trace', sweepId('vault'), sha);
    await sql(t.databaseUrl, 'UPDATE sweeps SET trace_object_key = $1, trace_sha256 = $2 WHERE id = $3', [key, sha, sweepId('vault')]);
    const pending = await explained(viewer, 'vault');
    expect(pending.trace).toMatchObject({ status: 'pending', points: null });
    expect(pending.trace.reason).toMatch(/not reached the server/);
    expect(pending.peaks.map((p) => p.status)).toEqual(['explained']);
    await sql(t.databaseUrl, `INSERT INTO attachments (organisation_id, object_key, entity, record_id, kind, sha256, content_type, bytes) VALUES ($1, $2, 'sweeps', $3, 'trace', $4, 'text/csv', 10)`, [orgId, key, sweepId('vault'), sha]);
    const unavailable = await explained(viewer, 'vault');
    expect(unavailable.trace).toMatchObject({ status: 'unavailable', points: null });
  });

  it('reports a trace file it cannot read instead of failing', async () => {
    const bytes = Buffer.from('Frequency (MHz),Level (dBm)\r\n1,-100\r\n2,loud\r\n');
    const sha = createHash('sha256').update(bytes).digest('hex');
    const key = attachmentObjectKey(orgId, 'trace', sweepId('vault'), sha);
    await t.storage.putObject(key, bytes, 'text/csv');
    await sql(t.databaseUrl, 'UPDATE sweeps SET trace_object_key = $1, trace_sha256 = $2 WHERE id = $3', [key, sha, sweepId('vault')]);
    await sql(t.databaseUrl, `INSERT INTO attachments (organisation_id, object_key, entity, record_id, kind, sha256, content_type, bytes) VALUES ($1, $2, 'sweeps', $3, 'trace', $4, 'text/csv', $5)`, [orgId, key, sweepId('vault'), sha, bytes.length]);
    const e = await explained(emc, 'vault');
    expect(e.trace.status).toBe('unreadable');
    expect(e.trace.reason).toContain('Row 3');
  });

  it('matches a peak found only in an uploaded trace, with source "trace"', async () => {
    // An invented vault trace: the marked line plus an unmarked 13.56 MHz signal (an RF heater next door).
    const [row] = await sql<{ peaks: { frequencyHz: number; levelDbm: number }[] }>(t.databaseUrl, 'SELECT peaks FROM sweeps WHERE id = $1', [sweepId('vault')]);
    const trace = synthesiseTrace({ startHz: 1e6, stopHz: 30e6, points: 5801, rbwHz: 9e3, noiseFloorDbm: -120, noiseSigmaDb: 1, signals: [...row!.peaks, { frequencyHz: 13.56e6, levelDbm: -90 }], seed: 11 });
    const bytes = Buffer.from(traceToCsv(trace));
    const sha = createHash('sha256').update(bytes).digest('hex');
    const key = attachmentObjectKey(orgId, 'trace', sweepId('vault'), sha);
    await t.storage.putObject(key, bytes, 'text/csv');
    await sql(t.databaseUrl, 'UPDATE sweeps SET trace_object_key = $1, trace_sha256 = $2 WHERE id = $3', [key, sha, sweepId('vault')]);
    await sql(t.databaseUrl, `INSERT INTO attachments (organisation_id, object_key, entity, record_id, kind, sha256, content_type, bytes) VALUES ($1, $2, 'sweeps', $3, 'trace', $4, 'text/csv', $5)`, [orgId, key, sweepId('vault'), sha, bytes.length]);
    const fieldT = await stationFieldT('vault');
    for (const n of [1, 2, 3]) expect(withinElectronLine(13.56e6, n, fieldT, 9e3)).toBe(false);
    const e = await explained(emc, 'vault');
    expect(e.trace.status).toBe('shown');
    const fromTrace = e.peaks.filter((p) => p.source === 'trace');
    expect(fromTrace).toHaveLength(1);
    // Within half a 5 kHz bin of 13.56 MHz; tolerance RBW/2 + half a bin + accuracy.
    expect(Math.abs(fromTrace[0]!.frequencyHz - 13.56e6)).toBeLessThanOrEqual(2.5e3 + 1);
    expect(fromTrace[0]!.toleranceHz).toBeCloseTo(4.5e3 + 2.5e3 + A_EXPANDED * fromTrace[0]!.frequencyHz, 0);
    expect(fromTrace[0]!.status).toBe('unexplained');
    expect(e.peaks.filter((p) => p.source === 'marker').map((p) => p.status)).toEqual(['explained']);
  });
});

describe('who may read and what is refused', () => {
  it('hides another organisation’s sweeps: not a member is 404, and a survey id from elsewhere is 404', async () => {
    expectError(await kestrel.agent.get(base()), 404, 'NOT_FOUND');
    expectError(await kestrel.agent.get(`${base()}/${sweepId('etch')}/explained`), 404, 'NOT_FOUND');
    const kestrelOrg = kestrel.session.memberships[0]!.organisationId;
    expectError(await kestrel.agent.get(base(kestrelOrg)), 404, 'NOT_FOUND');
    expectError(await kestrel.agent.get(`${base(kestrelOrg)}/${sweepId('etch')}/explained`), 404, 'NOT_FOUND');
  });

  it('refuses ids that are not UUIDs with 400, and unknown or mismatched ones with 404', async () => {
    expectError(await emc.agent.get(`/api/orgs/${orgId}/surveys/not-a-uuid/sweeps`), 400, 'VALIDATION_FAILED');
    expectError(await emc.agent.get(`${base()}/12345/explained`), 400, 'VALIDATION_FAILED');
    expectError(await emc.agent.get(`${base()}/${demoId('no such sweep')}/explained`), 404, 'NOT_FOUND');
    expectError(await emc.agent.get(`${base(orgId, demoId('harrowby:survey:2025'))}/${sweepId('etch')}/explained`), 404, 'NOT_FOUND');
    expectError(await emc.agent.get(base(orgId, demoId('no such survey'))), 404, 'NOT_FOUND');
  });

  it('asks to sign in first', async () => {
    const { default: request } = await import('supertest');
    expectError(await request(t.app).get(base()), 401, 'UNAUTHENTICATED');
  });
});
