/**
 * `arrayLiteral` (sync.repository.ts) writes the column arrays a push sends to PostgreSQL. Checked
 * against PostgreSQL's own array input (the reference for its syntax: PostgreSQL 15 manual, §8.15.6
 * "Array Input and Output Syntax"): each literal, cast to its type, must read back as exactly the
 * values written, whatever quotes, backslashes, commas, braces, spaces or NULL-looking text they hold.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { arrayLiteral } from '../../server/features/sync/sync.repository';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

let testDb: TestDatabase;
let client: pg.Client;

beforeAll(async () => {
  testDb = await createTestDatabase();
  client = new pg.Client({ connectionString: testDb.url });
  await client.connect();
});

afterAll(async () => {
  await client?.end();
  await testDb?.drop();
});

/** The literal as PostgreSQL reads it, each element back as text (NULL as null). */
async function readBack(values: unknown[], type: string): Promise<(string | null)[]> {
  const { rows } = await client.query<{ v: string | null }>(`SELECT v::text AS v FROM unnest($1::${type}[]) WITH ORDINALITY AS u(v, n) ORDER BY n`, [arrayLiteral(values)]);
  return rows.map((r) => r.v);
}

describe('arrayLiteral', () => {
  it('keeps every text as it was, one element each', async () => {
    const texts = ['plain', '', ' ', 'NULL', 'null', 'a,b', '{x}', 'say "hi"', 'back\\slash', '\\"', 'tab\there', 'line\nbreak', 'µT · ±', '}{,"\\'];
    expect(await readBack(texts, 'text')).toEqual(texts);
  });

  it('writes null and undefined as NULL', async () => {
    expect(await readBack(['a', null, undefined, 'b'], 'text')).toEqual(['a', null, null, 'b']);
  });

  it('keeps doubles exactly (shortest round-trip form, exponents included)', async () => {
    const numbers = [0, -0, 1, -1.5, 0.1, 1e-7, 2.5e-5, 3.0000000000000004, 1.7976931348623157e308, 5e-324, 123456789.123];
    const back = await readBack(numbers, 'double precision');
    expect(back.map((v) => Number(v))).toEqual(numbers);
  });

  it('writes booleans, integers, bigints and uuids', async () => {
    expect(await readBack([true, false, null], 'boolean')).toEqual(['true', 'false', null]);
    expect(await readBack([1, 2147483647, -3], 'integer')).toEqual(['1', '2147483647', '-3']);
    expect(await readBack([9007199254740991, 12n], 'bigint')).toEqual(['9007199254740991', '12']);
    const id = '0193a1b2-c3d4-7e5f-8a9b-0c1d2e3f4a5b';
    expect(await readBack([id, null], 'uuid')).toEqual([id, null]);
  });

  it('writes dates as ISO instants and objects as JSON', async () => {
    const [at] = await readBack([new Date('2026-11-18T09:00:00.123Z')], 'timestamptz');
    expect(new Date(at!).toISOString()).toBe('2026-11-18T09:00:00.123Z');
    const peaks = [{ frequencyHz: 2.8e10, levelDbm: -61.5, note: 'a "quoted", {braced} \\ value' }];
    const [json] = await readBack([JSON.stringify(peaks)], 'jsonb');
    expect(JSON.parse(json!)).toEqual(peaks);
    const [object] = await readBack([{ a: 'x,"y"' }], 'jsonb');
    expect(JSON.parse(object!)).toEqual({ a: 'x,"y"' });
  });

  it('writes an empty array', async () => {
    expect(arrayLiteral([])).toBe('{}');
    expect(await readBack([], 'text')).toEqual([]);
  });
});
