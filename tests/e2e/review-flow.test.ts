/**
 * The reviewer's journey (issue 7, Playwright): the demo reviewer opens the review screen of the open
 * survey and sends one reading back for re-measure; the surveyor syncs, sees the request at the station
 * in capture and takes a new reading there; the reviewer accepts everything, submits and signs off,
 * downloads the readings CSV (checked against PostgreSQL) and opens the report, whose signature block
 * carries the hash stored at sign-off.
 */
import fs from 'node:fs/promises';
import Papa from 'papaparse';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { GENERAL_SAFETY_CAUTIONS } from '../../shared/physics/safety';
import { sql } from '../setup/api-helpers';
import { readDemoIds } from '../setup/sync-fixtures';
import { ConsoleWatcher, DEMO_USERS, DESKTOP_VIEWPORT, login, PHONE_VIEWPORT, SIGNED_OUT_SESSION_CHECK, test, waitForServiceWorkerControl } from './fixtures';

const SURVEY_NAME = '2026 annual fringe-field check';

async function device(browser: Browser, watcher: ConsoleWatcher, viewport: { width: number; height: number }): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport, acceptDownloads: true });
  context.setDefaultTimeout(20_000);
  const page = await context.newPage();
  watcher.attach(page);
  return { context, page };
}

async function syncNowAndWait(page: Page) {
  await expect.poll(() => page.getByTestId('sync-now').isEnabled(), { timeout: 30_000 }).toBe(true);
  await page.getByTestId('sync-now').click();
  await expect.poll(() => page.getByTestId('sync-progress').textContent(), { timeout: 30_000 }).toMatch(/Last synced/);
  await expect.poll(() => page.getByTestId('sync-now').isEnabled(), { timeout: 30_000 }).toBe(true);
}

describe('review, re-measure and sign-off', () => {
  test('a reviewer sends a reading back, the surveyor re-measures it, and the reviewer signs the survey off', async ({ app, browser, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    const ids = await readDemoIds(app.databaseUrl);
    const ada = await device(browser, consoleErrors, PHONE_VIEWPORT);
    const rev = await device(browser, consoleErrors, DESKTOP_VIEWPORT);
    try {
      // The surveyor has the survey on her device.
      await login(ada.page, app.baseUrl, DEMO_USERS.surveyor);
      await ada.page.waitForURL(`${app.baseUrl}/`);
      await ada.page.getByRole('link', { name: SURVEY_NAME }).first().click();
      await ada.page.waitForURL(/\/surveys\/[0-9a-f-]+$/);
      await ada.page.getByTestId('take-offline').click();
      await ada.page.getByText('Ready to work offline').waitFor({ timeout: 30_000 });
      await waitForServiceWorkerControl(ada.page);
      await expect.poll(() => ada.page.getByTestId('sync-progress').textContent(), { timeout: 30_000 }).toMatch(/Last synced/);

      // The reviewer opens the review screen and sends one undecided field reading back.
      await login(rev.page, app.baseUrl, DEMO_USERS.reviewer);
      await rev.page.waitForURL(`${app.baseUrl}/`);
      await rev.page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}`);
      await rev.page.getByTestId('open-review').click();
      await rev.page.waitForURL(/\/review$/);
      await rev.page.getByTestId('review-table').waitFor();
      const total = Number((await sql<{ n: number }>(app.databaseUrl, `SELECT (SELECT count(*) FROM field_readings WHERE survey_id = $1 AND NOT deleted) + (SELECT count(*) FROM sweeps WHERE survey_id = $1 AND NOT deleted) AS n`, [ids.openSurveyId]))[0]!.n);
      await expect.poll(() => rev.page.getByTestId('review-count').textContent()).toContain(`Showing ${total} of ${total}`);
      // Virtualised: far fewer rows in the DOM than readings.
      expect(await rev.page.getByTestId('review-row').count()).toBeLessThan(total);
      await rev.page.getByTestId('filter-decision').selectOption('undecided');
      await rev.page.getByLabel('Kind').selectOption('field_reading');
      // The unit picker changes the values shown (1 mT = 10 G).
      await rev.page.getByTestId('unit-picker').selectOption('G');
      await expect.poll(() => rev.page.getByRole('columnheader', { name: /Value \(G\)/ }).count()).toBe(1);
      const target = rev.page.locator(`[data-testid="review-row"][data-station-label]:not([data-station-label=""])`).first();
      await target.waitFor();
      const readingId = (await target.getAttribute('data-reading-id'))!;
      const stationLabel = (await target.getAttribute('data-station-label'))!;
      const levelName = (await target.getAttribute('data-level-name'))!;
      await target.getByTestId('select-row').check();
      await rev.page.getByTestId('remeasure-selected').click();
      // The note is required.
      await rev.page.getByTestId('confirm-decision').click();
      await rev.page.getByText('Say what to re-measure').waitFor();
      const note = 'Probe was against the door frame; repeat 30 cm into the room.';
      await rev.page.getByTestId('decision-note').fill(note);
      await rev.page.getByTestId('confirm-decision').click();
      await expect
        .poll(async () => (await sql<{ verdict: string }>(app.databaseUrl, 'SELECT verdict FROM decisions WHERE field_reading_id = $1 AND NOT deleted', [readingId]))[0]?.verdict)
        .toBe('remeasure');

      // The surveyor syncs and finds the request at the station in capture, then takes a new reading there.
      await syncNowAndWait(ada.page);
      await ada.page.getByTestId('start-capture').click();
      await ada.page.waitForURL(/\/capture$/);
      await ada.page.locator('.leaflet-container').waitFor();
      await ada.page.getByRole('group', { name: 'Level' }).getByRole('button', { name: levelName, exact: true }).click();
      const picker = ada.page.getByLabel(/Or choose a station/);
      const option = picker.locator('option', { hasText: new RegExp(`^${stationLabel.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\b.*re-measure requested`) });
      await picker.selectOption({ label: (await option.first().textContent())! });
      await expect.poll(() => ada.page.getByTestId('remeasure-request').first().textContent()).toContain(note);
      const field = ada.page.getByLabel('|B|', { exact: true });
      await field.fill('0.4321');
      await ada.page.getByRole('button', { name: 'Save reading' }).click();
      await expect.poll(() => field.inputValue()).toBe('');
      await syncNowAndWait(ada.page);
      const [[stationRow], [newReading]] = await Promise.all([
        sql<{ station_id: string }>(app.databaseUrl, 'SELECT station_id FROM field_readings WHERE id = $1', [readingId]),
        sql<{ id: string; station_id: string }>(app.databaseUrl, `SELECT id, station_id FROM field_readings WHERE survey_id = $1 AND magnitude_t = 0.4321e-3`, [ids.openSurveyId]),
      ]);
      expect(newReading?.station_id).toBe(stationRow!.station_id);

      // The reviewer accepts everything, submits and signs off.
      await rev.page.reload();
      await rev.page.getByTestId('review-table').waitFor();
      await expect.poll(() => rev.page.getByTestId('review-count').textContent()).toContain(`Showing ${total + 1} of ${total + 1}`);
      await rev.page.getByTestId('select-all').check();
      await rev.page.getByTestId('accept-selected').click();
      await expect.poll(() => rev.page.getByTestId('review-count').textContent(), { timeout: 30_000 }).not.toContain('selected');
      await expect.poll(async () => Number((await sql<{ n: number }>(app.databaseUrl, `SELECT count(*)::int AS n FROM decisions WHERE survey_id = $1 AND verdict <> 'accepted' AND NOT deleted`, [ids.openSurveyId]))[0]!.n)).toBe(0);
      await rev.page.getByTestId('submit-survey').click();
      await expect.poll(() => rev.page.getByTestId('survey-state').textContent()).toBe('Submitted for review');
      await expect.poll(() => rev.page.getByTestId('sign-off').isEnabled()).toBe(true);
      expect(await rev.page.getByTestId('sign-off-blockers').count()).toBe(0);
      await rev.page.getByTestId('sign-off').click();
      await expect.poll(async () => `${await rev.page.getByTestId('survey-state').textContent()} | ${await rev.page.getByTestId('sign-off-panel').textContent()}`).toMatch(/^Signed off \|/);
      const [survey] = await sql<{ state: string; report_sha256: string; signed_off_by_user_id: string }>(app.databaseUrl, 'SELECT state, report_sha256, signed_off_by_user_id FROM surveys WHERE id = $1', [ids.openSurveyId]);
      expect(survey).toMatchObject({ state: 'signed_off', signed_off_by_user_id: ids.users.reviewer });
      expect(await rev.page.getByTestId('report-sha256').textContent()).toBe(survey!.report_sha256);

      // The CSV: one row per reading, units in the header, every verdict accepted, the new reading in it.
      const [download] = await Promise.all([rev.page.waitForEvent('download'), rev.page.getByTestId('download-csv').click()]);
      const text = await fs.readFile((await download.path())!, 'utf8');
      const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
      expect(parsed.errors).toEqual([]);
      expect(parsed.meta.fields).toEqual(expect.arrayContaining(['field_mT', 'x_m', 'y_m', 'measured_at', 'surveyor_email', 'verdict']));
      const readingCount = Number((await sql<{ n: number }>(app.databaseUrl, 'SELECT count(*)::int AS n FROM field_readings WHERE survey_id = $1 AND NOT deleted', [ids.openSurveyId]))[0]!.n);
      expect(parsed.data).toHaveLength(readingCount);
      expect(parsed.data.every((r) => r.verdict === 'accepted')).toBe(true);
      expect(parsed.data.find((r) => r.reading_id === newReading!.id)).toMatchObject({ field_mT: '0.4321', surveyor_email: DEMO_USERS.surveyor, station_label: stationLabel });

      // The report: the signature block carries the stored hash, and the cautions are there.
      await rev.page.getByTestId('open-report').click();
      await rev.page.waitForURL(/\/report$/);
      await rev.page.getByTestId('survey-report').waitFor();
      await expect.poll(() => rev.page.getByTestId('signature-sha256').textContent()).toBe(survey!.report_sha256);
      expect(await rev.page.getByTestId('signature-check').textContent()).toContain('hashes to the signed value');
      const [reviewer] = await sql<{ name: string }>(app.databaseUrl, 'SELECT name FROM users WHERE id = $1', [ids.users.reviewer]);
      expect(await rev.page.getByTestId('signature-block').textContent()).toContain(reviewer!.name);
      expect(await rev.page.getByTestId('report-readings').locator('tbody tr').count()).toBe(readingCount);
      expect(await rev.page.getByTestId('report-cautions').textContent()).toContain(GENERAL_SAFETY_CAUTIONS[1]!);
      // On paper: the app's header and the print button are gone, the report and its signature stay.
      await rev.page.emulateMedia({ media: 'print' });
      expect(await rev.page.getByTestId('print-report').isVisible()).toBe(false);
      expect(await rev.page.locator('body > div header, #root header').first().isVisible()).toBe(false);
      expect(await rev.page.getByTestId('report-title').isVisible()).toBe(true);
      expect(await rev.page.getByTestId('signature-block').isVisible()).toBe(true);
    } finally {
      await ada.context.close();
      await rev.context.close();
    }
  });
});
