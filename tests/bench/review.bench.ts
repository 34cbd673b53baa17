/**
 * Review table benchmark (`npm run bench`, `npm run bench:map`, or `npx tsx tests/bench/review.bench.ts`):
 * headless Debian Chromium against a production build served by the real server (throwaway PostgreSQL
 * cluster, demo seed), signed in as the demo reviewer, on the review screen of the open survey with
 * 100,000 readings (invented: log-uniform |B| from a seeded PRNG over the survey's stations, written
 * straight into PostgreSQL with their change sequences).
 *
 * Figure and goal (issue 7): scrolling the virtualised table from the first row to the last, a fixed
 * step per animation frame, the longest frame (time between two animation frames) stays ≤ 50 ms.
 * Frames come at the display's cadence (the baseline's median gap, 16.7 ms at 60 Hz), so a frame lasts
 * a whole number of intervals and its measured gap carries a tenth of a millisecond of timer jitter
 * either way: a gap is counted in intervals (rounded), and the goal is met when the longest frame is at
 * most the intervals that make 50 ms (three at 60 Hz) — a 50.1 ms gap is the same 3-interval frame as
 * a 49.9 ms one. Chromium's own long animation frames (frames whose work took over 50 ms) are printed
 * beside it.
 * Baseline: the same scroll, in the same page, of a plain element of the same height with nothing in
 * it — the browser's own frame cadence.
 */
import os from 'node:os';
import pg from 'pg';
import { chromium, type Page } from 'playwright-core';
import { buildBenchClient, CHROMIUM_ARGS, runBrowserBench, startBenchServer, type Cleanups } from './bench-app';
import { BENCH_ROWS_MARKER, mulberry32, printTable, type BenchRow } from './harness';

const ROWS = Number(process.env.BENCH_REVIEW_ROWS ?? 100_000);
/** Animation frames the scroll from top to bottom takes (each frame jumps about ROWS / FRAMES rows). */
const FRAMES = Number(process.env.BENCH_REVIEW_FRAMES ?? 600);
const RUNS = 3;

const cleanups: Cleanups = [];

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1]!;

/** ROWS invented readings in the open demo survey, with change sequences reserved as every writer does. */
async function addReadings(databaseUrl: string): Promise<string> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows: [survey] } = await client.query<{ id: string; organisation_id: string }>(`SELECT id, organisation_id FROM surveys WHERE state = 'open' AND name LIKE '2026%' LIMIT 1`);
    const { rows: stations } = await client.query<{ id: string }>('SELECT id FROM stations WHERE survey_id = $1 AND NOT deleted ORDER BY id', [survey!.id]);
    const { rows: [who] } = await client.query<{ id: string }>(`SELECT id FROM users WHERE email = 'surveyor@harrowby.example'`);
    const { rows: [meter] } = await client.query<{ id: string }>(`SELECT id FROM instruments WHERE organisation_id = $1 AND kind = 'gaussmeter' ORDER BY serial LIMIT 1`, [survey!.organisation_id]);
    const rand = mulberry32(20261201);
    const fields = Array.from({ length: ROWS }, () => 10 ** (-5 + 4 * rand()));
    await client.query('BEGIN');
    const { rows: [base] } = await client.query<{ first: string }>('UPDATE organisations SET change_seq = change_seq + $2 WHERE id = $1 RETURNING change_seq - $2 + 1 AS first', [survey!.organisation_id, ROWS]);
    await client.query(
      `INSERT INTO field_readings (id, organisation_id, change_seq, revision, survey_id, station_id, surveyor_user_id, instrument_id, magnitude_t, unit, probe_orientation, height_m, measured_at, notes)
       SELECT gen_random_uuid(), $1, $2::bigint + g - 1, 1, $3, ($4::uuid[])[1 + (g % cardinality($4::uuid[]))], $5, $6, ($7::float8[])[g], 'mT', 'vertical', 1,
              timestamptz '2026-11-20T08:00:00Z' + g * interval '2 seconds', CASE WHEN g % 9 = 0 THEN 'Bench reading ' || g || ', near the door' END
         FROM generate_series(1, $8::int) AS g`,
      [survey!.organisation_id, base!.first, survey!.id, stations.map((s) => s.id), who!.id, meter?.id ?? null, fields, ROWS],
    );
    await client.query('COMMIT');
    return survey!.id;
  } finally {
    await client.end();
  }
}

interface ScrollRun {
  /** Every frame's length (time between two animation frames), ms. */
  frames: number[];
  /**
   * The long animation frames Chromium itself reported meanwhile (Long Animation Frames API: frames
   * whose work took over 50 ms), each with the part spent in style and layout forced by a script.
   */
  long: { ms: number; forcedLayoutMs: number }[];
}

/** Scrolls `selector` from top to bottom in FRAMES animation frames. */
function scrollFrames(page: Page, selector: string, frames: number): Promise<ScrollRun> {
  return page.evaluate(
    ({ selector, frames }) =>
      new Promise<ScrollRun>((resolve) => {
        const el = document.querySelector(selector) as HTMLElement;
        el.scrollTop = 0;
        const step = (el.scrollHeight - el.clientHeight) / frames;
        const times: number[] = [];
        const long: ScrollRun['long'] = [];
        type Loaf = PerformanceEntry & { scripts: { forcedStyleAndLayoutDuration: number }[] };
        const observer = new PerformanceObserver((list) => {
          for (const e of list.getEntries() as Loaf[]) long.push({ ms: e.duration, forcedLayoutMs: e.scripts.reduce((sum, x) => sum + x.forcedStyleAndLayoutDuration, 0) });
        });
        observer.observe({ type: 'long-animation-frame' });
        let last = 0;
        let i = 0;
        const tick = (now: number) => {
          if (last) times.push(now - last);
          last = now;
          if (i > frames) {
            // Entries arrive after their frame: give the last ones a moment.
            setTimeout(() => {
              observer.disconnect();
              resolve({ frames: times, long });
            }, 100);
            return;
          }
          i += 1;
          el.scrollTop = Math.min(el.scrollHeight, i * step);
          requestAnimationFrame(tick);
        };
        requestAnimationFrame(tick);
      }),
    { selector, frames },
  );
}

async function main() {
  const clientDir = await buildBenchClient(cleanups);
  const { baseUrl, databaseUrl } = await startBenchServer(clientDir, cleanups, { files: false });
  const surveyId = await addReadings(databaseUrl);
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
  cleanups.push(() => browser.close());
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  context.setDefaultTimeout(600_000);
  // tsx compiles with keepNames, which wraps functions passed to page.evaluate in __name(): give the page one.
  await context.addInitScript('window.__name = (fn) => fn;');
  const page = await context.newPage();
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill('reviewer@harrowby.example');
  await page.getByLabel('Password').fill('fringewalk-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${baseUrl}/`);

  const loadStart = Date.now();
  await page.goto(`${baseUrl}/surveys/${surveyId}/review`);
  await page.getByTestId('review-table').waitFor();
  await page.waitForFunction(
    (n) => Number(/of (\d+)/.exec(document.querySelector('[data-testid="review-count"]')?.textContent ?? '')?.[1] ?? 0) >= n,
    ROWS,
    { timeout: 600_000 },
  );
  const countText = (await page.getByTestId('review-count').textContent()) ?? '';
  const shown = Number(/of (\d+)/.exec(countText)?.[1] ?? 0);
  if (shown < ROWS) throw new Error(`the review table shows ${countText}, expected at least ${ROWS} rows`);
  const loadMs = Date.now() - loadStart;
  const domRows = await page.getByTestId('review-row').count();
  // The page's JavaScript heap once the table is shown, after a full garbage collection.
  const cdp = await context.newCDPSession(page);
  await cdp.send('HeapProfiler.collectGarbage');
  const heap = (await cdp.send('Runtime.getHeapUsage')) as { usedSize: number };
  await cdp.detach();

  // The baseline: an empty element of the same height, scrolled the same way in the same page.
  await page.evaluate(() => {
    const table = document.querySelector('[data-testid="review-table-scroll"]') as HTMLElement;
    const box = document.createElement('div');
    box.id = 'bench-baseline';
    box.style.height = `${table.clientHeight}px`;
    box.style.overflow = 'auto';
    const inner = document.createElement('div');
    inner.style.height = `${table.scrollHeight}px`;
    box.append(inner);
    document.body.append(box);
  });

  // The API answer's own timing (resource timing in the page), to tell server and transfer from the client's work.
  const api = await page.evaluate(() => {
    const e = performance.getEntriesByType('resource').find((r) => r.name.includes('/review/readings')) as PerformanceResourceTiming | undefined;
    return e ? { waitMs: e.responseStart - e.requestStart, downloadMs: e.responseEnd - e.responseStart, bytes: e.encodedBodySize } : null;
  });
  if (api) console.log(`review/readings: server ${api.waitMs.toFixed(0)} ms to first byte, ${api.downloadMs.toFixed(0)} ms download, ${(api.bytes / 1e6).toFixed(1)} MB`);

  // BENCH_PROFILE=1: a CPU profile of one scroll, top functions by self time (unminified build).
  if (process.env.BENCH_PROFILE) {
    const cdp = await context.newCDPSession(page);
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.start');
    await scrollFrames(page, '[data-testid="review-table-scroll"]', FRAMES);
    const { profile } = (await cdp.send('Profiler.stop')) as { profile: { nodes: Array<{ id: number; callFrame: { functionName: string; url: string; lineNumber: number } }>; samples: number[]; timeDeltas: number[] } };
    const self = new Map<number, number>();
    profile.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));
    const byName = new Map<string, number>();
    for (const n of profile.nodes) {
      const key = `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber}`;
      byName.set(key, (byName.get(key) ?? 0) + (self.get(n.id) ?? 0) / 1000);
    }
    console.log([...byName.entries()].sort((a, b) => b[1] - a[1]).slice(0, 25).map(([k, v]) => `${v.toFixed(0).padStart(6)} ms  ${k}`).join('\n'));
  }

  const longest: number[] = [];
  const baseline: number[] = [];
  const p95s: number[] = [];
  const slow: string[] = [];
  const longFrames: string[] = [];
  const cadence: number[] = [];
  for (let run = 0; run < RUNS + 1; run++) {
    const { frames, long } = await scrollFrames(page, '[data-testid="review-table-scroll"]', FRAMES);
    const base = (await scrollFrames(page, '#bench-baseline', FRAMES)).frames;
    if (run === 0) continue; // warm-up
    longFrames.push(long.map((f) => `${f.ms.toFixed(0)} (forced layout ${f.forcedLayoutMs.toFixed(0)})`).join(', ') || 'none');
    const sorted = [...frames].sort((a, b) => a - b);
    longest.push(sorted.at(-1)!);
    // Where the long frames fall (frame number: ms), to tell a steady cost from a one-off pause.
    const runInterval = median(base);
    slow.push(frames.flatMap((f, i) => (Math.round(f / runInterval) > Math.round(50 / runInterval) ? [`${i}: ${f.toFixed(0)}`] : [])).join(', ') || 'none');
    p95s.push(sorted[Math.ceil(sorted.length * 0.95) - 1]!);
    baseline.push(Math.max(...base));
    cadence.push(...base);
  }
  // The last row really is on screen at the end.
  const lastShown = await page.evaluate(() => {
    const rows = document.querySelectorAll('[data-testid="review-row"]');
    return Number(rows[rows.length - 1]?.getAttribute('aria-rowindex') ?? 0) - 1;
  });
  if (lastShown < shown) throw new Error(`after scrolling, the last row in the DOM is row ${lastShown} of ${shown}`);

  // The display's frame interval, and the longest frame allowed in whole intervals (see the header).
  const interval = median(cadence);
  const allowedIntervals = Math.round(50 / interval);
  const longestIntervals = Math.round(median(longest) / interval);
  const rows: BenchRow[] = [
    {
      figure: `review table: longest frame scrolling ${shown.toLocaleString('en')} rows top to bottom in ${FRAMES} frames (median of ${RUNS}; baseline: empty element, same scroll)`,
      goal: 50,
      measured: median(longest),
      baseline: median(baseline),
      ratio: median(longest) / median(baseline),
      pass: longestIntervals <= allowedIntervals,
    },
  ];
  printTable(rows, `Fringewalk review table benchmark — headless Chromium ${browser.version()}, node ${process.version}, ${os.cpus().length} cores`);
  console.log(
    `(longest frames ${longest.map((t) => t.toFixed(1)).join(', ')} ms; p95 ${p95s.map((t) => t.toFixed(1)).join(', ')} ms; baseline longest ${baseline.map((t) => t.toFixed(1)).join(', ')} ms; ` +
      `${domRows} rows in the DOM; open to table shown ${loadMs} ms; page heap ${(heap.usedSize / 1e6).toFixed(0)} MB)\n(frames over 50 ms, per run: ${slow.join(' | ')})\n` +
      `(Chromium's long animation frames, ms, per run: ${longFrames.join(' | ')})\n` +
      `(display interval ${interval.toFixed(2)} ms: the longest frame is ${longestIntervals} intervals, at most ${allowedIntervals} make 50 ms)`,
  );
  if (process.argv.includes('--rows')) console.log(`${BENCH_ROWS_MARKER}${JSON.stringify(rows)}`);
  return rows;
}

runBrowserBench(main, cleanups);
