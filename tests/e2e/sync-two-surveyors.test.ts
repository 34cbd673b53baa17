/**
 * Two surveyors, two phones (two browser contexts in Debian's Chromium), one open survey: both take it
 * offline, both lose the network, each logs readings through the capture screen, both come back online
 * and press "Sync now". Each then finds the other's station and reading on their own plan, and the
 * server holds the union of both walks, every reading exactly once (checked in PostgreSQL itself).
 */
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { sql } from '../setup/api-helpers';
import { readDemoIds } from '../setup/sync-fixtures';
import { ConsoleWatcher, DEMO_PASSWORD, goOffline, login, PHONE_VIEWPORT, SIGNED_OUT_SESSION_CHECK, test, waitForPersistedQueries, waitForServiceWorkerControl } from './fixtures';

const SURVEY_NAME = '2026 annual fringe-field check';
const OFFLINE_NOISE = {
  text: /Failed to load resource|net::ERR_INTERNET_DISCONNECTED/,
  why: 'offline, the app and its sync ask the server for things and are refused by the network',
};

/** A signed-in session for API setup (the reviewer sets the survey's team, as on the survey screen). */
async function apiSession(baseUrl: string, email: string) {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: baseUrl }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  expect(res.status).toBe(200);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('fw.sid='))!.split(';')[0]!;
  return (path: string, init: RequestInit) => fetch(`${baseUrl}${path}`, { ...init, headers: { 'Content-Type': 'application/json', Origin: baseUrl, Cookie: cookie, ...(init.headers ?? {}) } });
}

async function tapPlan(page: Page, fx: number, fy: number) {
  const box = await page.locator('.leaflet-container').boundingBox();
  if (!box) throw new Error('no plan on screen');
  await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
}

async function phone(browser: Browser, watcher: ConsoleWatcher): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: PHONE_VIEWPORT });
  context.setDefaultTimeout(15_000);
  const page = await context.newPage();
  watcher.attach(page);
  return { context, page };
}

/** Sign in, take the open survey offline, cut the network, open the capture screen from the device. */
async function goOfflineWithSurvey(baseUrl: string, email: string, context: BrowserContext, page: Page) {
  await login(page, baseUrl, email);
  await page.waitForURL(`${baseUrl}/`);
  await page.getByRole('link', { name: SURVEY_NAME }).first().click();
  await page.waitForURL(/\/surveys\/[0-9a-f-]+$/);
  await page.getByTestId('take-offline').click();
  await page.getByText('Ready to work offline').waitFor({ timeout: 30_000 });
  await waitForServiceWorkerControl(page);
  await waitForPersistedQueries(page, [['auth', 'session']]);
  // The first sync after taking the survey offline has finished (it starts by itself).
  await expect.poll(() => page.getByTestId('sync-progress').textContent(), { timeout: 30_000 }).toMatch(/Last synced/);
  await goOffline(context);
  await page.reload();
  await page.getByTestId('start-capture').click();
  await page.waitForURL(/\/capture$/);
  await page.locator('.leaflet-container').waitFor();
}

/** Place a new station at the first free spot of `spots` and log the values there; returns the spot used. */
async function logAtNewStation(page: Page, spots: Array<[number, number]>, values: string[]): Promise<[number, number]> {
  for (const spot of spots) {
    await tapPlan(page, ...spot);
    const panel = page.getByTestId('station-panel');
    await panel.waitFor();
    if (!/New station/.test((await panel.textContent()) ?? '')) continue;
    const field = page.getByLabel('|B|', { exact: true });
    for (const value of values) {
      await field.fill(value);
      await page.getByRole('button', { name: 'Save reading' }).click();
      await expect.poll(() => field.inputValue()).toBe('');
      // Later readings go to the station the first one created (it stays selected).
    }
    return spot;
  }
  throw new Error('no free spot on the plan for a new station');
}

async function syncNowAndWait(page: Page) {
  await page.getByTestId('sync-now').click();
  await expect.poll(() => page.getByTestId('sync-progress').textContent(), { timeout: 30_000 }).toMatch(/Last synced/);
  await expect.poll(() => page.getByTestId('sync-now').isEnabled()).toBe(true);
}

describe('two surveyors syncing one survey', () => {
  test('both log readings offline, both sync, each sees the other’s, and the server holds the union once', async ({ app, browser, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK, OFFLINE_NOISE);
    const ids = await readDemoIds(app.databaseUrl);
    const startedAt = new Date();
    // The seed assigns only the first surveyor to the open survey: the reviewer adds the second.
    const reviewer = await apiSession(app.baseUrl, 'reviewer@harrowby.example');
    const team = await reviewer(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/assignments`, {
      method: 'PUT',
      body: JSON.stringify({ surveyors: [ids.users.surveyor, ids.users.surveyor2], reviewers: [ids.users.reviewer] }),
    });
    expect(team.status).toBe(200);

    const ada = await phone(browser, consoleErrors);
    const bram = await phone(browser, consoleErrors);
    try {
      await goOfflineWithSurvey(app.baseUrl, 'surveyor@harrowby.example', ada.context, ada.page);
      await goOfflineWithSurvey(app.baseUrl, 'surveyor2@harrowby.example', bram.context, bram.page);

      const adaSpot = await logAtNewStation(ada.page, [[0.3, 0.3], [0.25, 0.4], [0.4, 0.25]], ['0.61', '0.62', '0.63']);
      const bramSpot = await logAtNewStation(bram.page, [[0.7, 0.6], [0.65, 0.7], [0.75, 0.5]], ['0.71', '0.72']);
      await expect.poll(() => ada.page.getByTestId('pending-sync').textContent()).toContain('3 readings');
      await expect.poll(() => bram.page.getByTestId('pending-sync').textContent()).toContain('2 readings');

      // Back online: each presses Sync now (the first to sync cannot see the second's yet, so Ada syncs again).
      await ada.context.setOffline(false);
      await bram.context.setOffline(false);
      await syncNowAndWait(ada.page);
      await syncNowAndWait(bram.page);
      await syncNowAndWait(ada.page);
      for (const p of [ada.page, bram.page]) {
        await expect.poll(() => p.getByTestId('pending-sync').count()).toBe(0);
        expect(await p.getByTestId('sync-issues').count()).toBe(0);
      }

      // Each finds the other's station on their own plan, with the other's latest reading.
      await ada.page.getByRole('button', { name: 'Clear' }).click();
      await tapPlan(ada.page, ...bramSpot);
      await expect.poll(() => ada.page.getByTestId('station-panel').textContent()).toMatch(/Latest \|B\|: 0\.72/);
      await bram.page.getByRole('button', { name: 'Clear' }).click();
      await tapPlan(bram.page, ...adaSpot);
      await expect.poll(() => bram.page.getByTestId('station-panel').textContent()).toMatch(/Latest \|B\|: 0\.63/);

      // Ada's walk list marks each of her readings synced.
      await ada.page.getByRole('tab', { name: /Walk \(3\)/ }).click();
      await expect.poll(() => ada.page.locator('[data-testid="walk-entry"] [data-testid="record-sync-state"][data-state="synced"]').count()).toBe(3);

      // The server: the union, each reading once.
      const rows = await sql<{ surveyor_user_id: string; magnitude_t: number; n: number }>(
        app.databaseUrl,
        `SELECT surveyor_user_id, magnitude_t, count(*)::int AS n FROM field_readings
          WHERE survey_id = $1 AND created_at >= $2 AND NOT deleted GROUP BY 1, 2 ORDER BY 2`,
        [ids.openSurveyId, startedAt],
      );
      expect(rows.map((r) => [r.surveyor_user_id, Number(r.magnitude_t.toPrecision(6)), r.n])).toEqual([
        [ids.users.surveyor, 0.61e-3, 1],
        [ids.users.surveyor, 0.62e-3, 1],
        [ids.users.surveyor, 0.63e-3, 1],
        [ids.users.surveyor2, 0.71e-3, 1],
        [ids.users.surveyor2, 0.72e-3, 1],
      ]);
      const walks = await sql<{ surveyor_user_id: string }>(app.databaseUrl, `SELECT surveyor_user_id FROM walks WHERE survey_id = $1 AND created_at >= $2 ORDER BY 1`, [ids.openSurveyId, startedAt]);
      expect(walks.map((w) => w.surveyor_user_id).sort()).toEqual([ids.users.surveyor, ids.users.surveyor2].sort());
    } finally {
      await ada.context.close();
      await bram.context.close();
    }
  });
});
