/**
 * The review table's recycled row boxes (issue 7; src/features/review/components/review-table.tsx): a
 * row scrolled out hands its DOM box to the row scrolled in. Checked in Chromium on the demo survey:
 * after a scroll the rows in the DOM show their own readings (against PostgreSQL), and a box that held
 * the keyboard focus when it was handed over gives the focus to the scrolling area, so a key press can
 * never tick a reading the reviewer did not choose.
 */
import { describe, expect } from 'vitest';
import { sql } from '../setup/api-helpers';
import { readDemoIds } from '../setup/sync-fixtures';
import { DEMO_USERS, DESKTOP_VIEWPORT, login, test } from './fixtures';

describe('review table rows', () => {
  test('scrolled rows show their own readings, and the focus never moves to another reading', async ({ app, browser }) => {
    const ids = await readDemoIds(app.databaseUrl);
    const context = await browser.newContext({ viewport: DESKTOP_VIEWPORT });
    context.setDefaultTimeout(20_000);
    try {
      const page = await context.newPage();
      await login(page, app.baseUrl, DEMO_USERS.reviewer);
      await page.waitForURL(`${app.baseUrl}/`);
      await page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}/review`);
      await page.getByTestId('review-table').waitFor();
      const rows = page.getByTestId('review-row');
      await rows.first().waitFor();
      const inDom = await rows.count();
      const total = Number(/of (\d+)/.exec((await page.getByTestId('review-count').textContent()) ?? '')?.[1] ?? 0);
      // Enough readings that scrolling to the end hands every box to another row.
      expect(total).toBeGreaterThan(2 * inDom);

      // Tick the first row by keyboard and keep the focus on its box.
      const firstId = await rows.first().getAttribute('data-reading-id');
      const box = page.locator(`[data-testid="review-row"][data-reading-id="${firstId}"] [data-testid="select-row"]`);
      await box.focus();
      await page.keyboard.press('Space');
      await expect.poll(() => page.getByTestId('review-count').textContent()).toContain('1 selected');

      // Scroll to the end: the focused box now belongs to a later reading, so the focus is the table's.
      await page.getByTestId('review-table-scroll').evaluate((el) => (el.scrollTop = el.scrollHeight));
      await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('review-table-scroll');
      await expect.poll(() => page.locator(`[data-testid="review-row"][data-reading-id="${firstId}"]`).count()).toBe(0);
      await page.keyboard.press('Space');
      await expect.poll(() => page.getByTestId('review-count').textContent()).toContain('1 selected');
      await expect.poll(() => page.locator('[data-testid="review-row"][aria-selected="true"]').count()).toBe(0);

      // The table is sorted by time: the last reading taken is drawn, with its own station and time.
      const [latest] = await sql<{ id: string; label: string | null }>(
        app.databaseUrl,
        `SELECT r.id, s.label FROM (
           SELECT id, station_id, measured_at FROM field_readings WHERE survey_id = $1 AND NOT deleted
           UNION ALL SELECT id, station_id, measured_at FROM sweeps WHERE survey_id = $1 AND NOT deleted) r
         JOIN stations s ON s.id = r.station_id ORDER BY r.measured_at DESC, r.id DESC LIMIT 1`,
        [ids.openSurveyId],
      );
      const last = page.locator(`[data-testid="review-row"][data-reading-id="${latest!.id}"]`);
      await expect.poll(() => last.count()).toBe(1);
      if (latest!.label) expect(await last.getByRole('cell').nth(1).textContent()).toContain(latest!.label);
      for (const row of await rows.all()) {
        const label = await row.getAttribute('data-station-label');
        if (label) expect(await row.getByRole('cell').nth(1).textContent()).toContain(label);
      }

      // Back at the top, the ticked reading is the first one again, and still the only one ticked.
      await page.getByTestId('review-table-scroll').evaluate((el) => (el.scrollTop = 0));
      await expect.poll(() => page.locator(`[data-testid="review-row"][data-reading-id="${firstId}"]`).getAttribute('aria-selected')).toBe('true');
      await expect.poll(() => page.locator('[data-testid="review-row"][aria-selected="true"]').count()).toBe(1);
    } finally {
      await context.close();
    }
  });
});
