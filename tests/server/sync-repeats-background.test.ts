/**
 * Repeat-group recomputation in the background (issue 5 §4): it runs in slices that yield the event loop,
 * a push is answered while a recomputation of its survey is under way (and re-queues the survey instead
 * of waiting for it), and recomputing is idempotent.
 *
 * Expected groups are worked from the definition of single linkage (readings within the radius of one
 * another, chained), with distances written out; Eₙ = |x − y| / √(Uₓ² + U_y²) (ISO 13528 / ISO/IEC
 * 17043; recalled) with U = k·u, k = 2 (JCGM 100:2008, the GUM, §6.3; recalled).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { groupRepeatReadings, type RepeatReading } from '../../shared/physics/repeats';
import { mulberry32 } from '../../shared/random/mulberry32';
import type { Mutation } from '../../shared/sync/mutation';
import { seedDemo } from '../../server/db/seed/demo';
import { createRepeatsService, independentParts } from '../../server/features/sync/repeats.service';
import { createSyncRepository } from '../../server/features/sync/sync.repository';
import { demoEmail, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { makeReading, makeStation, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestApp, testLogger, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

describe('independent parts of a level', () => {
  const reading = (id: string, xM: number, yM: number, zM = 1): RepeatReading => ({ id, xM, yM, zM, fieldTesla: 1e-3, relativeExpandedUncertainty: 0.04 });
  const key = (ids: readonly string[]) => [...ids].sort().join(',');

  it('keeps readings within the radius in one part, across a cell boundary and along a chain', async () => {
    // Radius 0.3 m, cells of 0.6 m: x = 0.59 and x = 0.88 are in cells 0 and 1 but 0.29 m apart
    // (≤ 0.3 m, a repeat); c is 0.25 m from b and 0.54 m from a (a chain a–b–c); d is 0.5 m from c.
    const rs = [reading('a', 0.59, 5), reading('b', 0.88, 5), reading('c', 1.13, 5), reading('d', 5, 5)];
    const parts = await independentParts(rs, 0.3);
    const withA = parts.find((p) => p.some((r) => r.id === 'a'))!;
    expect(key(withA.map((r) => r.id))).toContain('a,b,c');
    const groups = parts.flatMap((p) => groupRepeatReadings(p, { radiusM: 0.3 }));
    expect(groups.map((g) => key(g.readingIds))).toEqual(['a,b,c']);
  });

  it('finds exactly the groups of the whole level, part by part, pausing as it goes', async () => {
    // Invented readings: 3,000 points scattered over 30 m × 30 m at two heights, so that some lie within
    // 0.3 m of others and chains form; the reference is the physics module run over the whole set.
    const rand = mulberry32(20261201);
    const rs = Array.from({ length: 3_000 }, (_, i) => ({
      id: `r${i}`,
      xM: rand() * 30,
      yM: rand() * 30,
      zM: rand() < 0.5 ? 1 : 1.2,
      fieldTesla: 1e-3 * (1 + (rand() - 0.5) * 0.1),
      relativeExpandedUncertainty: 0.04,
    }));
    let pauses = 0;
    const parts = await independentParts(rs, 0.3, async () => {
      pauses += 1;
    });
    expect(parts.reduce((n, p) => n + p.length, 0)).toBe(rs.length);
    expect(pauses).toBeGreaterThan(0);
    const whole = groupRepeatReadings(rs, { radiusM: 0.3 });
    const byParts = parts.flatMap((p) => groupRepeatReadings(p, { radiusM: 0.3 }));
    expect(whole.length).toBeGreaterThan(50);
    const summary = (gs: typeof whole) => new Map(gs.map((g) => [key(g.readingIds), [g.count, g.meanTesla, g.spreadTesla, g.maxEn]]));
    expect(summary(byParts)).toEqual(summary(whole));
  });
});

describe('recomputation beside pushes', () => {
  let t: InProcessApp;
  let ids: DemoIds;
  let surveyor: SignedIn;
  let scope: Scope;

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo });
    ids = await readDemoIds(t.databaseUrl);
    surveyor = await signIn(t.app, demoEmail('surveyor'));
    scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
  });
  afterAll(async () => {
    await t?.close();
  });

  async function push(mutations: Mutation[]) {
    const res = await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId: 'background-test', mutations });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.results.every((r: { status: string }) => r.status === 'applied'), JSON.stringify(res.body)).toBe(true);
  }
  const queued = async () => (await sql<{ n: number }>(t.databaseUrl, 'SELECT count(*)::int AS n FROM repeat_recompute_queue WHERE survey_id = $1', [ids.openSurveyId]))[0]!.n;
  const orgSeq = async () => (await sql<{ s: string }>(t.databaseUrl, 'SELECT change_seq::text AS s FROM organisations WHERE id = $1', [ids.orgId]))[0]!.s;
  const flagsAbout = (readingId: string) =>
    sql<{ id: string; revision: number; change_seq: string; deleted: boolean }>(
      t.databaseUrl,
      `SELECT id, revision, change_seq::text, deleted FROM flags WHERE kind = 'repeat_disagreement' AND survey_id = $1 AND details->'readingIds' ? $2 ORDER BY id`,
      [ids.openSurveyId, readingId],
    );

  it('answers a push while its survey is being recomputed, keeps the survey queued for it, and recomputes idempotently', async () => {
    const u = ids.gaussmeterRelativeUncertainty;
    // Far from the demo's stations: a pair 0.2 m apart (a repeat at 0.3 m), and five lone stations 5 m
    // apart so the recomputation has several parts to pause between.
    const a = makeStation(scope, { xM: -120, yM: -120 });
    const b = makeStation(scope, { xM: -119.8, yM: -120 });
    const lone = Array.from({ length: 5 }, (_, i) => makeStation(scope, { xM: -150 - 5 * i, yM: -150 }));
    const ra = makeReading(scope, a.id, { magnitudeT: 3.0e-3, instrumentId: ids.gaussmeterId });
    const loneReadings = lone.map((s) => makeReading(scope, s.id, { magnitudeT: 1e-3, instrumentId: ids.gaussmeterId }));
    await push([a, b, ...lone].map((s) => mutationFor('stations', s)).concat([ra, ...loneReadings].map((r) => mutationFor('field_readings', r))));
    expect(await queued()).toBe(1);

    // A recomputation held at its first pause: its transaction is open, its inputs read.
    let reached!: () => void;
    const atPause = new Promise<void>((resolve) => (reached = resolve));
    let release!: () => void;
    const released = new Promise<void>((resolve) => (release = resolve));
    let pauses = 0;
    const held = createRepeatsService({
      repo: createSyncRepository(t.db),
      logger: testLogger(),
      sliceMs: 0,
      pause: async () => {
        pauses += 1;
        if (pauses === 1) {
          reached();
          await released;
        }
      },
    });
    let settled = false;
    const running = held.list(ids.orgId, ids.openSurveyId).finally(() => (settled = true));
    await atPause;

    // The second repeat arrives meanwhile: answered while the recomputation waits, and re-queues the survey.
    const rb = makeReading(scope, b.id, { magnitudeT: 3.5e-3, instrumentId: ids.gaussmeterId });
    await push([mutationFor('field_readings', rb)]);
    expect(settled).toBe(false);
    expect(await queued()).toBe(1);

    release();
    const before = await running;
    expect(pauses).toBeGreaterThan(1);
    // Computed from what was there when it started: ra alone, no group yet.
    expect(before!.groups.some((g) => g.readingIds.includes(ra.id))).toBe(false);

    // The survey stayed queued for the push that came meanwhile, so the debounced recomputation after
    // that push (which runs only for a queued survey) groups both: 3.0 vs 3.5 mT disagree with the
    // gaussmeter's uncertainty, so one flag is raised without anyone asking. Then the queue is empty.
    const en = Math.abs(3.0e-3 - 3.5e-3) / Math.hypot(2 * u * 3.0e-3, 2 * u * 3.5e-3);
    expect(en).toBeGreaterThan(1);
    let flags = (await flagsAbout(ra.id)).filter((f) => !f.deleted);
    for (let waited = 0; flags.length === 0 && waited < 10_000; waited += 100) {
      await new Promise((resolve) => setTimeout(resolve, 100));
      flags = (await flagsAbout(ra.id)).filter((f) => !f.deleted);
    }
    expect(flags).toHaveLength(1);
    expect(await queued()).toBe(0);
    const after = await held.list(ids.orgId, ids.openSurveyId);
    const g = after.groups.find((x) => x.readingIds.includes(ra.id))!;
    expect([...g.readingIds].sort()).toEqual([ra.id, rb.id].sort());
    expect(g.maxEn).toBeCloseTo(en, 9);
    expect(g.disagree).toBe(true);
    expect(g.flagId).toBe(flags[0]!.id);

    // Idempotent: recomputing again writes nothing (no flag changes, no change sequence taken).
    const seq = await orgSeq();
    const again = await held.list(ids.orgId, ids.openSurveyId);
    expect(again.groups).toEqual(after.groups);
    expect((await flagsAbout(ra.id)).filter((f) => !f.deleted)).toEqual(flags);
    expect(await orgSeq()).toBe(seq);
    await held.close();
  });
});
