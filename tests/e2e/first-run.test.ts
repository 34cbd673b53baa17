/**
 * The first run, in the real browser with the demo seed: each demo role signs in and finds its own
 * guide on Home (a panel in the page, not an overlay), follows its first step into the real screen,
 * comes back, puts the guide away, and after a reload it stays away until “Show the guide”.
 * Then axe and the sideways check over Home with the guide open, in both themes at both sizes.
 */
import { describe, expect } from 'vitest';
import type { Page } from 'playwright-core';
import { ROLES, type Role } from '@shared/schemas/common';
import { DEMO_USERS, DESKTOP_VIEWPORT, login, SIGNED_OUT_SESSION_CHECK, test } from './fixtures';
import { checkScreen } from './look-checks';

/** What each role's guide is headed (src/features/first-run/lib/guide-content.ts). */
const GUIDE_TITLES: Record<Role, RegExp> = {
  admin: /^You run the organisation$/,
  reviewer: /^You review and sign off surveys$/,
  emc: /^You look after emission \(EMC\)$/,
  surveyor: /^You walk the building and measure$/,
  viewer: /^You read the results$/,
};

async function signInHome(page: Page, baseUrl: string, role: Role) {
  await login(page, baseUrl, DEMO_USERS[role]);
  await page.waitForURL(`${baseUrl}/`);
  await page.getByTestId('survey-card').first().waitFor();
}

describe('first run', () => {
  for (const role of ROLES) {
    test(`the ${role} sees their own guide, follows its first step, and a dismissed guide stays away after a reload`, async ({ app, page, consoleErrors }) => {
      consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
      await page.setViewportSize(DESKTOP_VIEWPORT);
      await signInHome(page, app.baseUrl, role);

      const guide = page.getByTestId('first-run-guide');
      await guide.waitFor();
      expect(await guide.getAttribute('data-role')).toBe(role);
      await guide.getByRole('heading', { level: 2, name: GUIDE_TITLES[role] }).waitFor();
      // A panel in the page: the survey list beside it stays reachable.
      expect(await guide.evaluate((el) => getComputedStyle(el).position)).toBe('static');
      expect(await page.getByRole('dialog').count()).toBe(0);

      // The first step leads into a real screen of the app.
      const first = guide.getByTestId('guide-step-link').first();
      const href = await first.getAttribute('href');
      expect(href).toMatch(/^\/(sites|instruments|watch-bands|surveys\/[0-9a-f-]+(\/[a-z-]+)?)$/);
      await first.click();
      await expect.poll(() => new URL(page.url()).pathname).toBe(href);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      expect(await page.getByRole('heading', { name: /not found|not available|went wrong|server had a problem|cannot reach/i }).count()).toBe(0);

      // Back home, put the guide away.
      await page.getByRole('navigation').getByRole('link', { name: 'Home', exact: true }).first().click();
      await guide.waitFor();
      await guide.getByRole('button', { name: 'Hide the guide' }).click();
      const show = page.getByRole('button', { name: 'Show the guide' });
      await show.waitFor();
      expect(await guide.count()).toBe(0);
      // Keyboard users land on the button that brings it back.
      expect(await show.evaluate((el) => el === document.activeElement)).toBe(true);

      await page.reload();
      await page.getByTestId('survey-card').first().waitFor();
      await show.waitFor();
      expect(await guide.count()).toBe(0);

      // And it comes back on request.
      await show.click();
      await guide.getByRole('heading', { level: 2, name: GUIDE_TITLES[role] }).waitFor();
    });
  }

  test('Home with the guide open passes axe and the sideways check in both themes at both sizes', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await signInHome(page, app.baseUrl, 'surveyor');
    // The surveyor's guide is the fullest: steps, the implant and projectile cautions.
    await page.getByTestId('guide-cautions').waitFor();
    await checkScreen(page, 'home-guide', 'first-run');
  });
});
