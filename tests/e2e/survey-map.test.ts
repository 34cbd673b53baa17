/**
 * The survey map in the real browser, as the demo reviewer: open the open 2026 survey's map from the
 * survey page, see its isogauss lines (labelled) and the legend in the chosen unit, switch layers, and
 * compare with the signed-off 2025 survey (both lines on one map, the table of distances moved).
 * axe-core (an outside reference, WCAG 2.1 A/AA rules) finds no serious or critical violation on it.
 * Set FRINGEWALK_SCREENSHOT_DIR to also save screenshots (survey-map-*.png).
 */
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import { describe, expect } from 'vitest';
import { sql } from '../setup/api-helpers';
import { readDemoIds } from '../setup/sync-fixtures';
import { DEMO_USERS, DESKTOP_VIEWPORT, login, SIGNED_OUT_SESSION_CHECK, test } from './fixtures';

describe('survey map', () => {
  test('the demo reviewer sees the contours and legend, switches layers and compares with 2025', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await page.setViewportSize(DESKTOP_VIEWPORT);
    const ids = await readDemoIds(app.databaseUrl);
    const [survey2025] = await sql<{ name: string }>(app.databaseUrl, 'SELECT name FROM surveys WHERE id = $1', [ids.signedOffSurveyId]);

    await login(page, app.baseUrl, DEMO_USERS.reviewer);
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    await page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}`);
    await page.getByTestId('open-survey-map').click();
    await page.getByRole('heading', { name: /^Map of / }).waitFor({ timeout: 30_000 });

    // the lines are drawn (the canvas says how many) and labelled in the chosen unit
    const canvas = page.locator('[data-testid="survey-map"] .leaflet-container');
    await expect.poll(async () => Number((await canvas.getAttribute('data-contours-drawn')) ?? '0'), { timeout: 20_000 }).toBeGreaterThan(0);
    await expect.poll(async () => Number((await canvas.getAttribute('data-stations-drawn')) ?? '0')).toBeGreaterThan(0);
    await page.getByTestId('unit-select').selectOption('mT');
    const labels = page.locator('.leaflet-tooltip', { hasText: / mT$/ });
    await expect.poll(() => labels.count()).toBeGreaterThan(0);
    const shotsDir = process.env.FRINGEWALK_SCREENSHOT_DIR;
    if (shotsDir) await page.screenshot({ path: path.join(shotsDir, 'survey-map-lines.png'), fullPage: true });

    const legend = page.getByTestId('map-legend');
    await expect.poll(() => legend.isVisible()).toBe(true);
    expect(await legend.textContent()).toMatch(/0\.9 mT/); // the edition-4 B0 line of the demo zone set
    expect(await page.getByTestId('map-cautions').textContent()).toMatch(/MR safety officer/);

    // switch layers: rooms on, lines off (the labels go), lines back on; the dipole fit shows its table
    await page.getByTestId('layer-rooms').check();
    await page.getByTestId('layer-contours').uncheck();
    await expect.poll(() => labels.count()).toBe(0);
    await expect.poll(async () => canvas.getAttribute('data-contours-drawn')).toBe('0');
    await page.getByTestId('layer-contours').check();
    await expect.poll(() => labels.count()).toBeGreaterThan(0);
    await page.getByTestId('layer-dipole').check();
    await page.getByTestId('dipole-table').waitFor();

    // compare with the signed-off 2025 survey of the same site
    await page.getByTestId('compare-select').selectOption({ label: survey2025!.name });
    const table = page.getByTestId('compare-table');
    await table.waitFor({ timeout: 30_000 });
    expect(await table.locator('tbody tr').count()).toBeGreaterThan(0);
    expect(await legend.textContent()).toContain(survey2025!.name);
    if (shotsDir) await page.screenshot({ path: path.join(shotsDir, 'survey-map-compare.png'), fullPage: true });

    const axe = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
    const serious = axe.violations
      .filter((v) => v.impact === 'serious' || v.impact === 'critical')
      .flatMap((v) => v.nodes.map((n) => `${v.id} (${v.impact}) ${n.target.join(' ')}: ${n.failureSummary ?? ''}`));
    expect(serious).toEqual([]);
  });
});
