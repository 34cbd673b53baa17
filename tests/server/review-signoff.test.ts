/**
 * Submit, sign-off and reopen (issue 7 §4, §7): sign-off is refused while a reading is undecided or
 * waits for re-measure and while a sync conflict is open; it records who, when and the SHA-256 of the
 * report's canonical JSON (recomputed here with node:crypto); a signed-off survey refuses writes through
 * every route, sync push included; reopening is audited with its reason; the e-mails go to the
 * reviewers (submitted) and to the team (signed off).
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { ReviewReadingsSchema, ReviewStatusSchema, SurveyReportSchema } from '../../shared/schemas/review';
import { ConflictListSchema, PullResponseSchema, PushResponseSchema } from '../../shared/schemas/sync';
import { canonicalJson } from '../../shared/review/canonical-json';
import { demoEmail, expectError, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { edited, makeReading, makeStation, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import type { Mutation } from '../../shared/sync/mutation';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let scope: Scope;
const who: Record<string, SignedIn> = {};

const path = (p: string) => `/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}${p}`;
const post = (as: SignedIn, p: string, body: object = {}) => as.agent.post(path(p)).set('Origin', TRUSTED_ORIGIN).send(body);
const push = async (as: SignedIn, mutations: Mutation[], deviceId: string) => {
  const res = await as.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId, mutations });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return PushResponseSchema.parse(res.body).results;
};

/**
 * RFC 8785 canonical JSON written independently of shared/review/canonical-json.ts: JSON.stringify
 * with every object's keys re-inserted in sorted order (JSON.stringify keeps insertion order for
 * non-integer keys, and no key in the report is an integer).
 */
function independentCanonical(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.keys(v as object).sort().map((k) => [k, (v as Record<string, unknown>)[k]])) : v,
  );
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  ids = await readDemoIds(t.databaseUrl);
  for (const role of ['admin', 'reviewer', 'emc', 'surveyor', 'viewer'] as const) who[role] = await signIn(t.app, demoEmail(role));
  who.surveyor2 = await signIn(t.app, 'surveyor2@harrowby.example');
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
});
afterAll(async () => {
  await t?.close();
});

describe('submit, sign-off, reopen', () => {
  let conflictId: string;
  let signedSha: string;

  it('an open survey with a sync conflict is refused sign-off with every reason listed', async () => {
    // Two devices edit the same new reading from the same base: the second edit is kept as a conflict.
    const station = makeStation(scope, { label: 'Conflict test' });
    const reading = makeReading(scope, station.id, { magnitudeT: 1.0e-3 });
    await push(who.surveyor!, [mutationFor('stations', station), mutationFor('field_readings', reading)], 'device-a');
    await push(who.surveyor!, [mutationFor('field_readings', edited(reading, { notes: 'A' }))], 'device-a');
    const [b] = await push(who.surveyor!, [mutationFor('field_readings', edited(reading, { notes: 'B' }))], 'device-b');
    expect(b!.status).toBe('conflict');
    conflictId = b!.status === 'conflict' ? b!.conflictId : '';

    const res = await post(who.reviewer!, '/sign-off');
    expectError(res, 409, 'CONFLICT');
    const codes = (res.body.error.details.blockers as { code: string }[]).map((x) => x.code);
    expect(codes).toEqual(expect.arrayContaining(['not_submitted', 'undecided', 'remeasure', 'open_conflicts']));
  });

  it('submitting: EMC engineers, viewers and unassigned surveyors may not; the assigned surveyor may, and the reviewers are e-mailed', async () => {
    expectError(await post(who.emc!, '/submit'), 403, 'FORBIDDEN');
    expectError(await post(who.viewer!, '/submit'), 403, 'FORBIDDEN');
    expectError(await post(who.surveyor2!, '/submit'), 403, 'NOT_ASSIGNED');
    t.capture.clear();
    const status = ReviewStatusSchema.parse((await post(who.surveyor!, '/submit').expect(200)).body);
    expect(status).toMatchObject({ state: 'submitted', submittedBy: { userId: ids.users.surveyor } });
    expect(status.mailed).toEqual([demoEmail('reviewer')]);
    const mail = await t.capture.waitFor((m) => m.to.includes(demoEmail('reviewer')) && /submitted for review/.test(m.subject));
    expect(mail.text).toContain(`/surveys/${ids.openSurveyId}/review`);
    expectError(await post(who.reviewer!, '/submit'), 409, 'SURVEY_NOT_OPEN');
    // Capture has stopped: a push into the submitted survey is refused.
    const [pushed] = await push(who.surveyor!, [mutationFor('stations', makeStation(scope))], 'device-a');
    expect(pushed).toMatchObject({ status: 'rejected', error: { code: 'SURVEY_NOT_OPEN' } });
  });

  it('sign-off is refused while readings are undecided or wait for re-measure, then while the conflict is open', async () => {
    let res = await post(who.reviewer!, '/sign-off');
    expectError(res, 409, 'CONFLICT');
    const blockers = res.body.error.details.blockers as { code: string; count: number }[];
    expect(blockers.map((x) => x.code).sort()).toEqual(['open_conflicts', 'remeasure', 'undecided']);
    const rows = ReviewReadingsSchema.parse((await who.reviewer!.agent.get(path('/review/readings')).expect(200)).body).readings;
    const undecided = rows.filter((r) => !r.decision).length;
    expect(blockers.find((x) => x.code === 'undecided')!.count).toBe(undecided);
    expect(blockers.find((x) => x.code === 'remeasure')!.count).toBe(rows.filter((r) => r.decision?.verdict === 'remeasure').length);

    // Accept all but one: still refused for that one.
    const last = rows.at(-1)!;
    await post(who.reviewer!, '/decisions', { readingIds: rows.slice(0, -1).map((r) => r.id), verdict: 'accepted' }).expect(200);
    res = await post(who.reviewer!, '/sign-off');
    expect(res.body.error.details.blockers).toEqual(expect.arrayContaining([expect.objectContaining({ code: 'undecided', count: 1 })]));
    await post(who.reviewer!, '/decisions', { readingIds: [last.id], verdict: 'rejected', note: 'Taken with the meter range set wrong.' }).expect(200);
    res = await post(who.reviewer!, '/sign-off');
    expect(res.body.error.details.blockers.map((x: { code: string }) => x.code)).toEqual(['open_conflicts']);

    // The conflict is resolved through the sync feature's own endpoint.
    const conflicts = ConflictListSchema.parse((await who.reviewer!.agent.get(`/api/orgs/${ids.orgId}/sync/conflicts`).query({ surveyId: ids.openSurveyId }).expect(200)).body).conflicts;
    expect(conflicts.map((c) => c.id)).toEqual([conflictId]);
    await who.reviewer!.agent.post(`/api/orgs/${ids.orgId}/sync/conflicts/${conflictId}/resolve`).set('Origin', TRUSTED_ORIGIN).send({ choose: 'server' }).expect(200);
  });

  it('a surveyor may not sign off; a reviewer signs off with who, when and the SHA-256 of the report data, and the team is e-mailed', async () => {
    expectError(await post(who.surveyor!, '/sign-off'), 403, 'FORBIDDEN');
    expectError(await post(who.emc!, '/sign-off'), 403, 'FORBIDDEN');
    t.capture.clear();
    const before = Date.now();
    const status = ReviewStatusSchema.parse((await post(who.reviewer!, '/sign-off').expect(200)).body);
    expect(status).toMatchObject({ state: 'signed_off', signedOffBy: { userId: ids.users.reviewer }, signOffBlockers: [{ code: 'signed_off' }] });
    const [row] = await sql<{ state: string; signed_off_by_user_id: string; signed_off_at: Date; report_sha256: string }>(
      t.databaseUrl,
      'SELECT state, signed_off_by_user_id, signed_off_at, report_sha256 FROM surveys WHERE id = $1',
      [ids.openSurveyId],
    );
    expect(row!.state).toBe('signed_off');
    expect(row!.signed_off_by_user_id).toBe(ids.users.reviewer);
    expect(Math.abs(row!.signed_off_at.getTime() - before)).toBeLessThan(60_000);
    expect(row!.report_sha256).toMatch(/^[0-9a-f]{64}$/);
    signedSha = row!.report_sha256;

    // The stored hash is the SHA-256 (node:crypto) of the canonical JSON of the report's data, as served now.
    const report = SurveyReportSchema.parse((await who.viewer!.agent.get(path('/report')).expect(200)).body);
    const canonical = independentCanonical(report.data);
    expect(canonicalJson(report.data)).toBe(canonical);
    expect(createHash('sha256').update(canonical, 'utf8').digest('hex')).toBe(row!.report_sha256);
    expect(report.dataSha256).toBe(row!.report_sha256);
    expect(report.status.reportSha256).toBe(row!.report_sha256);
    // Every reading in the report names its station, instrument, person and decision.
    expect(report.data.readings.length).toBeGreaterThan(100);
    const people = new Set(report.data.people.map((p) => p.userId));
    const stations = new Set(report.data.stations.map((s) => s.id));
    for (const r of report.data.readings) {
      expect(people.has(r.surveyorUserId)).toBe(true);
      expect(stations.has(r.stationId)).toBe(true);
      expect(r.decision).not.toBeNull();
      if (r.instrumentId) expect(report.data.instruments.some((i) => i.id === r.instrumentId)).toBe(true);
    }

    // The survey's team as assigned in the demo (its surveyors and reviewer).
    const team = (
      await sql<{ email: string }>(t.databaseUrl, 'SELECT DISTINCT u.email FROM survey_assignments sa JOIN users u ON u.id = sa.user_id WHERE sa.survey_id = $1 AND NOT sa.deleted', [ids.openSurveyId])
    ).map((r) => r.email);
    expect(team).toEqual(expect.arrayContaining([demoEmail('surveyor'), demoEmail('reviewer')]));
    for (const email of team) {
      const mail = await t.capture.waitFor((m) => m.to.includes(email) && /signed off/.test(m.subject));
      expect(mail.text).toContain(row!.report_sha256);
    }
    expect([...status.mailed!].sort()).toEqual(team.sort());
  });

  it('a signed-off survey refuses writes through every route, sync push included', async () => {
    const [reading] = await sql<{ id: string }>(t.databaseUrl, 'SELECT id FROM field_readings WHERE survey_id = $1 AND NOT deleted LIMIT 1', [ids.openSurveyId]);
    expectError(await post(who.reviewer!, '/decisions', { readingIds: [reading!.id], verdict: 'rejected', note: 'late change' }), 409, 'SURVEY_NOT_OPEN');
    const csv = 'level_id,x_m,y_m,surveyor_email,measured_at,magnitude_mT\r\n' + `${ids.levelId},1,1,${demoEmail('surveyor')},2026-11-20T10:00:00Z,0.5\r\n`;
    const imported = await who.reviewer!.agent.post(path('/imports/readings')).query({ mode: 'all' }).set('Origin', TRUSTED_ORIGIN).set('Content-Type', 'text/csv').send(csv);
    expectError(imported, 409, 'SURVEY_NOT_OPEN');
    expectError(await who.reviewer!.agent.patch(path('')).set('Origin', TRUSTED_ORIGIN).send({ name: 'Renamed' }), 409, 'CONFLICT');
    expectError(await who.reviewer!.agent.put(path('/assignments')).set('Origin', TRUSTED_ORIGIN).send({ surveyors: [], reviewers: [] }), 409, 'CONFLICT');
    expectError(await post(who.reviewer!, '/submit'), 409, 'SURVEY_NOT_OPEN');
    expectError(await post(who.reviewer!, '/sign-off'), 409, 'SURVEY_NOT_OPEN');
    // Sync push: a new station, and an edit of an existing reading, are both refused.
    const [existing] = await sql<Record<string, unknown>>(t.databaseUrl, 'SELECT id, revision FROM field_readings WHERE survey_id = $1 AND surveyor_user_id = $2 AND NOT deleted LIMIT 1', [ids.openSurveyId, ids.users.surveyor]);
    const results = await push(
      who.surveyor!,
      [mutationFor('stations', makeStation(scope)), { ...mutationFor('field_readings', makeReading(scope, makeStation(scope).id, { id: existing!.id as string, revision: (existing!.revision as number) + 1 })) }],
      'device-a',
    );
    expect(results.map((r) => (r.status === 'rejected' ? r.error.code : r.status))).toEqual(['SURVEY_NOT_OPEN', 'SURVEY_NOT_OPEN']);
    // Nothing changed: the hash still matches.
    const report = SurveyReportSchema.parse((await who.reviewer!.agent.get(path('/report')).expect(200)).body);
    expect(report.dataSha256).toBe(signedSha);
  });

  it('reopening needs a reviewer and a reason, is audited, and devices pull the open survey', async () => {
    const { cursor } = await pullAllSurveyor();
    expectError(await post(who.surveyor!, '/reopen', { reason: 'x' }), 403, 'FORBIDDEN');
    expectError(await post(who.reviewer!, '/reopen', {}), 400, 'VALIDATION_FAILED');
    const status = ReviewStatusSchema.parse((await post(who.reviewer!, '/reopen', { reason: 'Client asked for the roof level too.' }).expect(200)).body);
    expect(status).toMatchObject({ state: 'open', signedOffAt: null, reportSha256: null });
    const audit = await sql<{ action: string; actor_user_id: string; before: Record<string, unknown>; after: Record<string, unknown> }>(
      t.databaseUrl,
      `SELECT action, actor_user_id, before, after FROM audit_log WHERE entity = 'surveys' AND entity_id = $1 AND action IN ('reopen', 'reopen_reason') ORDER BY id`,
      [ids.openSurveyId],
    );
    expect(audit.map((a) => a.action)).toEqual(['reopen', 'reopen_reason']);
    expect(audit.every((a) => a.actor_user_id === ids.users.reviewer)).toBe(true);
    expect(audit[1]!.after).toEqual({ reason: 'Client asked for the roof level too.' });
    expect(audit[1]!.before).toMatchObject({ state: 'signed_off', reportSha256: signedSha });
    expectError(await post(who.reviewer!, '/reopen', { reason: 'again' }), 409, 'CONFLICT');
    const pulled = (await pullAllSurveyor(cursor)).changes.filter((c) => c.entity === 'surveys' && c.record.id === ids.openSurveyId);
    expect(pulled.at(-1)!.record).toMatchObject({ state: 'open', signedOffAt: null });

    // The hash covers the decisions: changing one changes the report's hash.
    const [reading] = await sql<{ id: string }>(t.databaseUrl, 'SELECT field_reading_id AS id FROM decisions WHERE survey_id = $1 AND verdict = $2 AND field_reading_id IS NOT NULL LIMIT 1', [ids.openSurveyId, 'accepted']);
    await post(who.reviewer!, '/decisions', { readingIds: [reading!.id], verdict: 'rejected', note: 'On second look, the probe was tilted.' }).expect(200);
    const report = SurveyReportSchema.parse((await who.reviewer!.agent.get(path('/report')).expect(200)).body);
    expect(report.dataSha256).not.toBe(signedSha);
  });
});

async function pullAllSurveyor(since = '0') {
  const changes: { entity: string; record: Record<string, unknown> }[] = [];
  let cursor = since;
  for (;;) {
    const page = PullResponseSchema.parse((await who.surveyor!.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ since: cursor, limit: 5000 }).expect(200)).body);
    changes.push(...page.changes);
    cursor = page.nextCursor;
    if (!page.hasMore) return { changes, cursor };
  }
}
