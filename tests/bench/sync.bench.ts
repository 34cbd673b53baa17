/**
 * Sync benchmark (`npm run bench:sync`; issue 5, Benchmark). A throwaway PostgreSQL cluster (like the
 * tests' global setup), migrated and seeded with the demo; the real app in a child process
 * (tests/setup/sync-server-child.ts) on a loopback port; a "device" in this process speaking the real
 * protocol over HTTP (sign-in, push batches, pull pages of 5,000).
 *
 * Figures:
 *  1. push 10,000 field readings as the surveyor, the way a device pushes (shared/sync/push-plan.ts:
 *     batches of PUSH_BATCH_SIZE, up to PUSH_IN_FLIGHT of them on the way at once when they do not
 *     depend on each other, as these readings of stations pushed beforehand do), beside a raw batched
 *     `INSERT … SELECT FROM unnest(…)` of the same rows (1,000 per statement, one transaction, change
 *     sequences reserved the same way) into the same database, run alternately in the same process. Goal:
 *     push ≤ 2.0 × raw.
 *  2. pull of 100,000 changes from cursor 0 as a reviewer, beside reading the same rows straight from
 *     PostgreSQL as JSON (no HTTP). Goal 10 s (a first sync of a large organisation). The server's peak
 *     RSS and heap (sampled every 5 ms inside the server process) are printed.
 * The repeat-group recomputation that follows each push (debounced, after the commit) is timed apart.
 * Invented data. Compare numbers only within one run (STACK.md). `--rows` prints the machine line for
 * `npm run bench`; `--strict` exits non-zero when a goal is missed.
 */
import fs from 'node:fs';
import os from 'node:os';
import pg from 'pg';
import { PUSH_MAX_MUTATIONS, PullResponseSchema, PushResponseSchema } from '../../shared/schemas/sync';
import { createDb } from '../../server/db/client';
import { freePort, makeThrowawayDir, startLocalPostgres } from '../../server/db/local-postgres';
import { runMigrations } from '../../server/db/migrate';
import { DEMO_PASSWORD, seedDemo } from '../../server/db/seed/demo';
import { getJson, postJson, signInOver, startChildServer } from '../setup/sync-child';
import { batchFootprint, PUSH_BATCH_SIZE, PUSH_IN_FLIGHT, pushInTurn } from '../../shared/sync/push-plan';
import { makeReading, makeStation, mutationFor, type Scope } from '../setup/sync-fixtures-core';
import { BENCH_ROWS_MARKER, mulberry32, printTable, type BenchRow } from './harness';

const args = process.argv.slice(2);
const READINGS = 10_000;
const STATIONS = 500;
const PUSH_RUNS = 5;
const RAW_CHUNK_ROWS = 1_000;
const PULL_CHANGES = 100_000;
const PULL_PAGE = 5_000;
const PULL_GOAL_MS = 10_000;
const MB = 1024 * 1024;

/** Progress on stderr, so a long run shows where it is (stdout stays the table). */
const step = (message: string) => console.error(`[bench:sync] ${message}`);

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
};

async function main() {
  const dataDir = makeThrowawayDir('fringewalk-bench-pg-');
  const postgres = await startLocalPostgres({ dataDir, port: await freePort(), database: 'fringewalk_bench', throwaway: true });
  const cleanup: (() => Promise<void> | void)[] = [
    async () => {
      await postgres.stop();
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  ];
  try {
    step('PostgreSQL started; migrating and seeding…');
    await runMigrations(postgres.url);
    const { pool: seedPool, db } = createDb(postgres.url);
    await seedDemo(db);
    await seedPool.end();

    const raw = new pg.Client({ connectionString: postgres.url });
    await raw.connect();
    cleanup.push(() => raw.end());
    const one = async <T>(text: string, values: unknown[] = []) => (await raw.query(text, values)).rows[0] as T;
    const org = await one<{ id: string }>(`SELECT id FROM organisations WHERE name ILIKE 'Harrowby%'`);
    const survey = await one<{ id: string; site_id: string }>(`SELECT id, site_id FROM surveys WHERE organisation_id = $1 AND state = 'open' LIMIT 1`, [org.id]);
    const level = await one<{ id: string }>(`SELECT id FROM levels WHERE site_id = $1 ORDER BY ordinal LIMIT 1`, [survey.site_id]);
    const meter = await one<{ id: string }>(`SELECT id FROM instruments WHERE organisation_id = $1 AND kind = 'gaussmeter' LIMIT 1`, [org.id]);
    const user = await one<{ id: string }>(`SELECT id FROM users WHERE email = 'surveyor@harrowby.example'`);
    const scope: Scope = { orgId: org.id, surveyId: survey.id, levelId: level.id, userId: user.id };

    step('starting the server process…');
    const server = await startChildServer(postgres.url, { ipc: true });
    cleanup.push(() => server.stop());
    const surveyorCookie = await signInOver(server.baseUrl, 'surveyor@harrowby.example', DEMO_PASSWORD);
    const reviewerCookie = await signInOver(server.baseUrl, 'reviewer@harrowby.example', DEMO_PASSWORD);
    const pushPath = `/api/orgs/${org.id}/sync/push`;

    // Stations on a 2 m grid away from the demo's, pushed once (untimed).
    const stations = Array.from({ length: STATIONS }, (_, i) => makeStation(scope, { xM: 200 + (i % 25) * 2, yM: 200 + Math.floor(i / 25) * 2 }));
    for (let i = 0; i < stations.length; i += PUSH_MAX_MUTATIONS) {
      const res = await postJson(server.baseUrl, surveyorCookie, pushPath, { deviceId: 'bench-device', mutations: stations.slice(i, i + PUSH_MAX_MUTATIONS).map((s) => mutationFor('stations', s)) });
      if (res.status !== 200) throw new Error(`station push failed: ${JSON.stringify(res.body)}`);
    }

    const rand = mulberry32(20261118);
    const makeReadings = () =>
      Array.from({ length: READINGS }, (_, i) =>
        makeReading(scope, stations[i % STATIONS]!.id, {
          instrumentId: meter.id,
          magnitudeT: Number(((0.2e-3 + (i % STATIONS) * 2e-6) * (1 + (rand() - 0.5) * 0.004)).toPrecision(4)),
          measuredAt: new Date(Date.UTC(2026, 10, 18, 8) + i * 1000).toISOString(),
        }),
      );

    /** Pushes as a device does (shared/sync/push-plan.ts): batches in queue order, independent ones side by side. */
    async function pushRun(): Promise<number> {
      const mutations = makeReadings().map((r) => mutationFor('field_readings', r));
      const started = performance.now();
      const batches = Array.from({ length: Math.ceil(mutations.length / PUSH_BATCH_SIZE) }, (_, i) => mutations.slice(i * PUSH_BATCH_SIZE, (i + 1) * PUSH_BATCH_SIZE));
      await pushInTurn(batches, batchFootprint, async (batch) => {
        const res = await postJson(server.baseUrl, surveyorCookie, pushPath, { deviceId: 'bench-device', mutations: batch });
        if (res.status !== 200) throw new Error(`push failed: ${res.status} ${JSON.stringify(res.body)}`);
        const bad = PushResponseSchema.parse(res.body).results.find((r) => r.status !== 'applied');
        if (bad) throw new Error(`a mutation was not applied: ${JSON.stringify(bad)}`);
        if (process.env.BENCH_TRACE) step(`  batch of ${batch.length}: ${(performance.now() - started).toFixed(0)} ms`);
      });
      return performance.now() - started;
    }

    /** The same rows written straight into PostgreSQL: sequences reserved once, unnest INSERTs of 1,000. */
    async function rawRun(): Promise<number> {
      const rows = makeReadings();
      const started = performance.now();
      await raw.query('BEGIN');
      const { rows: seqRows } = await raw.query<{ change_seq: string }>('UPDATE organisations SET change_seq = change_seq + $2 WHERE id = $1 RETURNING change_seq', [org.id, rows.length]);
      const first = Number(seqRows[0]!.change_seq) - rows.length + 1;
      for (let start = 0; start < rows.length; start += RAW_CHUNK_ROWS) {
        const chunk = rows.slice(start, start + RAW_CHUNK_ROWS);
        const col = <K extends keyof (typeof chunk)[number]>(k: K) => chunk.map((r) => r[k]);
        await raw.query(
          `INSERT INTO field_readings (organisation_id, id, revision, deleted, change_seq, survey_id, station_id, walk_id, instrument_id, surveyor_user_id,
             magnitude_t, bx_t, by_t, bz_t, unit, probe_orientation, height_m, background_t, zeroed, measured_at, notes, photo_object_key, photo_sha256)
           SELECT * FROM unnest($1::uuid[], $2::uuid[], $3::int[], $4::boolean[], $5::bigint[], $6::uuid[], $7::uuid[], $8::uuid[], $9::uuid[], $10::uuid[],
             $11::float8[], $12::float8[], $13::float8[], $14::float8[], $15::field_unit[], $16::probe_orientation[], $17::float8[], $18::float8[], $19::boolean[],
             $20::timestamptz[], $21::text[], $22::text[], $23::text[])`,
          [
            col('organisationId'), col('id'), col('revision'), col('deleted'), chunk.map((_, i) => first + start + i), col('surveyId'), col('stationId'), col('walkId'),
            col('instrumentId'), col('surveyorUserId'), col('magnitudeT'), col('bxT'), col('byT'), col('bzT'), col('unit'), col('probeOrientation'), col('heightM'),
            col('backgroundT'), col('zeroed'), col('measuredAt'), col('notes'), col('photoObjectKey'), col('photoSha256'),
          ],
        );
      }
      await raw.query('COMMIT');
      return performance.now() - started;
    }

    async function repeatsRun(): Promise<number> {
      const started = performance.now();
      const res = await getJson(server.baseUrl, surveyorCookie, `/api/orgs/${org.id}/surveys/${survey.id}/repeats`);
      if (res.status !== 200) throw new Error(`repeats failed: ${JSON.stringify(res.body)}`);
      if (process.env.BENCH_TRACE) step(`  repeats: ${(performance.now() - started).toFixed(0)} ms`);
      return performance.now() - started;
    }

    // Warm-up (JIT, caches), then alternate push and raw runs; after each push, the repeat groups are
    // brought up to date (timed apart) so the recomputation never overlaps a measured run.
    step('warm-up push…');
    await pushRun();
    await repeatsRun();
    await rawRun();
    const pushTimes: number[] = [];
    const rawTimes: number[] = [];
    const repeatTimes: number[] = [];
    for (let run = 0; run < PUSH_RUNS; run += 1) {
      step(`push run ${run + 1} of ${PUSH_RUNS}…`);
      pushTimes.push(await pushRun());
      repeatTimes.push(await repeatsRun());
      rawTimes.push(await rawRun());
    }

    // Enough changes for the pull: top up with raw rows (the pull reads rows, however they were written).
    const visible = await one<{ n: string }>(
      `SELECT (SELECT count(*) FROM field_readings WHERE organisation_id = $1) + (SELECT count(*) FROM stations WHERE organisation_id = $1) + 2000 AS n`,
      [org.id],
    );
    for (let have = Number(visible.n); have < PULL_CHANGES; have += READINGS) await rawRun();

    let firstPageChecked = false;
    async function pullRun(): Promise<{ ms: number; changes: number; pages: number }> {
      let cursor = '0';
      let changes = 0;
      let pages = 0;
      const started = performance.now();
      while (changes < PULL_CHANGES) {
        const res = await getJson(server.baseUrl, reviewerCookie, `/api/orgs/${org.id}/sync/pull?since=${cursor}&limit=${Math.min(PULL_PAGE, PULL_CHANGES - changes)}`);
        if (res.status !== 200) throw new Error(`pull failed: ${JSON.stringify(res.body)}`);
        // The device's own validation is not the server's time: parse the first page only, untimed below.
        const page = res.body as { changes: unknown[]; nextCursor: string; hasMore: boolean };
        if (pages === 0 && !firstPageChecked) {
          PullResponseSchema.parse(res.body);
          firstPageChecked = true;
        }
        changes += page.changes.length;
        pages += 1;
        cursor = page.nextCursor;
        if (!page.hasMore) break;
      }
      return { ms: performance.now() - started, changes, pages };
    }
    async function rawPullRun(): Promise<number> {
      const started = performance.now();
      const { rows } = await raw.query(
        `SELECT row_to_json(r) AS j FROM (
           SELECT * FROM field_readings WHERE organisation_id = $1 ORDER BY change_seq LIMIT $2) r`,
        [org.id, PULL_CHANGES],
      );
      if (rows.length < 1) throw new Error('no rows');
      return performance.now() - started;
    }

    step('pull warm-up…');
    await pullRun(); // warm-up
    const before = await server.memory('memory-reset');
    const pulled = await pullRun();
    const memory = await server.memory('memory-report');
    const rawPullMs = median([await rawPullRun(), await rawPullRun(), await rawPullRun()]);

    const pushMs = median(pushTimes);
    const rawMs = median(rawTimes);
    const rows: BenchRow[] = [
      {
        figure: `push ${READINGS.toLocaleString('en')} readings over HTTP (${READINGS / PUSH_BATCH_SIZE} batches of ${PUSH_BATCH_SIZE}, ${PUSH_IN_FLIGHT} on the way) vs raw unnest INSERT`,
        goal: Math.round(2 * rawMs),
        measured: pushMs,
        baseline: rawMs,
        ratio: pushMs / rawMs,
        pass: pushMs <= 2 * rawMs,
      },
      {
        figure: `pull ${pulled.changes.toLocaleString('en')} changes (${pulled.pages} pages of ${PULL_PAGE.toLocaleString('en')}) vs one SELECT row_to_json`,
        goal: PULL_GOAL_MS,
        measured: pulled.ms,
        baseline: rawPullMs,
        ratio: pulled.ms / rawPullMs,
        pass: pulled.ms <= PULL_GOAL_MS,
      },
    ];
    printTable(rows, `Fringewalk sync benchmark — node ${process.version}, ${os.cpus().length} cores, ${os.cpus()[0]?.model ?? 'unknown cpu'}`);
    console.log(
      [
        `push runs (ms): ${pushTimes.map((t) => t.toFixed(0)).join(', ')}; raw runs (ms): ${rawTimes.map((t) => t.toFixed(0)).join(', ')}; ratio ${(pushMs / rawMs).toFixed(2)} (goal ≤ 2.0)`,
        `  push per reading ${((pushMs / READINGS) * 1000).toFixed(1)} µs; raw per reading ${((rawMs / READINGS) * 1000).toFixed(1)} µs`,
        `repeat groups recomputed after each push (GET …/repeats, ${STATIONS} groups growing to ${((PUSH_RUNS + 1) * READINGS) / STATIONS} readings): ${repeatTimes.map((t) => t.toFixed(0)).join(', ')} ms`,
        `pull: ${pulled.changes.toLocaleString('en')} changes in ${pulled.ms.toFixed(0)} ms; server RSS ${(before.rss! / MB).toFixed(0)} MB before, peak ${(memory.peakRss! / MB).toFixed(0)} MB (+${((memory.peakRss! - before.rss!) / MB).toFixed(0)} MB); heap peak ${(memory.peakHeapUsed! / MB).toFixed(0)} MB (before ${(before.heapUsed! / MB).toFixed(0)} MB)`,
      ].join('\n'),
    );
    if (args.includes('--rows')) console.log(`${BENCH_ROWS_MARKER}${JSON.stringify(rows)}`);
    return rows;
  } finally {
    for (const step of cleanup.reverse()) {
      try {
        await step();
      } catch (error) {
        console.error('cleanup step failed:', error);
      }
    }
  }
}

const rows = await main();
if (args.includes('--strict') && rows.some((r) => !r.pass)) process.exit(1);
