/**
 * The change sequence and the audit trail, against the real database: numbers are strictly increasing
 * per organisation under concurrency and commit in their order, audit rows hold what was written, and
 * a rolled-back write leaves no trace.
 */
import { randomUUID } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditedWrite, nextChangeSeq, recordAudit, recordChange, recordChanges, UnknownOrganisationError } from '../../server/db/audit';
import { createDb, type Db } from '../../server/db/client';
import { auditLog, changeLog, organisations, sites, users } from '../../server/db/schema';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

const PARALLEL_TRANSACTIONS = 20;

let testDb: TestDatabase;
let db: Db;
let close: () => Promise<void>;

beforeAll(async () => {
  testDb = await createTestDatabase();
  // One connection per concurrent transaction, so they really overlap inside PostgreSQL.
  const made = createDb(testDb.url, { max: PARALLEL_TRANSACTIONS + 2 });
  db = made.db;
  close = () => made.pool.end();
});

afterAll(async () => {
  await close?.();
  await testDb?.drop();
});

async function newOrganisation(name: string): Promise<string> {
  const [org] = await db.insert(organisations).values({ name }).returning({ id: organisations.id });
  return org!.id;
}

async function counterOf(organisationId: string): Promise<number> {
  const [row] = await db.select({ changeSeq: organisations.changeSeq }).from(organisations).where(eq(organisations.id, organisationId));
  return row!.changeSeq;
}

describe('nextChangeSeq', () => {
  it('hands 20 concurrent transactions the numbers 1…20, each once, and they commit in that order', async () => {
    const organisationId = await newOrganisation('Concurrency Org');
    const commitOrder: number[] = [];
    const seqs = await Promise.all(
      Array.from({ length: PARALLEL_TRANSACTIONS }, (_, i) =>
        db.transaction(async (tx) => {
          // Stagger the start and hold the transaction open a little, so they genuinely interleave.
          await tx.execute(sql`SELECT pg_sleep(${(i % 5) * 0.002})`);
          const seq = await nextChangeSeq(tx, organisationId);
          await tx.execute(sql`SELECT pg_sleep(0.005)`);
          return seq;
        }).then((seq) => {
          commitOrder.push(seq);
          return seq;
        }),
      ),
    );
    expect([...seqs].sort((a, b) => a - b)).toEqual(Array.from({ length: PARALLEL_TRANSACTIONS }, (_, i) => i + 1));
    expect(new Set(seqs).size).toBe(PARALLEL_TRANSACTIONS);
    // The row lock is held to commit, so a later number never becomes visible before an earlier one.
    expect(commitOrder).toEqual([...commitOrder].sort((a, b) => a - b));
    expect(await counterOf(organisationId)).toBe(PARALLEL_TRANSACTIONS);
  });

  it('makes a second writer wait until the first commits, so a pull never sees seq N before N−1', async () => {
    const organisationId = await newOrganisation('Lock Org');
    let releaseFirst!: () => void;
    const firstMayCommit = new Promise<void>((resolve) => (releaseFirst = resolve));
    let firstHasSeq!: () => void;
    const firstTookSeq = new Promise<void>((resolve) => (firstHasSeq = resolve));

    const first = db.transaction(async (tx) => {
      const seq = await nextChangeSeq(tx, organisationId);
      firstHasSeq();
      await firstMayCommit;
      return seq;
    });
    await firstTookSeq;
    // While the first is open, a second writer cannot get a number: it times out waiting for the lock.
    const blocked = db.transaction(async (tx) => {
      await tx.execute(sql`SET LOCAL lock_timeout = '150ms'`);
      return nextChangeSeq(tx, organisationId);
    });
    await expect(blocked).rejects.toSatisfy((error: { cause?: { code?: string } }) => error.cause?.code === '55P03');
    releaseFirst();
    expect(await first).toBe(1);
    expect(await db.transaction((tx) => nextChangeSeq(tx, organisationId))).toBe(2);
  });

  it('numbers each organisation separately', async () => {
    const a = await newOrganisation('Org A');
    const b = await newOrganisation('Org B');
    const seqs = await Promise.all(
      [a, b, a, b, a].map((organisationId) => db.transaction((tx) => nextChangeSeq(tx, organisationId))),
    );
    expect(seqs.filter((_, i) => [0, 2, 4].includes(i)).sort()).toEqual([1, 2, 3]);
    expect(seqs.filter((_, i) => [1, 3].includes(i)).sort()).toEqual([1, 2]);
  });

  it('refuses an organisation that does not exist, with a clear error', async () => {
    const missing = randomUUID();
    await expect(db.transaction((tx) => nextChangeSeq(tx, missing))).rejects.toThrow(UnknownOrganisationError);
    await expect(db.transaction((tx) => nextChangeSeq(tx, missing))).rejects.toThrow(`No organisation with id ${missing}.`);
  });
});

describe('recordChange and recordChanges', () => {
  it('log each change under its own sequence, in input order', async () => {
    const organisationId = await newOrganisation('Change Org');
    const ids = [randomUUID(), randomUUID(), randomUUID()];
    const single = await db.transaction((tx) =>
      recordChange(tx, { organisationId, entity: 'stations', entityId: ids[0]!, revision: 1, deleted: false }),
    );
    const bulk = await db.transaction((tx) =>
      recordChanges(tx, organisationId, [
        { entity: 'stations', entityId: ids[1]!, revision: 1, deleted: false },
        { entity: 'field_readings', entityId: ids[2]!, revision: 2, deleted: true },
      ]),
    );
    expect(single).toBe(1);
    expect(bulk).toEqual([2, 3]);
    const rows = await db
      .select({ seq: changeLog.seq, entity: changeLog.entity, entityId: changeLog.entityId, revision: changeLog.revision, deleted: changeLog.deleted })
      .from(changeLog)
      .where(eq(changeLog.organisationId, organisationId))
      .orderBy(changeLog.seq);
    expect(rows).toEqual([
      { seq: 1, entity: 'stations', entityId: ids[0], revision: 1, deleted: false },
      { seq: 2, entity: 'stations', entityId: ids[1], revision: 1, deleted: false },
      { seq: 3, entity: 'field_readings', entityId: ids[2], revision: 2, deleted: true },
    ]);
  });

  it('refuses a revision below 1 before touching the counter', async () => {
    const organisationId = await newOrganisation('Bad Revision Org');
    await expect(
      db.transaction((tx) => recordChange(tx, { organisationId, entity: 'sites', entityId: randomUUID(), revision: 0, deleted: false })),
    ).rejects.toThrow(RangeError);
    expect(await counterOf(organisationId)).toBe(0);
  });
});

describe('recordAudit and auditedWrite', () => {
  it('store who did what to which record, with the record before and after, and the request id', async () => {
    const organisationId = await newOrganisation('Audit Org');
    const [actor] = await db.insert(users).values({ email: `${randomUUID()}@audit.test`, name: 'Audit Actor', passwordHash: 'scrypt$x' }).returning();
    const siteId = randomUUID();
    const { changeSeq, row } = await db.transaction((tx) =>
      auditedWrite(
        tx,
        { organisationId, actorUserId: actor!.id, action: 'create', entity: 'sites', entityId: siteId, revision: 1, deleted: false, before: null, requestId: 'req-42' },
        async (seq) => (await tx.insert(sites).values({ id: siteId, organisationId, changeSeq: seq, name: 'Audited site' }).returning())[0]!,
      ),
    );
    expect(changeSeq).toBe(1);
    expect(row.changeSeq).toBe(1);

    const [audit] = await db.select().from(auditLog).where(eq(auditLog.organisationId, organisationId));
    expect(audit).toMatchObject({
      organisationId,
      actorUserId: actor!.id,
      action: 'create',
      entity: 'sites',
      entityId: siteId,
      before: null,
      requestId: 'req-42',
    });
    expect(audit!.after).toMatchObject({ id: siteId, name: 'Audited site', changeSeq: 1, revision: 1, deleted: false });
    expect(audit!.at).toBeInstanceOf(Date);

    const changes = await db.select().from(changeLog).where(eq(changeLog.organisationId, organisationId));
    expect(changes).toHaveLength(1);
    expect(changes[0]).toMatchObject({ seq: 1, entity: 'sites', entityId: siteId, revision: 1, deleted: false });
  });

  it('stores an audit row outside any organisation and without a request id', async () => {
    const entityId = randomUUID();
    const id = await recordAudit(db, { organisationId: null, actorUserId: null, action: 'user.password_change', entity: 'user', entityId, before: null, after: { via: 'test' } });
    const [row] = await db.select().from(auditLog).where(eq(auditLog.id, id));
    expect(row).toMatchObject({ organisationId: null, actorUserId: null, requestId: null, after: { via: 'test' } });
  });

  it('leaves neither a change, an audit row, the record nor a counter step behind when the transaction rolls back', async () => {
    const organisationId = await newOrganisation('Rollback Org');
    const siteId = randomUUID();
    await expect(
      db.transaction(async (tx) => {
        await auditedWrite(
          tx,
          { organisationId, actorUserId: null, action: 'create', entity: 'sites', entityId: siteId, revision: 1, deleted: false, before: null },
          async (seq) => (await tx.insert(sites).values({ id: siteId, organisationId, changeSeq: seq, name: 'Doomed' }).returning())[0]!,
        );
        throw new Error('the service failed after the write');
      }),
    ).rejects.toThrow('the service failed after the write');
    expect(await db.select().from(changeLog).where(eq(changeLog.organisationId, organisationId))).toEqual([]);
    expect(await db.select().from(auditLog).where(eq(auditLog.organisationId, organisationId))).toEqual([]);
    expect(await db.select().from(sites).where(eq(sites.id, siteId))).toEqual([]);
    expect(await counterOf(organisationId)).toBe(0);
  });

  it('rolls back the change and the audit row when the write itself is refused by the database', async () => {
    const organisationId = await newOrganisation('Refused Write Org');
    await expect(
      db.transaction((tx) =>
        auditedWrite(
          tx,
          { organisationId, actorUserId: null, action: 'create', entity: 'sites', entityId: randomUUID(), revision: 1, deleted: false, before: null },
          // An empty name breaks sites_name_ck.
          async (seq) => (await tx.insert(sites).values({ id: randomUUID(), organisationId, changeSeq: seq, name: '  ' }).returning())[0]!,
        ),
      ),
    ).rejects.toThrow();
    expect(await db.select().from(changeLog).where(eq(changeLog.organisationId, organisationId))).toEqual([]);
    expect(await db.select().from(auditLog).where(eq(auditLog.organisationId, organisationId))).toEqual([]);
    expect(await counterOf(organisationId)).toBe(0);
  });
});
