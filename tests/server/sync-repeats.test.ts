/**
 * Merging walks (issue 5 §4): repeat-reading groups, their spread, and one repeat_disagreement flag per
 * disagreeing group, recomputed idempotently after pushes.
 *
 * Expected values are worked here from the published definitions, not from the code under test:
 * Eₙ = |x − y| / √(Uₓ² + U_y²) (ISO 13528 / ISO/IEC 17043; recalled), with U = k·u and k = 2 (JCGM
 * 100:2008, the GUM, §6.3; recalled); the spread is the sample standard deviation, which for two values
 * is |x − y|/√2.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RepeatListSchema, type RepeatGroupView } from '../../shared/schemas/sync';
import type { Mutation } from '../../shared/sync/mutation';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { edited, makeReading, makeStation, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestApp, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let surveyor: SignedIn;
let scope: Scope;
let otherLevelId: string;

async function push(mutations: Mutation[]) {
  const res = await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId: 'repeat-test', mutations });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  expect(res.body.results.every((r: { status: string }) => r.status === 'applied'), JSON.stringify(res.body)).toBe(true);
}

async function repeats() {
  const res = await surveyor.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/repeats`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return RepeatListSchema.parse(res.body);
}

const groupWith = (groups: RepeatGroupView[], readingId: string) => groups.find((g) => g.readingIds.includes(readingId));

async function liveFlagsAbout(readingId: string) {
  return sql<{ id: string; fingerprint: string; change_seq: string; revision: number; details: { readingIds: string[]; maxEn: number } }>(
    t.databaseUrl,
    `SELECT id, fingerprint, change_seq, revision, details FROM flags WHERE kind = 'repeat_disagreement' AND NOT deleted AND survey_id = $1 AND details->'readingIds' ? $2`,
    [ids.openSurveyId, readingId],
  );
}

/** Expanded (k = 2) uncertainty and Eₙ, written out from the definitions above. */
const expanded = (fieldT: number, relativeStandard: number) => 2 * relativeStandard * fieldT;
const en = (a: number, b: number, ua: number, ub: number) => Math.abs(a - b) / Math.sqrt(ua * ua + ub * ub);

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo });
  ids = await readDemoIds(t.databaseUrl);
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
  const [other] = await sql<{ id: string }>(
    t.databaseUrl,
    `SELECT l.id FROM levels l JOIN surveys s ON s.site_id = l.site_id WHERE s.id = $1 AND l.id <> $2 ORDER BY l.ordinal LIMIT 1`,
    [ids.openSurveyId, ids.levelId],
  );
  otherLevelId = other!.id;
});
afterAll(async () => {
  await t?.close();
});

describe('repeat readings', () => {
  // Far from the demo's own stations (they are on a metre grid inside the rooms).
  const at = (xM: number, yM: number, levelId = ids.levelId) => makeStation({ ...scope, levelId }, { xM, yM });

  it('groups readings at stations within the radius on one level and gives their spread and Eₙ', async () => {
    const u = ids.gaussmeterRelativeUncertainty;
    const a = at(-50, -50);
    const b = at(-49.8, -50); // 0.2 m away: within the 0.3 m default
    const farther = at(-49.4, -50); // 0.4 m from b: not a repeat
    const upstairs = at(-50, -50, otherLevelId); // same x, y on another level: not a repeat
    const ra = makeReading(scope, a.id, { magnitudeT: 1.0e-3, instrumentId: ids.gaussmeterId });
    const rb = makeReading(scope, b.id, { magnitudeT: 1.1e-3, instrumentId: ids.gaussmeterId });
    const rf = makeReading(scope, farther.id, { magnitudeT: 1.0e-3, instrumentId: ids.gaussmeterId });
    const ru = makeReading(scope, upstairs.id, { magnitudeT: 1.0e-3, instrumentId: ids.gaussmeterId });
    await push([a, b, farther, upstairs].map((s) => mutationFor('stations', s)).concat([ra, rb, rf, ru].map((r) => mutationFor('field_readings', r))));

    const list = await repeats();
    expect(list).toMatchObject({ radiusM: 0.3, coverageFactor: 2, defaultRelativeStandardUncertainty: 0.02 });
    const g = groupWith(list.groups, ra.id)!;
    expect(g.readingIds.sort()).toEqual([ra.id, rb.id].sort());
    expect(g.count).toBe(2);
    expect(g.meanT).toBeCloseTo(1.05e-3, 15);
    expect(g.spreadT).toBeCloseTo(0.1e-3 / Math.SQRT2, 15);
    expect(g.maxEn).toBeCloseTo(en(1.0e-3, 1.1e-3, expanded(1.0e-3, u), expanded(1.1e-3, u)), 9);
    expect(g.disagree).toBe(true);
    expect(groupWith(list.groups, rf.id)).toBeUndefined();
    expect(groupWith(list.groups, ru.id)).toBeUndefined();
  });

  it('uses 2 % relative standard uncertainty (common practice) when the instrument is unknown', async () => {
    const a = at(-60, -60);
    const b = at(-60, -60.1);
    // 2.0 vs 2.1 mT: Eₙ = 0.1/√(0.08² + 0.084²) ≈ 0.86 with the default — agreement — but with the
    // demo fluxgate's 0.5 % it would be ≈ 3.4.
    const ra = makeReading(scope, a.id, { magnitudeT: 2.0e-3 });
    const rb = makeReading(scope, b.id, { magnitudeT: 2.1e-3 });
    await push([mutationFor('stations', a), mutationFor('stations', b), mutationFor('field_readings', ra), mutationFor('field_readings', rb)]);
    const g = groupWith((await repeats()).groups, ra.id)!;
    expect(g.maxEn).toBeCloseTo(en(2.0e-3, 2.1e-3, expanded(2.0e-3, 0.02), expanded(2.1e-3, 0.02)), 9);
    expect(g.maxEn!).toBeLessThan(1);
    expect(g.disagree).toBe(false);
    expect(await liveFlagsAbout(ra.id)).toHaveLength(0);
  });

  it('raises one flag for a disagreeing group, idempotently, and withdraws it when the group changes', async () => {
    const a = at(-70, -70);
    const b = at(-70.1, -70);
    const ra = makeReading(scope, a.id, { magnitudeT: 3.0e-3, instrumentId: ids.gaussmeterId });
    const rb = makeReading(scope, b.id, { magnitudeT: 3.5e-3, instrumentId: ids.gaussmeterId });
    const batch = [mutationFor('stations', a), mutationFor('stations', b), mutationFor('field_readings', ra), mutationFor('field_readings', rb)];
    await push(batch);

    // Raised after the commit without anyone asking (the debounced recomputation).
    let flags = await liveFlagsAbout(ra.id);
    for (let waited = 0; flags.length === 0 && waited < 5_000; waited += 100) {
      await new Promise((resolve) => setTimeout(resolve, 100));
      flags = await liveFlagsAbout(ra.id);
    }
    expect(flags).toHaveLength(1);
    const first = flags[0]!;
    expect(first.details.readingIds.sort()).toEqual([ra.id, rb.id].sort());

    // Recomputing again, and pushing the same batch again, change nothing.
    await repeats();
    await push(batch);
    const list = await repeats();
    const again = await liveFlagsAbout(ra.id);
    expect(again).toEqual([first]);
    expect(groupWith(list.groups, ra.id)!.flagId).toBe(first.id);

    // A third repeat joins: the group is another group, with its own flag; the old one is withdrawn.
    const c = at(-70.2, -70);
    const rc = makeReading(scope, c.id, { magnitudeT: 3.2e-3, instrumentId: ids.gaussmeterId });
    await push([mutationFor('stations', c), mutationFor('field_readings', rc)]);
    await repeats();
    const now = await liveFlagsAbout(ra.id);
    expect(now).toHaveLength(1);
    expect(now[0]!.id).not.toBe(first.id);
    expect(now[0]!.details.readingIds).toHaveLength(3);
    const [old] = await sql<{ deleted: boolean }>(t.databaseUrl, 'SELECT deleted FROM flags WHERE id = $1', [first.id]);
    expect(old!.deleted).toBe(true);

    // The outlier deleted, the rest agree (3.0 and 3.2 mT: Eₙ ≈ 2.3 with 0.5 % — still disagree with the
    // fluxgate; so delete both others and the group is gone).
    await push([mutationFor('field_readings', edited(rb, { deleted: true })), mutationFor('field_readings', edited(rc, { deleted: true }))]);
    expect(groupWith((await repeats()).groups, ra.id)).toBeUndefined();
    expect(await liveFlagsAbout(ra.id)).toHaveLength(0);
  });
});
