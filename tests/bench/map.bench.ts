/**
 * Survey-map benchmark (`npm run bench:map`, or part of `npm run bench`; issue 7, Benchmark). A
 * throwaway PostgreSQL cluster migrated and seeded with the demo (plans in a local fake S3), the real
 * app in this process serving a production build, and two invented surveys on the demo site's
 * cyclotron level: 10,000 and 100,000 field readings (four readings per station, |B| of a dipole at the
 * cyclotron with 2 % scatter, from a seeded PRNG), written straight into PostgreSQL.
 *
 * Figures:
 *  1–2. server time of GET …/map when nothing is stored (every run after a write that bumps the data
 *       version: the full computation — read, merge, classes, grid, contours, repeat groups, dipole
 *       fit, JSON), over HTTP, body read; with its payload size. Goal for 10,000 readings ≤ 300 ms
 *       (the issue's); for 100,000, ≤ 3,000 ms (ours). Baseline: reading the same stations and
 *       readings straight from PostgreSQL (one SELECT each, no HTTP), in the same run.
 *  3–4. the same request answered from the store (data version unchanged); baseline as above.
 *  5–6. browser time to first render: headless Debian Chromium, signed in as the demo reviewer,
 *       navigation start of /surveys/:id/map to the stations on the canvas (the map's own performance
 *       mark), the map already stored; goal 1,500 ms for 10,000 readings, 8,000 ms for 100,000 (ours).
 *       Baseline: the same screen for a survey of 12 readings.
 * Compare numbers only within one run (STACK.md). `--rows` prints the machine line for `npm run bench`;
 * `--strict` exits non-zero when a goal is missed.
 */
import os from 'node:os';
import pg from 'pg';
import { chromium } from 'playwright-core';
import { v7 as uuidv7 } from 'uuid';
import { buildBenchClient, CHROMIUM_ARGS, startBenchServer, type Cleanups } from './bench-app';
import { BENCH_ROWS_MARKER, mulberry32, printTable, type BenchRow } from './harness';

const args = process.argv.slice(2);
const READINGS_PER_STATION = 4;
const SIZES = [
  { readings: 10_000, coldGoalMs: 300, renderGoalMs: 1_500, runs: 5 },
  { readings: 100_000, coldGoalMs: 3_000, renderGoalMs: 8_000, runs: 3 },
] as const;
const MB = 1024 * 1024;
/** μ₀/4π, T·m/A (CODATA 2018 μ₀ = 1.256 637 062 12 × 10⁻⁶ N/A²). */
const MU0_OVER_4PI = 1.25663706212e-7;

const step = (message: string) => console.error(`[bench:map] ${message}`);
const cleanups: Cleanups = [];
const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
};

interface Level {
  levelId: string;
  hasMagnet: boolean;
  /** The magnet on the level (or the plan's centre when none is placed there). */
  source: { x: number; y: number };
  boundsM: { minX: number; maxX: number; minY: number; maxY: number };
}

interface Site {
  orgId: string;
  siteId: string;
  zoneSetId: string;
  instrumentId: string;
  userId: string;
  /** Every calibrated level of the demo site, the magnets' levels first. */
  levels: Level[];
}

async function demoSite(raw: pg.Client): Promise<Site> {
  const one = async <T>(text: string, values: unknown[] = []) => {
    const r = (await raw.query(text, values)).rows[0] as T | undefined;
    if (!r) throw new Error(`no row: ${text}`);
    return r;
  };
  const org = await one<{ id: string }>(`SELECT id FROM organisations WHERE name ILIKE 'Harrowby%'`);
  const survey = await one<{ site_id: string; zone_set_id: string }>(`SELECT site_id, zone_set_id FROM surveys WHERE organisation_id = $1 AND state = 'open' LIMIT 1`, [org.id]);
  const { rows: plans } = await raw.query<{ level_id: string; width_px: number; height_px: number; metres_per_pixel: number; origin_x_px: number; origin_y_px: number; sx: number | null; sy: number | null }>(
    `SELECT DISTINCT ON (l.id) l.id AS level_id, p.width_px, p.height_px, p.metres_per_pixel, p.origin_x_px, p.origin_y_px,
            (SELECT x_m FROM sources s WHERE s.level_id = l.id AND s.x_m IS NOT NULL AND NOT s.deleted ORDER BY s.nominal_field_t DESC LIMIT 1) AS sx,
            (SELECT y_m FROM sources s WHERE s.level_id = l.id AND s.x_m IS NOT NULL AND NOT s.deleted ORDER BY s.nominal_field_t DESC LIMIT 1) AS sy
     FROM levels l JOIN plans p ON p.level_id = l.id AND NOT p.deleted
     WHERE l.site_id = $1 AND NOT l.deleted AND p.metres_per_pixel IS NOT NULL ORDER BY l.id, p.created_at DESC`,
    [survey.site_id],
  );
  const meter = await one<{ id: string }>(`SELECT id FROM instruments WHERE organisation_id = $1 AND kind = 'gaussmeter' ORDER BY serial LIMIT 1`, [org.id]);
  const user = await one<{ id: string }>(`SELECT id FROM users WHERE email = 'surveyor@harrowby.example'`);
  const levels = plans
    .map((p): Level => {
      const mpp = p.metres_per_pixel;
      const boundsM = { minX: -p.origin_x_px * mpp, maxX: (p.width_px - p.origin_x_px) * mpp, minY: (p.origin_y_px - p.height_px) * mpp, maxY: p.origin_y_px * mpp };
      return { levelId: p.level_id, hasMagnet: p.sx !== null, boundsM, source: p.sx !== null && p.sy !== null ? { x: p.sx, y: p.sy } : { x: (boundsM.minX + boundsM.maxX) / 2, y: (boundsM.minY + boundsM.maxY) / 2 } };
    })
    .sort((a, b) => Number(b.hasMagnet) - Number(a.hasMagnet));
  if (levels.length === 0) throw new Error('no calibrated plan on the demo site');
  return { orgId: org.id, siteId: survey.site_id, zoneSetId: survey.zone_set_id, instrumentId: meter.id, userId: user.id, levels };
}

/**
 * An invented open survey with `readings` readings (four per station) on as many of the site's levels as
 * it takes to keep stations about a metre apart (jittered grids, never closer than the 0.3 m repeat
 * radius: repeat groups stay the four readings of one station, as a real walk's would). Written with
 * unnest INSERTs; returns its id and station count.
 */
async function inventSurvey(raw: pg.Client, site: Site, readings: number, seed: number): Promise<{ surveyId: string; stations: number; busiestLevelStations: number }> {
  const rand = mulberry32(seed);
  const stationCount = Math.max(3, Math.ceil(readings / READINGS_PER_STATION));
  const surveyId = uuidv7();
  // |B| of a vertical dipole at each level's magnet, in its equatorial plane: μ₀m/(4πr³) (Jackson §5.6); m puts 0.5 mT about 6 m out.
  const momentAm2 = (0.5e-3 * 6 ** 3) / MU0_OVER_4PI;
  const areaOf = (l: Level) => (l.boundsM.maxX - l.boundsM.minX) * (l.boundsM.maxY - l.boundsM.minY);
  // Levels in turn until about one station per square metre (at most) fits.
  const used: Level[] = [];
  for (const l of site.levels) {
    used.push(l);
    if (used.reduce((a, x) => a + areaOf(x), 0) >= stationCount) break;
  }
  const totalArea = used.reduce((a, x) => a + areaOf(x), 0);
  const spacing = Math.max(0.5, Math.sqrt(totalArea / stationCount));
  const stationIds: string[] = [];
  const stationLevel: string[] = [];
  const sx: number[] = [];
  const sy: number[] = [];
  const sourceOf: { x: number; y: number }[] = [];
  outer: for (const l of used) {
    for (let y = l.boundsM.minY + spacing / 2; y < l.boundsM.maxY; y += spacing)
      for (let x = l.boundsM.minX + spacing / 2; x < l.boundsM.maxX; x += spacing) {
        if (stationIds.length >= stationCount) break outer;
        const px = x + (rand() - 0.5) * 0.2 * spacing;
        const py = y + (rand() - 0.5) * 0.2 * spacing;
        if (Math.hypot(px - l.source.x, py - l.source.y) < 1) continue;
        stationIds.push(uuidv7());
        stationLevel.push(l.levelId);
        sx.push(px);
        sy.push(py);
        sourceOf.push(l.source);
      }
  }
  const placed = stationIds.length;
  // The map opens on the level with the most stations.
  const busiestLevelStations = Math.max(...used.map((l) => stationLevel.filter((id) => id === l.levelId).length));
  await raw.query('BEGIN');
  const { rows } = await raw.query<{ change_seq: string }>('UPDATE organisations SET change_seq = change_seq + $2 WHERE id = $1 RETURNING change_seq', [site.orgId, 1 + placed + readings]);
  let seq = Number(rows[0]!.change_seq) - (placed + readings);
  await raw.query(
    `INSERT INTO surveys (id, organisation_id, revision, deleted, change_seq, site_id, name, state, zone_set_id, level_ids) VALUES ($1, $2, 1, false, $3, $4, $5, 'open', $6, $7::uuid[])`,
    [surveyId, site.orgId, seq++, site.siteId, `Benchmark survey of ${readings.toLocaleString('en')} readings (invented)`, site.zoneSetId, used.map((l) => l.levelId)],
  );
  for (let start = 0; start < placed; start += 5_000) {
    const ids = stationIds.slice(start, start + 5_000);
    await raw.query(
      `INSERT INTO stations (organisation_id, id, revision, deleted, change_seq, survey_id, level_id, x_m, y_m, height_m, created_by_user_id)
       SELECT $1::uuid, id, 1, false, seq, $2::uuid, lvl, x, y, 1, $3::uuid FROM unnest($4::uuid[], $5::bigint[], $6::uuid[], $7::float8[], $8::float8[]) AS u(id, seq, lvl, x, y)`,
      [site.orgId, surveyId, site.userId, ids, ids.map((_, i) => seq + start + i), stationLevel.slice(start, start + 5_000), sx.slice(start, start + 5_000), sy.slice(start, start + 5_000)],
    );
  }
  seq += placed;
  const at0 = Date.UTC(2026, 10, 20, 8);
  for (let start = 0; start < readings; start += 10_000) {
    const n = Math.min(10_000, readings - start);
    const ids: string[] = [];
    const stationOf: string[] = [];
    const fields: number[] = [];
    const seqs: number[] = [];
    const times: string[] = [];
    for (let k = 0; k < n; k++) {
      const i = start + k;
      const s = i % placed;
      const r = Math.hypot(sx[s]! - sourceOf[s]!.x, sy[s]! - sourceOf[s]!.y);
      ids.push(uuidv7());
      stationOf.push(stationIds[s]!);
      fields.push(Number((((MU0_OVER_4PI * momentAm2) / r ** 3) * (1 + (rand() - 0.5) * 0.04)).toPrecision(4)));
      seqs.push(seq + i);
      times.push(new Date(at0 + i * 1000).toISOString());
    }
    await raw.query(
      `INSERT INTO field_readings (organisation_id, id, revision, deleted, change_seq, survey_id, station_id, instrument_id, surveyor_user_id, magnitude_t, unit, probe_orientation, height_m, zeroed, measured_at)
       SELECT $1::uuid, id, 1, false, seq, $2::uuid, st, $3::uuid, $4::uuid, b, 'mT', 'three_axis', 1, true, at FROM unnest($5::uuid[], $6::bigint[], $7::uuid[], $8::float8[], $9::timestamptz[]) AS u(id, seq, st, b, at)`,
      [site.orgId, surveyId, site.instrumentId, site.userId, ids, seqs, stationOf, fields, times],
    );
  }
  await raw.query('COMMIT');
  await raw.query('ANALYZE stations');
  await raw.query('ANALYZE field_readings');
  return { surveyId, stations: placed, busiestLevelStations };
}

async function signIn(baseUrl: string, email: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', origin: baseUrl }, body: JSON.stringify({ email, password: 'fringewalk-demo' }) });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('fw.sid='));
  if (!cookie) throw new Error('no session cookie');
  return cookie.split(';')[0]!;
}

async function main(): Promise<BenchRow[]> {
  step('building the client…');
  const clientDir = await buildBenchClient(cleanups);
  step('starting PostgreSQL and the server…');
  const { baseUrl, databaseUrl } = await startBenchServer(clientDir, cleanups, { files: true });
  const raw = new pg.Client({ connectionString: databaseUrl });
  await raw.connect();
  cleanups.push(() => raw.end());
  const site = await demoSite(raw);
  const cookie = await signIn(baseUrl, 'reviewer@harrowby.example');

  const mapOnce = async (surveyId: string) => {
    const started = performance.now();
    const res = await fetch(`${baseUrl}/api/orgs/${site.orgId}/surveys/${surveyId}/map`, { headers: { cookie } });
    const body = await res.arrayBuffer();
    const ms = performance.now() - started;
    if (res.status !== 200) throw new Error(`map failed: ${res.status} ${Buffer.from(body).toString('utf8').slice(0, 300)}`);
    return { ms, bytes: body.byteLength, cache: res.headers.get('x-map-cache') };
  };
  /** A write the map reads (a station's note, with a new change sequence): the stored map is stale after it. */
  const touch = async (surveyId: string) => {
    await raw.query(
      `WITH s AS (UPDATE organisations SET change_seq = change_seq + 1 WHERE id = $1 RETURNING change_seq)
       UPDATE stations SET notes = 'touched', change_seq = (SELECT change_seq FROM s), revision = revision + 1 WHERE id = (SELECT id FROM stations WHERE survey_id = $2 ORDER BY id LIMIT 1)`,
      [site.orgId, surveyId],
    );
  };
  const rawRead = async (surveyId: string) => {
    const started = performance.now();
    await raw.query('SELECT id, level_id, room_id, label, x_m, y_m FROM stations WHERE organisation_id = $1 AND survey_id = $2 AND NOT deleted', [site.orgId, surveyId]);
    await raw.query('SELECT id, station_id, height_m, field_t, instrument_id FROM field_readings WHERE organisation_id = $1 AND survey_id = $2 AND NOT deleted ORDER BY measured_at, id', [site.orgId, surveyId]);
    return performance.now() - started;
  };

  const rows: BenchRow[] = [];
  const notes: string[] = [];
  const surveys: { readings: number; surveyId: string; stations: number; busiestLevelStations: number }[] = [];
  for (const [i, size] of SIZES.entries()) {
    step(`inventing a survey of ${size.readings.toLocaleString('en')} readings…`);
    const invented = await inventSurvey(raw, site, size.readings, 7000 + i);
    surveys.push({ readings: size.readings, ...invented });
    await mapOnce(invented.surveyId); // warm-up (JIT, first compile of the paths)
    const cold: number[] = [];
    const hot: number[] = [];
    const baseline: number[] = [];
    let bytes = 0;
    for (let run = 0; run < size.runs; run++) {
      await touch(invented.surveyId);
      const c = await mapOnce(invented.surveyId);
      if (c.cache !== 'miss') throw new Error('a map after a write came from the store');
      cold.push(c.ms);
      bytes = c.bytes;
      const h = await mapOnce(invented.surveyId);
      if (h.cache !== 'hit') throw new Error('a repeated map was not answered from the store');
      hot.push(h.ms);
      baseline.push(await rawRead(invented.surveyId));
      step(`  run ${run + 1}: computed ${c.ms.toFixed(0)} ms, stored ${h.ms.toFixed(0)} ms, raw read ${baseline.at(-1)!.toFixed(0)} ms`);
    }
    const label = `${size.readings.toLocaleString('en')} readings, ${invented.stations.toLocaleString('en')} stations`;
    const b = median(baseline);
    rows.push({ figure: `map computed, ${label} (payload ${(bytes / MB).toFixed(1)} MB; baseline raw SELECTs)`, goal: size.coldGoalMs, measured: median(cold), baseline: b, ratio: median(cold) / b, pass: median(cold) <= size.coldGoalMs });
    rows.push({ figure: `map from the store, ${label}`, goal: size.coldGoalMs, measured: median(hot), baseline: b, ratio: median(hot) / b, pass: median(hot) <= size.coldGoalMs });
    notes.push(`${label}: computed ${cold.map((t) => t.toFixed(0)).join(', ')} ms; stored ${hot.map((t) => t.toFixed(0)).join(', ')} ms; payload ${bytes.toLocaleString('en')} bytes`);
  }

  step('browser: time to first render…');
  const tiny = await inventSurvey(raw, site, 12, 9001);
  await mapOnce(tiny.surveyId);
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
  cleanups.push(() => browser.close());
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  context.setDefaultTimeout(120_000);
  const page = await context.newPage();
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill('reviewer@harrowby.example');
  await page.getByLabel('Password').fill('fringewalk-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${baseUrl}/`);
  const renderTimes = async (surveyId: string, stations: number, runs: number) => {
    const times: number[] = [];
    for (let i = 0; i < runs + 1; i++) {
      await page.goto(`${baseUrl}/surveys/${surveyId}/map`);
      await page.locator(`[data-testid="survey-map"] .leaflet-container[data-stations-drawn="${stations}"]`).waitFor();
      const ms = await page.evaluate((n) => {
        const mark = (performance.getEntriesByName('survey-map:stations-drawn') as PerformanceMark[]).find((m) => (m.detail as { count: number } | null)?.count === n);
        return mark ? mark.startTime : Number.NaN;
      }, stations);
      if (i > 0) times.push(ms); // the first load warms the HTTP and script caches
    }
    return times;
  };
  const tinyTimes = await renderTimes(tiny.surveyId, tiny.busiestLevelStations, 5);
  for (const [i, size] of SIZES.entries()) {
    const s = surveys[i]!;
    await mapOnce(s.surveyId); // stored: the browser figure is the client's time, not the computation's
    const times = await renderTimes(s.surveyId, s.busiestLevelStations, size.runs);
    rows.push({
      figure: `browser first render, ${size.readings.toLocaleString('en')} readings (baseline: 12 readings)`,
      goal: size.renderGoalMs,
      measured: median(times),
      baseline: median(tinyTimes),
      ratio: median(times) / median(tinyTimes),
      pass: median(times) <= size.renderGoalMs,
    });
    notes.push(`render ${size.readings.toLocaleString('en')}: ${times.map((t) => t.toFixed(0)).join(', ')} ms; 12 readings: ${tinyTimes.map((t) => t.toFixed(0)).join(', ')} ms`);
  }

  printTable(rows, `Fringewalk survey-map benchmark — headless Chromium ${browser.version()}, node ${process.version}, ${os.cpus().length} cores, ${os.cpus()[0]?.model ?? 'unknown cpu'}`);
  console.log(notes.join('\n'));
  if (args.includes('--rows')) console.log(`${BENCH_ROWS_MARKER}${JSON.stringify(rows)}`);
  return rows;
}

let rows: BenchRow[] = [];
try {
  rows = await main();
} finally {
  for (const fn of cleanups.reverse()) {
    try {
      await fn();
    } catch {
      // keep tearing down the rest
    }
  }
}
if (args.includes('--strict') && rows.some((r) => !r.pass)) process.exit(1);
