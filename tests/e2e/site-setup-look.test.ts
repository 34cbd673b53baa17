/**
 * The site-setup screens in the real browser, on the demo site: axe-core (an outside reference,
 * WCAG 2.1 A/AA rules) finds no serious or critical violation, and no screen is wider than the
 * viewport, on the sites list, a site, a survey's setup, a level's plan (calibration and rooms) and
 * the instruments, in light and hall mode at phone and desktop sizes.
 * Set FRINGEWALK_SCREENSHOT_DIR to also save a screenshot of each (site-look-*.png).
 */
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { DEMO_ORGANISATION, DEMO_USERS, DESKTOP_VIEWPORT, login, PHONE_VIEWPORT, test } from './fixtures';

const shotsDir = process.env.FRINGEWALK_SCREENSHOT_DIR;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const FAILING_IMPACTS = new Set(['serious', 'critical']);

async function seriousViolations(page: Page) {
  const result = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  return result.violations
    .filter((v) => FAILING_IMPACTS.has(v.impact ?? ''))
    .flatMap((v) => v.nodes.map((n) => `${v.id} (${v.impact}) ${n.target.join(' ')}: ${n.failureSummary ?? ''}`));
}

/**
 * Elements that stick out past the right edge of the viewport. The page's width is Chromium's own
 * layout metrics (what a full-page screenshot uses), which also counts absolutely positioned
 * children that escape a sideways-scrolling table; scrollWidth alone misses those.
 */
async function overflow(page: Page) {
  const cdp = await page.context().newCDPSession(page);
  try {
    const metrics = (await cdp.send('Page.getLayoutMetrics')) as { cssContentSize: { width: number }; cssLayoutViewport: { clientWidth: number } };
    const width = metrics.cssLayoutViewport.clientWidth;
    if (metrics.cssContentSize.width <= width) return [];
    const culprits = await page.evaluate((viewportWidth) => {
      const escapes = (el: Element) => {
        const scroller = el.closest('.overflow-x-auto');
        return !scroller || getComputedStyle(el).position === 'absolute';
      };
      return [...document.querySelectorAll('body *')]
        .filter((el) => el.getBoundingClientRect().right > viewportWidth + 1 && escapes(el))
        .slice(0, 5)
        .map((el) => `${el.tagName.toLowerCase()}.${[...el.classList].join('.')} right=${Math.round(el.getBoundingClientRect().right)}`);
    }, width);
    return [`page is ${Math.round(metrics.cssContentSize.width)} px wide in a ${width} px viewport`, ...culprits];
  } finally {
    await cdp.detach();
  }
}

async function checkScreen(page: Page, name: string) {
  for (const theme of ['light', 'hall'] as const) {
    await page.evaluate((t) => {
      document.documentElement.dataset.theme = t;
    }, theme);
    for (const [size, viewport] of [
      ['phone', PHONE_VIEWPORT],
      ['desktop', DESKTOP_VIEWPORT],
    ] as const) {
      await page.setViewportSize(viewport);
      await page.waitForTimeout(150); // let Leaflet refit after the resize
      const where = `${name}, ${theme}, ${size}`;
      expect.soft(await seriousViolations(page), `axe on ${where}`).toEqual([]);
      expect.soft(await overflow(page), `sideways overflow on ${where}`).toEqual([]);
      if (shotsDir) await page.screenshot({ path: path.join(shotsDir, `site-look-${name}-${theme}-${size}.png`), fullPage: true });
    }
  }
  await page.evaluate(() => {
    document.documentElement.dataset.theme = 'light';
  });
}

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
