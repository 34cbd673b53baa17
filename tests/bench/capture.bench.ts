/**
 * Capture benchmark (`npm run bench`, or `npx tsx tests/bench/capture.bench.ts`): headless Debian
 * Chromium against a production build served by the real server (throwaway PostgreSQL cluster, demo
 * seed, local fake S3 with the demo plans), signed in as the demo surveyor with the open survey taken
 * offline.
 *
 * Figures and goals (issue 4):
 * - saving a field reading — tap Save until the reading is in IndexedDB and in the walk list — p50 and
 *   p95 over 200 saves with 10,000 readings already stored; goal p95 ≤ 50 ms. Baseline: a raw
 *   IndexedDB put of the same record, in its own transaction, in the same page.
 * - plan view first paint with 5,000 stations on the level: navigation start to the stations on the
 *   canvas; goal ≤ 500 ms. Baseline: the same page with no stations on the level.
 * The 10,000 readings and 5,000 stations are invented (log-uniform |B| from a seeded PRNG).
 */
import os from 'node:os';
import path from 'node:path';
import { chromium, type CDPSession, type Page } from 'playwright-core';
import { buildBenchClient, CHROMIUM_ARGS, runBrowserBench, startBenchServer, type Cleanups } from './bench-app';
import { BENCH_ROWS_MARKER, printTable, type BenchRow } from './harness';

const SURVEY_NAME = '2026 annual fringe-field check';
const SAVES = Number(process.env.BENCH_SAVES ?? 200);
const STORED_READINGS = 10_000;
const PLAN_STATIONS = 5_000;
const PAINT_RUNS = 7;

const cleanups: Cleanups = [];

function quantile(sorted: number[], q: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[i] as number;
}
const median = (xs: number[]) => quantile([...xs].sort((a, b) => a - b), 0.5);

/** In the page: raw IndexedDB helpers on the app's own database (no app code involved). */
const PAGE_HELPERS = `
// tsx compiles with keepNames, which wraps functions passed to page.evaluate in __name(): give the page one.
window.__name = (fn) => fn;
window.__fwIdb = () => new Promise((resolve, reject) => { const r = indexedDB.open('fringewalk'); r.onsuccess = () => resolve(r.result); r.onerror = () => reject(r.error); });
window.__fwDone = (tx) => new Promise((resolve, reject) => { tx.oncomplete = () => resolve(); tx.onerror = () => reject(tx.error); tx.onabort = () => reject(tx.error); });
window.__fwUuid = () => crypto.randomUUID();
`;

async function tapPlan(page: Page, fx: number, fy: number) {
  const box = await page.locator('.leaflet-container').boundingBox();
  if (!box) throw new Error('no plan on screen');
  await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
}

async function main() {
  const clientDir = await buildBenchClient(cleanups);
  const { baseUrl } = await startBenchServer(clientDir, cleanups, { files: true });
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
  cleanups.push(() => browser.close());
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  context.setDefaultTimeout(30_000);
  await context.addInitScript(PAGE_HELPERS);
  const page = await context.newPage();

  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill('surveyor@harrowby.example');
  await page.getByLabel('Password').fill('fringewalk-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${baseUrl}/`);
  await page.getByRole('link', { name: SURVEY_NAME }).first().click();
  await page.getByTestId('take-offline').click();
  await page.getByText('Ready to work offline').waitFor({ timeout: 60_000 });
  await page.getByTestId('start-capture').click();
  await page.waitForURL(/\/capture$/);
  const captureUrl = page.url();
  await page.locator('.leaflet-container[data-stations-drawn]').waitFor();

  // ---- saving a field reading -------------------------------------------------------------------
  const field = page.getByLabel('|B|', { exact: true });
  await tapPlan(page, 0.3, 0.95);
  await field.fill('0.42');
  await page.getByRole('button', { name: 'Save reading' }).click();
  await page.getByTestId('walk-entry').first().waitFor({ state: 'attached' });

  // 10,000 readings already stored: copies of the one just saved, in earlier walks of the survey.
  const firstId = await page.getByTestId('walk-entry').first().getAttribute('data-entry-id');
  const stored = await page.evaluate(async ({ count, firstId }) => {
    const w = window as unknown as { __fwIdb(): Promise<IDBDatabase>; __fwDone(tx: IDBTransaction): Promise<void>; __fwUuid(): string };
    const db = await w.__fwIdb();
    const all = await new Promise<Array<Record<string, unknown>>>((resolve) => {
      const r = db.transaction('fieldReadings').objectStore('fieldReadings').getAll();
      r.onsuccess = () => resolve(r.result as Array<Record<string, unknown>>);
    });
    const template = all.find((r) => r.id === firstId)!;
    // Spread over the survey's stations, as a season of walks would be (about 80 readings a station).
    const stationIds = await new Promise<string[]>((resolve) => {
      const r = db.transaction('stations').objectStore('stations').getAll();
      r.onsuccess = () => resolve((r.result as Array<{ id: string; surveyId: string }>).filter((st) => st.surveyId === template.surveyId).map((st) => st.id));
    });
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const tx = db.transaction('fieldReadings', 'readwrite');
    const store = tx.objectStore('fieldReadings');
    const walkIds = Array.from({ length: 20 }, () => w.__fwUuid());
    for (let i = 0; i < count; i++) {
      const fieldT = 10 ** (-5 + 4 * rand());
      store.put({ ...template, id: w.__fwUuid(), stationId: stationIds[i % stationIds.length], walkId: walkIds[i % walkIds.length], magnitudeT: fieldT, fieldT, measuredAt: new Date(Date.now() - (i + 1) * 60_000).toISOString() });
    }
    await w.__fwDone(tx);
    const n = await new Promise<number>((resolve) => {
      const r = db.transaction('fieldReadings').objectStore('fieldReadings').count();
      r.onsuccess = () => resolve(r.result);
    });
    db.close();
    return { total: n, template };
  }, { count: STORED_READINGS, firstId });
  await page.reload();
  await page.locator('.leaflet-container[data-stations-drawn]').waitFor();
  await page.getByTestId('walk-entry').first().waitFor({ state: 'attached' });

  // BENCH_PROFILE=1: a CPU profile of the timed saves, top functions by self time (unminified build).
  const cdp = process.env.BENCH_PROFILE ? await context.newCDPSession(page) : null;
  if (cdp) {
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.start');
  }
  const saveTimes: number[] = [];
  const phases: Array<{ total: number; validate: number; store: number; screen: number }> = [];
  for (let i = 0; i < SAVES + 5; i++) {
    await field.fill((0.1 + (i % 50) * 0.01).toFixed(2));
    const ms = await page.evaluate(async () => {
      const list = document.querySelector('[data-testid="walk-list"]')!;
      // The list shows the newest 100 entries, so wait for a new newest entry rather than a longer list.
      const newestId = () => list.querySelector('[data-testid="walk-entry"]')?.getAttribute('data-entry-id') ?? null;
      const before = newestId();
      const button = [...document.querySelectorAll('button')].find((b) => b.textContent === 'Save reading')!;
      const start = performance.now();
      const appeared = new Promise<void>((resolve) => {
        const check = () => {
          if (newestId() !== before) {
            observer.disconnect();
            resolve();
          }
        };
        const observer = new MutationObserver(check);
        observer.observe(list, { childList: true, subtree: true });
      });
      button.click();
      await appeared;
      const end = performance.now();
      const marks = (name: string) => (performance.getEntriesByName(name) as PerformanceMark[]).filter((m) => m.startTime >= start);
      const began = marks('capture:save-start')[0]?.startTime ?? start;
      const stored = marks('capture:save-stored')[0]?.startTime ?? end;
      performance.clearMarks();
      return { total: end - start, validate: began - start, store: stored - began, screen: end - stored };
    });
    await page.waitForFunction(() => (document.querySelector('input[name="magnitude"]') as HTMLInputElement | null)?.value === '');
    if (i >= 5) {
      // the first few warm up the JIT and the live queries
      saveTimes.push(ms.total);
      phases.push(ms);
    }
  }
  if (cdp) await printProfile(cdp);
  const afterSaves = await page.evaluate(async () => {
    const w = window as unknown as { __fwIdb(): Promise<IDBDatabase> };
    const db = await w.__fwIdb();
    const n = await new Promise<number>((resolve) => {
      const r = db.transaction('fieldReadings').objectStore('fieldReadings').count();
      r.onsuccess = () => resolve(r.result);
    });
    db.close();
    return n;
  });
  if (afterSaves !== stored.total + SAVES + 5) throw new Error(`expected ${stored.total + SAVES + 5} readings in IndexedDB, found ${afterSaves}`);

  // Baseline: a raw put of the same record, each in its own transaction, in the same page.
  const putTimes = await page.evaluate(async ({ template, count }) => {
    const w = window as unknown as { __fwIdb(): Promise<IDBDatabase>; __fwDone(tx: IDBTransaction): Promise<void>; __fwUuid(): string };
    const db = await w.__fwIdb();
    const times: number[] = [];
    const ids: string[] = [];
    for (let i = 0; i < count + 5; i++) {
      const id = w.__fwUuid();
      ids.push(id);
      const start = performance.now();
      const tx = db.transaction('fieldReadings', 'readwrite');
      tx.objectStore('fieldReadings').put({ ...template, id, walkId: w.__fwUuid() });
      await w.__fwDone(tx);
      if (i >= 5) times.push(performance.now() - start);
    }
    const tx = db.transaction('fieldReadings', 'readwrite');
    for (const id of ids) tx.objectStore('fieldReadings').delete(id);
    await w.__fwDone(tx);
    db.close();
    return times;
  }, { template: stored.template, count: SAVES });

  const sortedSaves = [...saveTimes].sort((a, b) => a - b);
  const sortedPuts = [...putTimes].sort((a, b) => a - b);
  const phaseMedian = (k: 'validate' | 'store' | 'screen') => median(phases.map((p) => p[k])).toFixed(1);
  console.log(`save phases (medians): form validation ${phaseMedian('validate')} ms, store ${phaseMedian('store')} ms, until in the list ${phaseMedian('screen')} ms`);
  console.log(`saves: p50 ${quantile(sortedSaves, 0.5).toFixed(1)} ms, p95 ${quantile(sortedSaves, 0.95).toFixed(1)} ms; raw put p50 ${quantile(sortedPuts, 0.5).toFixed(2)} ms, p95 ${quantile(sortedPuts, 0.95).toFixed(2)} ms`);

  if (process.env.BENCH_ONLY === 'save') return [];
  // ---- plan view first paint ----------------------------------------------------------------------
  const levelId = stored.template.stationId
    ? await page.evaluate(async (stationId) => {
        const w = window as unknown as { __fwIdb(): Promise<IDBDatabase> };
        const db = await w.__fwIdb();
        const s = await new Promise<Record<string, unknown>>((resolve) => {
          const r = db.transaction('stations').objectStore('stations').get(stationId);
          r.onsuccess = () => resolve(r.result as Record<string, unknown>);
        });
        db.close();
        return s.levelId as string;
      }, stored.template.stationId as string)
    : null;
  if (!levelId) throw new Error('no level for the benchmark');

  const setStations = (count: number, given: Record<string, unknown> | null) =>
    page.evaluate(
      async ({ levelId, count, given }) => {
        const w = window as unknown as { __fwIdb(): Promise<IDBDatabase>; __fwDone(tx: IDBTransaction): Promise<void>; __fwUuid(): string };
        const db = await w.__fwIdb();
        const all = await new Promise<Array<Record<string, unknown>>>((resolve) => {
          const r = db.transaction('stations').objectStore('stations').getAll();
          r.onsuccess = () => resolve(r.result as Array<Record<string, unknown>>);
        });
        const onLevel = all.filter((s) => s.levelId === levelId);
        const template = given ?? onLevel[0]!;
        const tx = db.transaction('stations', 'readwrite');
        const store = tx.objectStore('stations');
        for (const s of onLevel) store.delete(s.id as string);
        let seed = 11;
        const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
        for (let i = 0; i < count; i++) {
          store.put({ ...template, id: w.__fwUuid(), label: `B${i}`, xM: rand() * 60, yM: rand() * 40, latestFieldT: rand() < 0.05 ? null : 10 ** (-5 + 4 * rand()) });
        }
        await w.__fwDone(tx);
        db.close();
        return template;
      },
      { levelId, count, given },
    );

  const paintTimes = async (count: number) => {
    const times: number[] = [];
    for (let i = 0; i < PAINT_RUNS + 1; i++) {
      await page.goto(captureUrl);
      try {
        await page.locator(`.leaflet-container[data-stations-drawn="${count}"]`).waitFor();
      } catch (error) {
        const shown = await page.locator('.leaflet-container').getAttribute('data-stations-drawn').catch(() => 'no map');
        await page.screenshot({ path: path.join(os.tmpdir(), 'fringewalk-bench-paint.png') });
        throw new Error(`the plan showed ${shown} stations, expected ${count} (screenshot in ${os.tmpdir()}/fringewalk-bench-paint.png)`, { cause: error });
      }
      const ms = await page.evaluate((n) => {
        const marks = performance.getEntriesByName('capture:stations-drawn') as PerformanceMark[];
        const mark = marks.find((m) => (m.detail as { count: number } | null)?.count === n);
        return mark ? mark.startTime : Number.NaN;
      }, count);
      if (i > 0) times.push(ms); // the first load after a change warms the caches
    }
    return times;
  };
  const stationTemplate = await setStations(0, null);
  const emptyPaint = await paintTimes(0);
  await setStations(PLAN_STATIONS, stationTemplate);
  const paintCdp = process.env.BENCH_PROFILE ? await context.newCDPSession(page) : null;
  if (paintCdp) {
    await paintCdp.send('Profiler.enable');
    await paintCdp.send('Profiler.start');
  }
  const fullPaint = await paintTimes(PLAN_STATIONS);
  if (paintCdp) await printProfile(paintCdp);

  const rows: BenchRow[] = [
    row(`save reading p95 (${SAVES} saves, ${STORED_READINGS.toLocaleString('en')} stored; baseline raw IDB put p95)`, 50, quantile(sortedSaves, 0.95), quantile(sortedPuts, 0.95)),
    row(`save reading p50 (baseline raw IDB put p50)`, 50, quantile(sortedSaves, 0.5), quantile(sortedPuts, 0.5)),
    row(`plan first paint, ${PLAN_STATIONS.toLocaleString('en')} stations (baseline: none), median of ${PAINT_RUNS}`, 500, median(fullPaint), median(emptyPaint)),
  ];
  printTable(rows, `Fringewalk capture benchmark — headless Chromium ${browser.version()}, node ${process.version}, ${os.cpus().length} cores`);
  console.log(
    `(save: min ${sortedSaves[0]!.toFixed(1)} ms, max ${sortedSaves.at(-1)!.toFixed(1)} ms; ${afterSaves.toLocaleString('en')} readings in IndexedDB at the end; ` +
      `paint with ${PLAN_STATIONS}: ${fullPaint.map((t) => t.toFixed(0)).join(', ')} ms; empty: ${emptyPaint.map((t) => t.toFixed(0)).join(', ')} ms)`,
  );
  if (process.argv.includes('--rows')) console.log(`${BENCH_ROWS_MARKER}${JSON.stringify(rows)}`);
  return rows;
}

async function printProfile(cdp: CDPSession) {
  const { profile } = (await cdp.send('Profiler.stop')) as { profile: { nodes: Array<{ id: number; callFrame: { functionName: string; url: string; lineNumber: number } }>; samples: number[]; timeDeltas: number[] } };
  const self = new Map<number, number>();
  profile.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));
  const byName = new Map<string, number>();
  for (const n of profile.nodes) {
    const key = `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber}`;
    byName.set(key, (byName.get(key) ?? 0) + (self.get(n.id) ?? 0) / 1000);
  }
  console.log([...byName.entries()].sort((a, b) => b[1] - a[1]).slice(0, 30).map(([k, v]) => `${v.toFixed(0).padStart(6)} ms  ${k}`).join('\n'));
}

function row(figure: string, goal: number, measured: number, baseline: number): BenchRow {
  return { figure, goal, measured, baseline, ratio: baseline > 0 ? measured / baseline : Infinity, pass: measured <= goal };
}

runBrowserBench(main, cleanups);
