/**
 * The site-setup screens in the real browser, on the demo site: axe-core (an outside reference,
 * WCAG 2.1 A/AA rules) finds no serious or critical violation, and no screen is wider than the
 * viewport, on the sites list, a site, a survey's setup, a level's plan (calibration and rooms) and
 * the instruments, in light and hall mode at phone and desktop sizes.
 * Set FRINGEWALK_SCREENSHOT_DIR to also save a screenshot of each (site-look-*.png).
 */
import type { Page } from 'playwright-core';
import { describe } from 'vitest';
import { DEMO_ORGANISATION, DEMO_USERS, DESKTOP_VIEWPORT, login, test } from './fixtures';
import { checkScreen as checkLook } from './look-checks';

const checkScreen = (page: Page, name: string) => checkLook(page, name, 'site-look');

async function waitForPlan(page: Page) {
  await page.locator('.leaflet-image-layer').first().waitFor();
  await page.waitForFunction(() => {
    const img = document.querySelector<HTMLImageElement>('img.leaflet-image-layer');
    return Boolean(img?.complete && img.naturalWidth > 0);
  });
}

describe('site setup look', () => {
  test('sites, a site, a survey setup, a level plan and the instruments pass axe (no serious or critical violation) in both themes at both sizes', async ({ app, page }) => {
    await page.setViewportSize(DESKTOP_VIEWPORT);
    await login(page, app.baseUrl, DEMO_USERS.admin);
    await page.getByRole('link', { name: 'Site setup' }).click();
    await page.getByRole('table', { name: 'Sites' }).waitFor();
    await checkScreen(page, 'list');

    await page.getByRole('link', { name: DEMO_ORGANISATION }).click();
    await page.getByRole('heading', { level: 1, name: DEMO_ORGANISATION }).waitFor();
    await page.getByTestId('audit-entry').first().or(page.getByText('No changes recorded yet.')).waitFor();
    await checkScreen(page, 'site');

    // A demo survey's setup (team and settings), then back to the site.
    await page.getByRole('list', { name: 'Surveys on this site' }).getByRole('link').first().click();
    await page.getByRole('heading', { name: 'Team', level: 2 }).waitFor();
    await checkScreen(page, 'survey');
    await page.getByRole('link', { name: '← Back to the site' }).click();

    // A demo level that has a calibrated plan.
    const calibrated = page.getByTestId('level-card').filter({ hasText: 'Plan calibrated' }).first();
    await calibrated.getByRole('link', { name: /^Open .* plan$/ }).click();
    await waitForPlan(page);
    await page.getByTestId('calibration-summary').waitFor();
    await checkScreen(page, 'level-calibrate');

    await page.getByRole('tab', { name: 'Rooms' }).click();
    await page.getByRole('heading', { name: 'Rooms on this level' }).waitFor();
    await waitForPlan(page);
    await checkScreen(page, 'level-rooms');

    await page.getByRole('link', { name: 'Instruments' }).click();
    await page.getByRole('table', { name: 'Instruments' }).waitFor();
    await page.getByTestId('overdue-badge').first().waitFor();
    await checkScreen(page, 'instruments');
  }, 180_000);
});
