/**
 * The capture screen on a phone (390 × 844) and a desktop, in light and hall mode: nothing wider than
 * the screen, every control at least 48 px tall (gloved hands), the feedback readable. Set
 * FRINGEWALK_SHOTS_DIR to keep screenshots of each.
 */
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { DESKTOP_VIEWPORT, DEMO_USERS, login, PHONE_VIEWPORT, test } from './fixtures';

const SHOTS_DIR = process.env.FRINGEWALK_SHOTS_DIR;

async function checkLayout(page: Page, label: string) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow, `${label}: page wider than the screen`).toBeLessThanOrEqual(0);
  const small = await page.evaluate(() =>
    [...document.querySelectorAll<HTMLElement>('main button, main select, main input:not([type=checkbox]):not([type=radio]), main [role=tab]')]
      .filter((el) => el.offsetParent !== null && !el.closest('.leaflet-control-container'))
      .map((el) => ({ what: el.getAttribute('aria-label') ?? el.textContent?.trim() ?? el.tagName, h: el.getBoundingClientRect().height }))
      .filter((c) => c.h < 47.5),
  );
  expect(small, `${label}: controls under 48 px`).toEqual([]);
  if (SHOTS_DIR) await page.screenshot({ path: path.join(SHOTS_DIR, `capture-${label}.png`), fullPage: true });
}

describe('capture screen look', () => {
  test('fits a phone and a desktop in both themes with 48 px targets', async ({ app, page }) => {
    await login(page, app.baseUrl, DEMO_USERS.surveyor);
    await page.waitForURL(`${app.baseUrl}/`);
    await page.getByRole('link', { name: '2026 annual fringe-field check' }).first().click();
    await page.getByTestId('take-offline').click();
    await page.getByText('Ready to work offline').waitFor({ timeout: 30_000 });
    await page.getByTestId('start-capture').click();
    // The demo reviewer asked for a re-measure at a ground-floor station: its badge is on the plan and in the picker.
    await page.getByRole('button', { name: /^Ground/ }).click();
    await expect.poll(() => page.locator('.leaflet-marker-pane [aria-label="Re-measure requested"]').count()).toBeGreaterThanOrEqual(1);
    const picker = page.getByLabel(/Or choose a station/);
    const flagged = (await picker.locator('option').allTextContents()).find((o) => o.includes('re-measure requested'));
    expect(flagged).toBeDefined();
    await picker.selectOption({ label: flagged! });
    await page.getByTestId('remeasure-request').first().waitFor();
    await page.getByRole('button', { name: /Level 1/ }).click();
    await expect.poll(() => page.locator('.leaflet-container').getAttribute('data-stations-drawn')).not.toBeNull();
    const box = (await page.locator('.leaflet-container').boundingBox())!;
    await page.mouse.click(box.x + box.width * 0.5, box.y + box.height * 0.9);
    await page.getByLabel('|B|', { exact: true }).fill('87.5');
    await page.getByTestId('band-hits').waitFor();

    await page.setViewportSize(PHONE_VIEWPORT);
    await checkLayout(page, 'phone-light');
    await page.getByRole('button', { name: 'Hall mode' }).click();
    await checkLayout(page, 'phone-hall');
    await page.setViewportSize(DESKTOP_VIEWPORT);
    await checkLayout(page, 'desktop-hall');
    await page.getByRole('button', { name: 'Hall mode' }).click();
    await checkLayout(page, 'desktop-light');
  });
});
