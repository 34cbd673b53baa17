/**
 * Checks a screen must pass in the real browser: axe-core (an outside reference, WCAG 2.1 A/AA rules)
 * finds no serious or critical violation, and nothing sticks out sideways, in light and hall mode at
 * phone and desktop sizes. Set FRINGEWALK_SCREENSHOT_DIR to also save a screenshot of each.
 */
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { expect } from 'vitest';
import { DESKTOP_VIEWPORT, PHONE_VIEWPORT } from './fixtures';

const shotsDir = process.env.FRINGEWALK_SCREENSHOT_DIR;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const FAILING_IMPACTS = new Set(['serious', 'critical']);

export async function seriousViolations(page: Page) {
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
export async function overflow(page: Page) {
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

/** Every theme × size of the current page; screenshots are named `<prefix>-<name>-<theme>-<size>.png`. */
export async function checkScreen(page: Page, name: string, prefix: string) {
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
      if (shotsDir) await page.screenshot({ path: path.join(shotsDir, `${prefix}-${name}-${theme}-${size}.png`), fullPage: true });
    }
  }
  await page.evaluate(() => {
    document.documentElement.dataset.theme = 'light';
  });
}
