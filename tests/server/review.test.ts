/**
 * Review decisions (issue 7 §3): who may decide, the notes a re-measure or a rejection needs, one live
 * decision per reading (a new revision when decided again), decisions as synced records that reach the
 * surveyor's device through pull, the re-measure e-mail to the reading's surveyor, and organisation
 * boundaries.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { DecisionsResultSchema, ReviewReadingsSchema, type ReviewReading } from '../../shared/schemas/review';
import { PullResponseSchema } from '../../shared/schemas/sync';
import { countRows, demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { readDemoIds, type DemoIds } from '../setup/sync-fixtures';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
const who: Record<string, SignedIn> = {};

const decide = (as: SignedIn, body: object, orgId = ids.orgId, surveyId = ids.openSurveyId) =>
  as.agent.post(`/api/orgs/${orgId}/surveys/${surveyId}/decisions`).set('Origin', TRUSTED_ORIGIN).send(body);

async function readings(as = who.reviewer!): Promise<ReviewReading[]> {
  const res = await as.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/review/readings`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return ReviewReadingsSchema.parse(res.body).readings;
}

async function pullAll(as: SignedIn, since = '0') {
  const changes: { seq: number; entity: string; record: Record<string, unknown> }[] = [];
  let cursor = since;
  for (;;) {
    const res = await as.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ since: cursor, limit: 5000 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const page = PullResponseSchema.parse(res.body);
    changes.push(...page.changes);
    cursor = page.nextCursor;
    if (!page.hasMore) return { changes, cursor };
  }
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  ids = await readDemoIds(t.databaseUrl);
  for (const role of ['admin', 'reviewer', 'emc', 'surveyor', 'viewer'] as const) who[role] = await signIn(t.app, demoEmail(role));
  who.kestrel = await signIn(t.app, KESTREL_ADMIN);
});
afterAll(async () => {
  await t?.close();
});

describe('review table', () => {
  it('lists every live reading and sweep of the survey with station, person, instrument, class and decision', async () => {
    const rows = await readings();
    const readingCount = await countRows(t.databaseUrl, 'field_readings', `survey_id = '${ids.openSurveyId}' AND NOT deleted`);
    const sweepCount = await countRows(t.databaseUrl, 'sweeps', `survey_id = '${ids.openSurveyId}' AND NOT deleted`);
    expect(readingCount).toBeGreaterThan(100);
    expect(rows.filter((r) => r.kind === 'field_reading')).toHaveLength(readingCount);
    expect(rows.filter((r) => r.kind === 'sweep')).toHaveLength(sweepCount);
    const reading = rows.find((r) => r.kind === 'field_reading' && r.instrumentId)!;
    // |B| is the database's own generated column; the class is the zone set's highest threshold reached.
    const [db] = await sql<{ field_t: number; thresholds: { fieldT: number; name: string }[] }>(
      t.databaseUrl,
      `SELECT fr.field_t, z.thresholds FROM field_readings fr JOIN surveys s ON s.id = fr.survey_id JOIN zone_sets z ON z.id = s.zone_set_id WHERE fr.id = $1`,
      [reading.id],
    );
    expect(reading.fieldT).toBe(db!.field_t);
    const reached = [...db!.thresholds].sort((a, b) => a.fieldT - b.fieldT).filter((th) => db!.field_t >= th.fieldT);
    expect(reading.safetyClass?.index).toBe(reached.length - 1);
    if (reached.length) expect(reading.safetyClass?.label).toBe(reached.at(-1)!.name);
    expect(reading.surveyorName).toBeTruthy();
    expect(reading.instrumentLabel).toMatch(/ · /);
    // The seeded re-measure request shows as the reading's decision.
    expect(rows.some((r) => r.decision?.verdict === 'remeasure')).toBe(true);
  });

  it('is for reviewers and admins of the organisation only', async () => {
    await readings(who.admin);
    for (const role of ['emc', 'surveyor', 'viewer']) expectError(await who[role]!.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/review/readings`), 403, 'FORBIDDEN');
    expectError(await who.kestrel!.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/review/readings`), 404, 'NOT_FOUND');
    // Kestrel's own organisation does not have this survey.
    expectError(await who.kestrel!.agent.get(`/api/orgs/${ids.kestrelOrgId}/surveys/${ids.openSurveyId}/review/readings`), 404, 'NOT_FOUND');
  });
});

describe('decisions', () => {
  it('reviewers and admins decide; surveyors, EMC engineers, viewers and other organisations may not', async () => {
    const rows = (await readings()).filter((r) => r.kind === 'field_reading' && !r.decision);
    const [a, b] = rows;
    for (const role of ['emc', 'surveyor', 'viewer']) expectError(await decide(who[role]!, { readingIds: [a!.id], verdict: 'accepted' }), 403, 'FORBIDDEN');
    expectError(await decide(who.kestrel!, { readingIds: [a!.id], verdict: 'accepted' }), 404, 'NOT_FOUND');
    expectError(await decide(who.kestrel!, { readingIds: [a!.id], verdict: 'accepted' }, ids.kestrelOrgId), 404, 'NOT_FOUND');
    const byReviewer = DecisionsResultSchema.parse((await decide(who.reviewer!, { readingIds: [a!.id], verdict: 'accepted' }).expect(200)).body);
    expect(byReviewer).toMatchObject({ decided: 1, unchanged: 0 });
    const byAdmin = DecisionsResultSchema.parse((await decide(who.admin!, { readingIds: [b!.id], verdict: 'rejected', note: 'Probe cable kinked.' }).expect(200)).body);
    expect(byAdmin.decided).toBe(1);
    const [row] = await sql<{ verdict: string; reviewer_user_id: string; note: string | null }>(t.databaseUrl, 'SELECT verdict, reviewer_user_id, note FROM decisions WHERE field_reading_id = $1 AND NOT deleted', [b!.id]);
    expect(row).toEqual({ verdict: 'rejected', reviewer_user_id: ids.users.admin, note: 'Probe cable kinked.' });
  });

  it('re-measure and reject need a note; readings of another survey are refused', async () => {
    const [r] = (await readings()).filter((x) => !x.decision);
    for (const verdict of ['remeasure', 'rejected']) {
      const res = await decide(who.reviewer!, { readingIds: [r!.id], verdict });
      expectError(res, 400, 'VALIDATION_FAILED');
      expect(res.body.error.details.issues[0].path).toBe('note');
      expectError(await decide(who.reviewer!, { readingIds: [r!.id], verdict, note: '   ' }), 400, 'VALIDATION_FAILED');
    }
    const [other] = await sql<{ id: string }>(t.databaseUrl, 'SELECT id FROM field_readings WHERE survey_id = $1 LIMIT 1', [ids.signedOffSurveyId]);
    const res = await decide(who.reviewer!, { readingIds: [r!.id, other!.id], verdict: 'accepted' });
    expectError(res, 404, 'NOT_FOUND');
    expect(res.body.error.details.readingIds).toEqual([other!.id]);
    // Nothing of the refused batch was written.
    expect(await sql(t.databaseUrl, 'SELECT 1 FROM decisions WHERE field_reading_id = $1', [r!.id])).toHaveLength(0);
  });

  it('deciding again writes a new revision of the one live decision, and the same verdict twice is left alone', async () => {
    const [r] = (await readings()).filter((x) => x.kind === 'field_reading' && !x.decision);
    await decide(who.reviewer!, { readingIds: [r!.id], verdict: 'rejected', note: 'Trolley nearby.' }).expect(200);
    const again = DecisionsResultSchema.parse((await decide(who.reviewer!, { readingIds: [r!.id], verdict: 'rejected', note: 'Trolley nearby.' }).expect(200)).body);
    expect(again).toMatchObject({ decided: 0, unchanged: 1 });
    const changed = DecisionsResultSchema.parse((await decide(who.reviewer!, { readingIds: [r!.id], verdict: 'accepted' }).expect(200)).body);
    expect(changed.decisions[0]).toMatchObject({ readingId: r!.id, verdict: 'accepted', revision: 2 });
    const rows = await sql<{ revision: number; verdict: string; note: string | null }>(t.databaseUrl, 'SELECT revision, verdict, note FROM decisions WHERE field_reading_id = $1', [r!.id]);
    expect(rows).toEqual([{ revision: 2, verdict: 'accepted', note: null }]);
    const audit = await sql<{ action: string }>(t.databaseUrl, 'SELECT action FROM audit_log WHERE entity = $1 AND entity_id = $2 ORDER BY id', ['decisions', changed.decisions[0]!.id]);
    expect(audit.map((a) => a.action)).toEqual(['create', 'update']);
    const log = await sql<{ revision: number }>(t.databaseUrl, `SELECT revision FROM change_log WHERE entity = 'decisions' AND entity_id = $1 ORDER BY seq`, [changed.decisions[0]!.id]);
    expect(log.map((l) => l.revision)).toEqual([1, 2]);
  });

  it('a re-measure request reaches the surveyor’s device through pull and the surveyor by e-mail', async () => {
    const { cursor } = await pullAll(who.surveyor!);
    const target = (await readings()).find((x) => x.kind === 'field_reading' && !x.decision && x.surveyorUserId === ids.users.surveyor)!;
    t.capture.clear();
    const note = 'Probe touched the door frame; repeat 30 cm into the room.';
    const res = DecisionsResultSchema.parse((await decide(who.reviewer!, { readingIds: [target.id], verdict: 'remeasure', note }).expect(200)).body);
    const pulled = (await pullAll(who.surveyor!, cursor)).changes.filter((c) => c.entity === 'decisions');
    expect(pulled).toHaveLength(1);
    expect(pulled[0]!.record).toMatchObject({ id: res.decisions[0]!.id, fieldReadingId: target.id, verdict: 'remeasure', note, reviewerUserId: ids.users.reviewer, deleted: false });
    const mail = await t.capture.waitFor((m) => m.to.includes(demoEmail('surveyor')) && /Re-measure requested/.test(m.subject));
    expect(mail.text).toContain(note);
    expect(mail.text).toContain(`/surveys/${ids.openSurveyId}`);
    expect(res.mailed).toEqual([demoEmail('surveyor')]);
  });

  it('bulk decisions cover readings and sweeps at once', async () => {
    const rows = (await readings()).filter((x) => !x.decision);
    const sweep = rows.find((x) => x.kind === 'sweep')!;
    const some = [sweep, ...rows.filter((x) => x.kind === 'field_reading').slice(0, 5)];
    const res = DecisionsResultSchema.parse((await decide(who.reviewer!, { readingIds: some.map((x) => x.id), verdict: 'accepted' }).expect(200)).body);
    expect(res.decided).toBe(some.length);
    const [row] = await sql<{ sweep_id: string; field_reading_id: string | null }>(t.databaseUrl, 'SELECT sweep_id, field_reading_id FROM decisions WHERE sweep_id = $1', [sweep.id]);
    expect(row).toEqual({ sweep_id: sweep.id, field_reading_id: null });
    const after = await readings();
    expect(after.filter((x) => some.some((s) => s.id === x.id)).every((x) => x.decision?.verdict === 'accepted')).toBe(true);
  });
});
