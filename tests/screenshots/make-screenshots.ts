/**
 * `npm run screenshots`: the README's pictures, taken from the real product. Builds the client, starts
 * the server over a throwaway PostgreSQL cluster with the demo seed and its files (as the browser
 * benchmarks do, plus the EMC flag job as in `npm start`), signs in as demo users in Debian's Chromium
 * and writes PNGs next to this file. Everything it started is stopped and removed afterwards.
 *
 * Screens are reached by URL and found by role and label, so the pictures survive changes to the home
 * screen and the demo data; each shot waits for the content it shows (plan, lines, readings, flags).
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { chromium, type Browser, type Locator, type Page } from 'playwright-core';
import { createDb } from '../../server/db/client';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-data';
import { startEmcFlagJob } from '../../server/features/emc/emc-flag-job';
import { createLogger } from '../../server/lib/logger';
import { createMailer } from '../../server/lib/mail';
import { buildBenchClient, CHROMIUM_ARGS, runCleanups, startBenchServer, type Cleanups } from '../bench/bench-app';

const OUT_DIR = path.dirname(fileURLToPath(import.meta.url));
const CHROMIUM_PATH = '/usr/bin/chromium';
const DESKTOP = { width: 1280, height: 860 };
const PHONE = { width: 390, height: 844 };

function step(message: string) {
  process.stdout.write(`screenshots: ${message}\n`);
}

async function one<T extends pg.QueryResultRow>(databaseUrl: string, text: string): Promise<T> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query<T>(text);
    if (!rows[0]) throw new Error(`no row for: ${text}`);
    return rows[0];
  } finally {
    await client.end();
  }
}

async function signIn(browser: Browser, baseUrl: string, email: string, viewport: { width: number; height: number }): Promise<Page> {
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1 });
  context.setDefaultTimeout(60_000);
  const page = await context.newPage();
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${baseUrl}/`);
  return page;
}

async function shoot(page: Page, name: string) {
  // Let late layout (fonts, Leaflet's fit) settle, then take the viewport only: small files.
  await page.evaluate(() => document.fonts.ready);
  await page.waitForTimeout(500);
  const file = path.join(OUT_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: false });
  step(`wrote ${path.relative(process.cwd(), file)}`);
}

/** Scrolls the page so that the element's top sits `offset` px below the top of the viewport. */
async function scrollTo(page: Page, target: Locator, offset: number) {
  await target.first().evaluate((el, px) => window.scrollTo(0, el.getBoundingClientRect().top + window.scrollY - px), offset);
}

async function waitForAttribute(page: Page, selector: string, attribute: string, atLeast: number) {
  await page.waitForFunction(
    ({ sel, attr, min }) => {
      const value = document.querySelector(sel)?.getAttribute(attr);
      return value != null && Number(value) >= min;
    },
    { sel: selector, attr: attribute, min: atLeast },
    { timeout: 60_000 },
  );
}

async function main() {
  const cleanups: Cleanups = [];
  try {
    step('building the client…');
    const clientDir = await buildBenchClient(cleanups);
    step('starting PostgreSQL and the server with the demo data…');
    const { baseUrl, databaseUrl } = await startBenchServer(clientDir, cleanups, { files: true });
    const { pool, db } = createDb(databaseUrl, { onIdleError: () => {} });
    cleanups.push(() => pool.end());
    const mailer = createMailer({ smtpUrl: 'smtp://127.0.0.1:9', from: 'screenshots <no-reply@fringewalk.invalid>' });
    cleanups.push(() => mailer.close());
    const emcJob = startEmcFlagJob({ db, mailer, publicUrl: baseUrl, logger: createLogger('silent') });
    cleanups.push(() => emcJob.stop());
    await emcJob.runOnce();

    const org = await one<{ id: string }>(databaseUrl, `SELECT id FROM organisations WHERE name ILIKE 'Harrowby%'`);
    const open = await one<{ id: string }>(databaseUrl, `SELECT id FROM surveys WHERE organisation_id = '${org.id}' AND state = 'open' ORDER BY name LIMIT 1`);

    const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS });
    cleanups.push(() => browser.close());

    step('survey map (reviewer, desktop)…');
    const reviewer = await signIn(browser, baseUrl, 'reviewer@harrowby.example', DESKTOP);
    await reviewer.goto(`${baseUrl}/surveys/${open.id}/map`);
    await reviewer.getByRole('heading', { name: /^Map of / }).waitFor();
    const mapCanvas = '[data-testid="survey-map"] .leaflet-container';
    await waitForAttribute(reviewer, mapCanvas, 'data-stations-drawn', 1);
    await waitForAttribute(reviewer, mapCanvas, 'data-contours-drawn', 1);
    await reviewer.locator('.leaflet-tooltip').first().waitFor();
    await scrollTo(reviewer, reviewer.locator(mapCanvas), 140);
    await shoot(reviewer, 'survey-map');

    step('review table (reviewer, desktop)…');
    await reviewer.goto(`${baseUrl}/surveys/${open.id}/review`);
    await reviewer.getByTestId('review-table').waitFor();
    await reviewer.getByTestId('review-row').first().waitFor();
    await scrollTo(reviewer, reviewer.getByRole('heading', { name: 'Readings', exact: true }), 16);
    await shoot(reviewer, 'review-table');

    step('EMC check (EMC engineer, desktop)…');
    const emc = await signIn(browser, baseUrl, 'emc@harrowby.example', DESKTOP);
    await emc.goto(`${baseUrl}/surveys/${open.id}/emc`);
    await emc.getByRole('heading', { level: 1 }).first().waitFor();
    await emc.getByTestId('flag-card').first().waitFor();
    await shoot(emc, 'emc-flags');

    step('capture form (surveyor, phone)…');
    const surveyor = await signIn(browser, baseUrl, 'surveyor@harrowby.example', PHONE);
    await surveyor.goto(`${baseUrl}/surveys/${open.id}`);
    await surveyor.getByRole('button', { name: /^(Take offline|Download again)$/ }).click();
    await surveyor.getByText('Ready to work offline').waitFor();
    await surveyor.getByRole('link', { name: 'Start capture' }).click();
    const picker = surveyor.getByLabel(/Or choose a station/);
    await picker.waitFor();
    await waitForAttribute(surveyor, '.leaflet-container', 'data-stations-drawn', 0);
    const stations = await picker.locator('option').evaluateAll((options) => options.map((o) => (o as HTMLOptionElement).value).filter(Boolean));
    if (stations.length === 0) throw new Error('the capture screen offers no station to choose');
    await picker.selectOption(stations[0]!);
    const field = surveyor.getByLabel('|B|', { exact: true });
    await field.waitFor();
    // A value typed, not saved: the form shows the station's class and predicted lines as it would in the field.
    await field.fill('1.2');
    await surveyor.getByText(/Type \|B\| to see/).waitFor({ state: 'detached' });
    await field.blur();
    await scrollTo(surveyor, surveyor.getByRole('tablist', { name: 'Capture' }), 8);
    await shoot(surveyor, 'capture-phone');
  } finally {
    await runCleanups(cleanups);
  }
}

main().then(
  () => process.exit(0),
  (error: unknown) => {
    process.stderr.write(`screenshots failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
    process.exit(1);
  },
);
