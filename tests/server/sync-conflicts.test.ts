/**
 * Conflicts (issue 5 §3): two devices editing one record keep both revisions; an edit against a deletion
 * keeps the edit; a reviewer lists and resolves, producing a new revision every device pulls.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ConflictListSchema, PullResponseSchema, PushResponseSchema, ResolveConflictResultSchema, type PushResult } from '../../shared/schemas/sync';
import type { FieldReading } from '../../shared/schemas/capture';
import type { Mutation } from '../../shared/sync/mutation';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, expectError, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { edited, makeReading, makeStation, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestApp, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let surveyor: SignedIn;
let reviewer: SignedIn;
let scope: Scope;

async function push(mutations: Mutation[], deviceId: string): Promise<PushResult[]> {
  const res = await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId, mutations });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return PushResponseSchema.parse(res.body).results;
}

async function pullAll(who: SignedIn, since = '0') {
  const changes: { seq: number; entity: string; record: Record<string, unknown> }[] = [];
  let cursor = since;
  for (;;) {
    const res = await who.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ since: cursor, limit: 5000 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const page = PullResponseSchema.parse(res.body);
    changes.push(...page.changes);
    cursor = page.nextCursor;
    if (!page.hasMore) return { changes, cursor };
  }
}

/** A station and a reading both devices have pulled (revision 1 on the server). */
async function sharedReading(): Promise<FieldReading> {
  const station = makeStation(scope);
  const reading = makeReading(scope, station.id, { magnitudeT: 1.0e-3 });
  await push([mutationFor('stations', station), mutationFor('field_readings', reading)], 'device-a');
  return reading;
}

const resolve = (conflictId: string, body: object, who = reviewer) =>
  who.agent.post(`/api/orgs/${ids.orgId}/sync/conflicts/${conflictId}/resolve`).set('Origin', TRUSTED_ORIGIN).send(body);

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo });
  ids = await readDemoIds(t.databaseUrl);
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  reviewer = await signIn(t.app, demoEmail('reviewer'));
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
});
afterAll(async () => {
  await t?.close();
});

describe('conflicts', () => {
  it('when two devices edit the same reading, both revisions are kept and resolving gives a new revision every device pulls', async () => {
    const base = await sharedReading();
    const { cursor } = await pullAll(surveyor);
    const fromA = edited(base, { magnitudeT: 1.1e-3, notes: 'device A: re-read' });
    const fromB = edited(base, { magnitudeT: 0.9e-3, notes: 'device B: re-read' });
    const [a] = await push([mutationFor('field_readings', fromA)], 'device-a');
    expect(a).toMatchObject({ status: 'applied', revision: 2 });
    const [pushedB] = await push([mutationFor('field_readings', fromB)], 'device-b');
    expect(pushedB!.status).toBe('conflict');
    if (pushedB?.status !== 'conflict') return;
    const b = pushedB;
    expect(b.server).toMatchObject({ id: base.id, revision: 2, magnitudeT: 1.1e-3, notes: 'device A: re-read' });

    // The server row is device A's; device B's version is kept beside it.
    const [row] = await sql<{ revision: number; magnitude_t: number }>(t.databaseUrl, 'SELECT revision, magnitude_t FROM field_readings WHERE id = $1', [base.id]);
    expect(row).toEqual({ revision: 2, magnitude_t: 1.1e-3 });
    const list = ConflictListSchema.parse((await reviewer.agent.get(`/api/orgs/${ids.orgId}/sync/conflicts`).query({ surveyId: ids.openSurveyId }).expect(200)).body);
    const conflict = list.conflicts.find((c) => c.id === b.conflictId)!;
    expect(conflict).toMatchObject({
      kind: 'edit_vs_edit',
      state: 'open',
      entity: 'field_readings',
      recordId: base.id,
      serverRevision: 2,
      incomingBaseRevision: 1,
      currentRevision: 2,
      deviceId: 'device-b',
      userId: ids.users.surveyor,
    });
    expect(conflict.serverVersion).toMatchObject({ magnitudeT: 1.1e-3, notes: 'device A: re-read' });
    expect(conflict.incomingVersion).toMatchObject({ magnitudeT: 0.9e-3, notes: 'device B: re-read' });

    // Devices see the record marked.
    const marked = (await pullAll(surveyor, cursor)).changes.filter((c) => c.record.id === base.id);
    expect(marked.at(-1)!.record).toMatchObject({ revision: 2, conflicted: true });

    // A surveyor may not resolve; a reviewer may, once.
    expectError(await resolve(b.conflictId, { choose: 'incoming' }, surveyor), 403, 'FORBIDDEN');
    const res = await resolve(b.conflictId, { choose: 'incoming', note: 'device B read after re-zeroing' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const outcome = ResolveConflictResultSchema.parse(res.body);
    expect(outcome).toMatchObject({ revision: 3, conflict: { state: 'resolved', resolution: 'incoming', resolvedRevision: 3, resolvedByUserId: ids.users.reviewer } });
    expectError(await resolve(b.conflictId, { choose: 'server' }), 409, 'CONFLICT_ALREADY_RESOLVED');

    const after = (await pullAll(surveyor, cursor)).changes.filter((c) => c.record.id === base.id);
    expect(after).toHaveLength(1);
    expect(after[0]).toMatchObject({ seq: outcome.changeSeq, record: { revision: 3, magnitudeT: 0.9e-3, notes: 'device B: re-read', conflicted: false } });
    const audit = await sql<{ action: string; actor_user_id: string }>(t.databaseUrl, `SELECT action, actor_user_id FROM audit_log WHERE entity_id = $1 ORDER BY id`, [base.id]);
    expect(audit.map((r) => r.action)).toEqual(['update', 'sync_conflict_edit_vs_edit', 'resolve_conflict']);
    expect(audit.at(-1)!.actor_user_id).toBe(ids.users.reviewer);
  });

  it('an edit against a deletion keeps the edit, marks it, and "server" then deletes it', async () => {
    const base = await sharedReading();
    const [del] = await push([mutationFor('field_readings', edited(base, { deleted: true }))], 'device-a');
    expect(del).toMatchObject({ status: 'applied', revision: 2 });
    const [edit] = await push([mutationFor('field_readings', edited(base, { notes: 'kept: taken twice' }))], 'device-b');
    expect(edit).toMatchObject({ status: 'applied', revision: 3 });
    const conflictId = edit!.status === 'applied' ? edit!.conflictId : undefined;
    expect(conflictId).toBeDefined();
    const [row] = await sql<{ revision: number; deleted: boolean; notes: string }>(t.databaseUrl, 'SELECT revision, deleted, notes FROM field_readings WHERE id = $1', [base.id]);
    expect(row).toEqual({ revision: 3, deleted: false, notes: 'kept: taken twice' });
    const [c] = await sql<{ kind: string; server_version: { deleted: boolean } }>(t.databaseUrl, 'SELECT kind, server_version FROM sync_conflicts WHERE id = $1', [conflictId]);
    expect(c).toMatchObject({ kind: 'edit_vs_delete', server_version: { deleted: true } });

    const res = await resolve(conflictId!, { choose: 'server' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const [final] = await sql<{ revision: number; deleted: boolean }>(t.databaseUrl, 'SELECT revision, deleted FROM field_readings WHERE id = $1', [base.id]);
    expect(final).toEqual({ revision: 4, deleted: true });
  });

  it('a deletion against an edit keeps the edit and opens a delete_vs_edit conflict', async () => {
    const base = await sharedReading();
    await push([mutationFor('field_readings', edited(base, { notes: 'edited on A' }))], 'device-a');
    const [del] = await push([mutationFor('field_readings', edited(base, { deleted: true }))], 'device-b');
    expect(del!.status).toBe('conflict');
    const [row] = await sql<{ deleted: boolean; notes: string }>(t.databaseUrl, 'SELECT deleted, notes FROM field_readings WHERE id = $1', [base.id]);
    expect(row).toEqual({ deleted: false, notes: 'edited on A' });
    const [c] = await sql<{ kind: string }>(t.databaseUrl, 'SELECT kind FROM sync_conflicts WHERE record_id = $1', [base.id]);
    expect(c!.kind).toBe('delete_vs_edit');
  });

  it('the same content sent from a stale base is not a conflict', async () => {
    const base = await sharedReading();
    const same = edited(base, { notes: 'identical on both' });
    await push([mutationFor('field_readings', same)], 'device-a');
    const [again] = await push([mutationFor('field_readings', same)], 'device-b');
    expect(again).toMatchObject({ status: 'applied', revision: 2 });
    const [n] = await sql<{ n: number }>(t.databaseUrl, 'SELECT count(*)::int AS n FROM sync_conflicts WHERE record_id = $1', [base.id]);
    expect(n!.n).toBe(0);
  });

  it('lists and resolves only within the organisation', async () => {
    const kestrel = await signIn(t.app, 'admin@kestrel.example');
    const [any] = await sql<{ id: string }>(t.databaseUrl, 'SELECT id FROM sync_conflicts LIMIT 1');
    const kestrelOrg = kestrel.session.memberships[0]!.organisationId;
    const listed = await kestrel.agent.get(`/api/orgs/${kestrelOrg}/sync/conflicts`).query({ state: 'all' }).expect(200);
    expect(listed.body.conflicts).toEqual([]);
    expectError(await kestrel.agent.post(`/api/orgs/${kestrelOrg}/sync/conflicts/${any!.id}/resolve`).set('Origin', TRUSTED_ORIGIN).send({ choose: 'server' }), 404, 'NOT_FOUND');
  });
});
