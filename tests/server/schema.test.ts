/**
 * The migrated schema, read back from PostgreSQL itself (information_schema and pg_catalog): the tables
 * exist, every synced table carries the sync columns and its pull index, and the check and foreign-key
 * constraints refuse the rows that would break a fact.
 */
import { randomUUID } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb, type Db } from '../../server/db/client';
import {
  decisions,
  fieldReadings,
  levels,
  organisations,
  sites,
  stations,
  surveys,
  sweeps,
  SYNCED_ENTITIES,
  users,
  watchBands,
} from '../../server/db/schema';
import { BUILT_IN_SPECIES_IDS } from '../../shared/physics/species';
import { FIELD_UNITS, SPECIES } from '../../shared/schemas/vocabulary';
import { unitsFor } from '../../shared/units/units';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

let testDb: TestDatabase;
let db: Db;
let close: () => Promise<void>;

beforeAll(async () => {
  testDb = await createTestDatabase();
  const made = createDb(testDb.url, { max: 4 });
  db = made.db;
  close = () => made.pool.end();
});

afterAll(async () => {
  await close?.();
  await testDb?.drop();
});

/** The constraint PostgreSQL names when it refuses a write (Drizzle wraps the pg error in `cause`). */
async function refusal(write: Promise<unknown>): Promise<{ code: string; constraint: string | undefined }> {
  try {
    await write;
  } catch (error) {
    const pgError = ((error as { cause?: unknown }).cause ?? error) as { code?: string; constraint?: string };
    return { code: String(pgError.code), constraint: pgError.constraint };
  }
  throw new Error('The write was accepted, but it should have been refused.');
}

let seq = 0;
const nextSeq = () => ++seq;

/** A minimal valid chain org → site → level → survey → station, for constraint tests to hang rows on. */
async function makeChain(name: string) {
  const [org] = await db.insert(organisations).values({ name }).returning();
  const [user] = await db
    .insert(users)
    .values({ email: `${randomUUID()}@schema.test`, name: 'Schema Test', passwordHash: 'scrypt$x' })
    .returning();
  const organisationId = org!.id;
  const siteId = randomUUID();
  const levelId = randomUUID();
  const surveyId = randomUUID();
  const stationId = randomUUID();
  await db.insert(sites).values({ id: siteId, organisationId, changeSeq: nextSeq(), name: 'Test site' });
  await db.insert(levels).values({ id: levelId, organisationId, changeSeq: nextSeq(), siteId, name: 'Ground' });
  await db.insert(surveys).values({ id: surveyId, organisationId, changeSeq: nextSeq(), siteId, name: 'Test survey' });
  await db.insert(stations).values({ id: stationId, organisationId, changeSeq: nextSeq(), surveyId, levelId, xM: 1, yM: 2 });
  return { organisationId, userId: user!.id, siteId, levelId, surveyId, stationId };
}

type Chain = Awaited<ReturnType<typeof makeChain>>;

const reading = (c: Chain, values: Partial<typeof fieldReadings.$inferInsert>) => ({
  id: randomUUID(),
  organisationId: c.organisationId,
  changeSeq: nextSeq(),
  surveyId: c.surveyId,
  stationId: c.stationId,
  surveyorUserId: c.userId,
  unit: 'mT' as const,
  probeOrientation: 'three_axis' as const,
  heightM: 1,
  measuredAt: new Date('2026-11-02T10:00:00Z'),
  ...values,
});

describe('the migrated schema', () => {
  it('has every table of the data model', async () => {
    const rows = await db.execute<{ table_name: string }>(
      sql`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE'`,
    );
    const tables = rows.rows.map((r) => r.table_name);
    const expected = ['organisations', 'users', 'memberships', 'session', 'audit_log', 'change_log', ...SYNCED_ENTITIES];
    expect(tables).toEqual(expect.arrayContaining(expected));
    expect(SYNCED_ENTITIES).toEqual(
      expect.arrayContaining(['sites', 'levels', 'plans', 'rooms', 'sources', 'emitters', 'instruments', 'surveys', 'survey_assignments', 'walks', 'stations', 'field_readings', 'sweeps', 'decisions', 'watch_bands', 'zone_sets', 'flags']),
    );
  });

  it('lists every table with a change_seq column as synced, so pull cannot miss one', async () => {
    const rows = await db.execute<{ table_name: string }>(
      sql`SELECT table_name FROM information_schema.columns WHERE table_schema = 'public' AND column_name = 'change_seq' AND table_name <> 'organisations'`,
    );
    expect(rows.rows.map((r) => r.table_name).sort()).toEqual([...SYNCED_ENTITIES].sort());
  });

  it.each(SYNCED_ENTITIES)('gives %s the sync columns, its organisation and a unique pull index', async (table) => {
    const columns = await db.execute<{ column_name: string; data_type: string; is_nullable: string; column_default: string | null }>(
      sql`SELECT column_name, data_type, is_nullable, column_default FROM information_schema.columns WHERE table_schema = 'public' AND table_name = ${table}`,
    );
    const byName = new Map(columns.rows.map((c) => [c.column_name, c]));
    const expectColumn = (name: string, type: string) => {
      const column = byName.get(name);
      expect(column, `${table}.${name}`).toBeDefined();
      expect(column!.data_type, `${table}.${name}`).toBe(type);
      expect(column!.is_nullable, `${table}.${name}`).toBe('NO');
    };
    expectColumn('organisation_id', 'uuid');
    expectColumn('id', 'uuid');
    expectColumn('revision', 'integer');
    expectColumn('deleted', 'boolean');
    expectColumn('change_seq', 'bigint');
    expectColumn('created_at', 'timestamp with time zone');
    expectColumn('updated_at', 'timestamp with time zone');
    // The id is made on the device: the database must not invent one.
    expect(byName.get('id')!.column_default).toBeNull();

    const pk = await db.execute<{ column_name: string }>(sql`
      SELECT a.attname AS column_name FROM pg_index i
      JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = ANY(i.indkey)
      WHERE i.indrelid = ${table}::regclass AND i.indisprimary`);
    expect(pk.rows.map((r) => r.column_name)).toEqual(['id']);

    const pullIndex = await db.execute<{ indexdef: string }>(
      sql`SELECT indexdef FROM pg_indexes WHERE schemaname = 'public' AND tablename = ${table} AND indexdef LIKE '%UNIQUE%(organisation_id, change_seq)%'`,
    );
    expect(pullIndex.rows).toHaveLength(1);

    const orgFk = await db.execute<{ confrelid: string }>(sql`
      SELECT c.confrelid::regclass::text AS confrelid FROM pg_constraint c
      WHERE c.conrelid = ${table}::regclass AND c.contype = 'f'
        AND c.conkey = ARRAY[(SELECT attnum FROM pg_attribute WHERE attrelid = ${table}::regclass AND attname = 'organisation_id')]::int2[]`);
    expect(orgFk.rows.map((r) => r.confrelid)).toEqual(['organisations']);
  });
});

describe('constraints that guard facts', () => {
  let chain: Chain;
  let otherOrg: Chain;

  beforeAll(async () => {
    chain = await makeChain('Constraint Test Org');
    otherOrg = await makeChain('Other Test Org');
  });

  it('accepts a reading given as a magnitude, and one given as three components with |B| derived', async () => {
    const single = reading(chain, { magnitudeT: 0.0005 });
    // 3-4-12-13 is a Pythagorean quadruple: |(3, 4, 12)| = 13 exactly.
    const vector = reading(chain, { bxT: 0.003, byT: -0.004, bzT: 0.012 });
    await db.insert(fieldReadings).values([single, vector]);
    const rows = await db.execute<{ id: string; field_t: number }>(
      sql`SELECT id, field_t FROM field_readings WHERE id IN (${single.id}, ${vector.id})`,
    );
    const fieldById = new Map(rows.rows.map((r) => [r.id, Number(r.field_t)]));
    expect(fieldById.get(single.id)).toBe(0.0005);
    expect(fieldById.get(vector.id)).toBeCloseTo(0.013, 15);
  });

  it('refuses a negative magnitude', async () => {
    expect(await refusal(db.insert(fieldReadings).values(reading(chain, { magnitudeT: -0.001 })))).toEqual({
      code: '23514',
      constraint: 'field_readings_magnitude_ck',
    });
  });

  it('refuses a magnitude that is not a finite number', async () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY]) {
      const result = await refusal(db.insert(fieldReadings).values(reading(chain, { magnitudeT: bad })));
      expect(result.constraint).toBe('field_readings_magnitude_ck');
    }
  });

  it('refuses a reading with neither a magnitude nor components, with only some components, or with both', async () => {
    for (const values of [{}, { bxT: 0.001, byT: 0.002 }, { magnitudeT: 0.001, bxT: 0.001, byT: 0, bzT: 0 }]) {
      const result = await refusal(db.insert(fieldReadings).values(reading(chain, values)));
      expect(result, JSON.stringify(values)).toEqual({ code: '23514', constraint: 'field_readings_value_ck' });
    }
  });

  it('refuses a watch band whose lower edge is not below its upper edge', async () => {
    const band = (lowerHz: number, upperHz: number) => ({
      id: randomUUID(),
      organisationId: chain.organisationId,
      changeSeq: nextSeq(),
      name: 'test band',
      lowerHz,
      upperHz,
      reason: 'test',
      source: 'test',
    });
    await db.insert(watchBands).values(band(1.4e9, 1.427e9));
    for (const [lower, upper] of [
      [1.427e9, 1.4e9],
      [1.4e9, 1.4e9],
      [-1, 10],
    ] as const) {
      expect((await refusal(db.insert(watchBands).values(band(lower, upper)))).constraint).toBe('watch_bands_edges_ck');
    }
  });

  it('refuses a revision below 1', async () => {
    const result = await refusal(db.insert(fieldReadings).values(reading(chain, { magnitudeT: 0.001, revision: 0 })));
    expect(result.constraint).toBe('field_readings_revision_ck');
  });

  it('refuses two rows of one organisation and table with the same change_seq', async () => {
    const seqValue = nextSeq();
    await db.insert(fieldReadings).values(reading(chain, { magnitudeT: 0.001, changeSeq: seqValue }));
    const result = await refusal(db.insert(fieldReadings).values(reading(chain, { magnitudeT: 0.002, changeSeq: seqValue })));
    expect(result).toEqual({ code: '23505', constraint: 'field_readings_org_seq_uq' });
  });

  it("refuses a station that points at another organisation's survey", async () => {
    const result = await refusal(
      db.insert(stations).values({
        id: randomUUID(),
        organisationId: chain.organisationId,
        changeSeq: nextSeq(),
        surveyId: otherOrg.surveyId,
        levelId: chain.levelId,
        xM: 0,
        yM: 0,
      }),
    );
    expect(result).toEqual({ code: '23503', constraint: 'stations_survey_fk' });
  });

  it('refuses a sweep whose start is not below its stop, or whose RBW is not positive', async () => {
    const sweep = (startHz: number, stopHz: number, rbwHz: number) => ({
      id: randomUUID(),
      organisationId: chain.organisationId,
      changeSeq: nextSeq(),
      surveyId: chain.surveyId,
      stationId: chain.stationId,
      surveyorUserId: chain.userId,
      measuredAt: new Date('2026-11-02T10:00:00Z'),
      startHz,
      stopHz,
      rbwHz,
      referenceLevelDbm: -20,
      detector: 'peak' as const,
    });
    await db.insert(sweeps).values(sweep(2.3e9, 2.6e9, 1e5));
    expect((await refusal(db.insert(sweeps).values(sweep(2.6e9, 2.3e9, 1e5)))).constraint).toBe('sweeps_span_ck');
    expect((await refusal(db.insert(sweeps).values(sweep(2.3e9, 2.6e9, 0)))).constraint).toBe('sweeps_rbw_ck');
  });

  it('refuses a rejection or a re-measure request without a note, and a decision on nothing', async () => {
    const [target] = await db.insert(fieldReadings).values(reading(chain, { magnitudeT: 0.001 })).returning({ id: fieldReadings.id });
    const decision = (values: Partial<typeof decisions.$inferInsert>) => ({
      id: randomUUID(),
      organisationId: chain.organisationId,
      changeSeq: nextSeq(),
      surveyId: chain.surveyId,
      fieldReadingId: target!.id,
      verdict: 'accepted' as const,
      reviewerUserId: chain.userId,
      ...values,
    });
    await db.insert(decisions).values(decision({}));
    await db.insert(decisions).values(decision({ verdict: 'rejected', note: 'probe touched the bore cover' }));
    expect((await refusal(db.insert(decisions).values(decision({ verdict: 'rejected' })))).constraint).toBe('decisions_note_ck');
    expect((await refusal(db.insert(decisions).values(decision({ verdict: 'remeasure', note: '  ' })))).constraint).toBe('decisions_note_ck');
    expect((await refusal(db.insert(decisions).values(decision({ fieldReadingId: null })))).constraint).toBe('decisions_target_ck');
  });

  it('refuses a signed-off survey that does not say who signed it off', async () => {
    const result = await refusal(
      db.insert(surveys).values({
        id: randomUUID(),
        organisationId: chain.organisationId,
        changeSeq: nextSeq(),
        siteId: chain.siteId,
        name: 'unsigned',
        state: 'signed_off',
        submittedAt: new Date(),
        submittedByUserId: chain.userId,
      }),
    );
    expect(result.constraint).toBe('surveys_state_ck');
  });
});

describe('the enums and the shared modules', () => {
  it('store exactly the species the physics module can compute lines for', () => {
    expect([...SPECIES].sort()).toEqual([...BUILT_IN_SPECIES_IDS].sort());
  });

  it('store only field units that shared/units can parse', () => {
    const parseable = unitsFor('fluxDensity');
    for (const unit of FIELD_UNITS) expect(parseable, unit).toContain(unit);
  });

  it('are the enums PostgreSQL holds', async () => {
    const rows = await db.execute<{ label: string }>(
      sql`SELECT e.enumlabel AS label FROM pg_enum e JOIN pg_type t ON t.oid = e.enumtypid WHERE t.typname = 'field_unit' ORDER BY e.enumsortorder`,
    );
    expect(rows.rows.map((r) => r.label)).toEqual([...FIELD_UNITS]);
  });
});
