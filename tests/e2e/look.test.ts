/**
 * The look, checked in the real browser: WCAG AA colour contrast by axe-core (an outside reference)
 * in light and hall mode, at phone and desktop sizes, and 48 px touch targets for gloved hands.
 * Set FRINGEWALK_SCREENSHOT_DIR to also save a screenshot of each screen.
 */
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { DESKTOP_VIEWPORT, DEMO_USERS, login, PHONE_VIEWPORT, SIGNED_OUT_SESSION_CHECK, test } from './fixtures';

const shotsDir = process.env.FRINGEWALK_SCREENSHOT_DIR;
const MIN_TARGET_PX = 48;

async function contrastViolations(page: Page) {
  const result = await new AxeBuilder({ page }).withRules(['color-contrast']).analyze();
  return result.violations.flatMap((v) => v.nodes.map((n) => `${n.target.join(' ')}: ${n.failureSummary ?? ''}`));
}

/** Buttons, fields and navigation links smaller than a gloved finger (links inside prose excluded). */
async function smallTargets(page: Page) {
  return page.$$eval('button, input, select, summary, nav a, a.min-h-touch', (elements, min) =>
    elements
      .filter((el) => (el as HTMLElement).offsetParent !== null)
      .map((el) => ({ el, box: el.getBoundingClientRect() }))
      .filter(({ box }) => box.height < min || box.width < min)
      .map(({ el, box }) => `${el.tagName.toLowerCase()} "${(el.textContent ?? '').trim().slice(0, 30)}" ${Math.round(box.width)}×${Math.round(box.height)}`),
  MIN_TARGET_PX);
}

async function checkScreen(page: Page, name: string) {
  for (const [size, viewport] of [
    ['phone', PHONE_VIEWPORT],
    ['desktop', DESKTOP_VIEWPORT],
  ] as const) {
    await page.setViewportSize(viewport);
    const theme = await page.evaluate(
      () => document.documentElement.dataset.theme ?? (matchMedia('(prefers-color-scheme: dark)').matches ? 'hall' : 'light'),
    );
    const where = `${name}, ${theme}, ${size}`;
    expect(await contrastViolations(page), `contrast on ${where}`).toEqual([]);
    expect(await smallTargets(page), `touch targets on ${where}`).toEqual([]);
    if (shotsDir) await page.screenshot({ path: path.join(shotsDir, `${name}-${theme}-${size}.png`), fullPage: true });
  }
}

describe('look and feel', () => {
  test('sign-in and home read at AA contrast with 48 px targets in light and hall mode, and the choice is remembered', async ({
    app,
    page,
    consoleErrors,
  }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await page.emulateMedia({ colorScheme: 'light' });
    await page.goto(`${app.baseUrl}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    await checkScreen(page, 'sign-in');

    await login(page, app.baseUrl, DEMO_USERS.admin);
    await page.getByTestId('site-card').first().waitFor();
    await checkScreen(page, 'home');

    const toggle = page.getByRole('button', { name: 'Hall mode' });
    expect(await toggle.getAttribute('aria-pressed')).toBe('false');
    await toggle.click();
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('hall');
    await checkScreen(page, 'home');

    // Remembered across a reload, even though the system still prefers light.
    await page.reload();
    await page.getByTestId('site-card').first().waitFor();
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('hall');
    expect(await page.getByRole('button', { name: 'Hall mode' }).getAttribute('aria-pressed')).toBe('true');

    // The admin sees the dev mail page (the test server runs the mail capture), with a real message.
    const status = await page.evaluate(async (email) => {
      const response = await fetch('/api/auth/password-reset/request', {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ email }),
      });
      return response.status;
    }, DEMO_USERS.reviewer);
    expect(status).toBe(202);
    const sent = await app.mail.waitFor((m) => m.to.includes(DEMO_USERS.reviewer));
    await page.getByRole('link', { name: 'Dev mail' }).click();
    await page.getByRole('heading', { name: 'Dev mail' }).waitFor();
    await page.getByText(sent.subject).first().waitFor();
    await checkScreen(page, 'dev-mail');
  });

  test('with no remembered choice, hall mode follows a dark system preference', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.goto(`${app.baseUrl}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    expect(await page.getByRole('button', { name: 'Hall mode' }).getAttribute('aria-pressed')).toBe('true');
    const background = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
    expect(background).toBe('rgb(10, 17, 16)'); // palette.basalt[950], the hall background
    await checkScreen(page, 'sign-in-system-dark');
  });
});
