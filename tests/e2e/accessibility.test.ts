/**
 * Accessibility of the main screens in the real browser, as each demo role. axe-core (an outside
 * reference, its WCAG 2.1 A/AA rules, none switched off) runs on every screen in light and hall mode at
 * phone and desktop sizes (look-checks.ts checkScreen). On top of that, every form control must have an
 * accessible name (axe's naming rules, failing at any impact), the sign-in form must work from the
 * keyboard alone, and the control that keyboard focus lands on must show a visible ring (WCAG 2.4.7).
 * Site setup, instruments, watch bands, the EMC flags and an EMC room get their axe run in both themes
 * and sizes in site-setup-look.test.ts, watch-bands.test.ts and emc-flags.test.ts; here they get the
 * naming and focus checks.
 */
import AxeBuilder from '@axe-core/playwright';
import type { Browser, Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { sql } from '../setup/api-helpers';
import { readDemoIds } from '../setup/sync-fixtures';
import { ConsoleWatcher, DEMO_USERS, DESKTOP_VIEWPORT, login, SIGNED_OUT_SESSION_CHECK, test } from './fixtures';
import { checkScreen } from './look-checks';

const PREFIX = 'a11y';
/** Each screen is checked four times over; the machine running the suite may be slow. */
const SLOW = 480_000;

/** axe's rules that every control, button and link has a name; any impact fails. */
const NAMING_RULES = ['label', 'select-name', 'button-name', 'link-name', 'input-button-name', 'aria-input-field-name', 'aria-toggle-field-name', 'image-alt'];

async function unnamedControls(page: Page) {
  const result = await new AxeBuilder({ page }).withRules(NAMING_RULES).analyze();
  return result.violations.flatMap((v) => v.nodes.map((n) => `${v.id} ${n.target.join(' ')}`));
}

/**
 * Presses Tab `presses` times from the top of the page; for each element that takes focus, whether
 * it shows a ring: an outline at least 2 px wide that is not transparent, or a box-shadow.
 */
async function focusWithoutRing(page: Page, presses: number) {
  await page.evaluate(() => {
    (document.activeElement as HTMLElement | null)?.blur();
    window.scrollTo(0, 0);
  });
  const missing: string[] = [];
  let focused = 0;
  for (let i = 0; i < presses; i += 1) {
    await page.keyboard.press('Tab');
    const seen = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement | null;
      if (!el || el === document.body) return null;
      const style = getComputedStyle(el);
      const outline = style.outlineStyle !== 'none' && parseFloat(style.outlineWidth) >= 2 && !/rgba\(.*, 0\)$/.test(style.outlineColor) && style.outlineColor !== 'transparent';
      const shadow = style.boxShadow !== 'none' && style.boxShadow !== '';
      const what = `${el.tagName.toLowerCase()} "${(el.getAttribute('aria-label') ?? el.textContent ?? '').trim().slice(0, 40)}"`;
      return { ring: outline || shadow, what };
    });
    if (!seen) continue;
    focused += 1;
    if (!seen.ring) missing.push(seen.what);
  }
  return { focused, missing };
}

/** The accessibility checks of one screen: axe in both themes and sizes, names, and the focus ring. */
async function checkA11y(page: Page, name: string, tabPresses = 8) {
  await checkScreen(page, name, PREFIX);
  await page.setViewportSize(DESKTOP_VIEWPORT);
  expect.soft(await unnamedControls(page), `unnamed controls on ${name}`).toEqual([]);
  const focus = await focusWithoutRing(page, tabPresses);
  expect.soft(focus.focused, `keyboard focus reaches controls on ${name}`).toBeGreaterThan(0);
  expect.soft(focus.missing, `focused without a visible ring on ${name}`).toEqual([]);
}

/** Names and the focus ring only, for screens whose axe run in both themes and sizes lives in another file. */
async function checkNamesAndFocus(page: Page, name: string, tabPresses = 8) {
  await page.setViewportSize(DESKTOP_VIEWPORT);
  expect.soft(await unnamedControls(page), `unnamed controls on ${name}`).toEqual([]);
  const focus = await focusWithoutRing(page, tabPresses);
  expect.soft(focus.focused, `keyboard focus reaches controls on ${name}`).toBeGreaterThan(0);
  expect.soft(focus.missing, `focused without a visible ring on ${name}`).toEqual([]);
}

async function signedIn(browser: Browser, watcher: ConsoleWatcher, baseUrl: string, email: string) {
  const context = await browser.newContext({ viewport: DESKTOP_VIEWPORT });
  context.setDefaultTimeout(20_000);
  const page = await context.newPage();
  watcher.attach(page);
  await login(page, baseUrl, email);
  await page.waitForURL(`${baseUrl}/`);
  return { context, page };
}

describe('accessibility of the main screens', () => {
  test('sign-in works from the keyboard alone, with a visible focus ring on each control', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await page.setViewportSize(DESKTOP_VIEWPORT);
    await page.goto(`${app.baseUrl}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();

    // Tab until the e-mail field has focus (the header's controls come first), checking each ring.
    const ringless: string[] = [];
    let steps = 0;
    while (steps < 15) {
      await page.keyboard.press('Tab');
      steps += 1;
      const state = await page.evaluate(() => {
        const el = document.activeElement as HTMLInputElement;
        const style = getComputedStyle(el);
        // Chromium's own ring is 1 px "auto"; the app's is a 3 px solid outline.
        return { label: el.labels?.[0]?.textContent?.trim() ?? el.textContent?.trim() ?? '', ring: style.outlineStyle !== 'none' && parseFloat(style.outlineWidth) >= 2 };
      });
      if (!state.ring) ringless.push(state.label);
      if (state.label === 'E-mail') break;
    }
    expect(ringless).toEqual([]);
    await expect.poll(() => page.evaluate(() => document.activeElement?.id && document.querySelector(`label[for="${document.activeElement.id}"]`)?.textContent?.trim())).toBe('E-mail');
    await page.keyboard.type(DEMO_USERS.reviewer);
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => (document.activeElement as HTMLInputElement).type)).toBe('password');
    await page.keyboard.type('fringewalk-demo');
    await page.keyboard.press('Enter');
    await page.waitForURL(`${app.baseUrl}/`);
    expect(await page.getByTestId('signed-in-user').textContent()).toContain('Reviewer');
  }, SLOW);

  test('sign-in and password reset screens', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await page.goto(`${app.baseUrl}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    await checkA11y(page, 'sign-in');

    await page.goto(`${app.baseUrl}/forgot-password`);
    await page.getByRole('button', { name: 'Send reset link' }).waitFor();
    await checkA11y(page, 'forgot-password');
    await page.getByLabel('E-mail').fill(DEMO_USERS.viewer);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await page.getByText('Check your e-mail').waitFor();
    await checkScreen(page, 'forgot-password-sent', PREFIX);

    const mail = await app.mail.waitFor((m) => m.to.includes(DEMO_USERS.viewer) && /reset-password\?token=/.test(m.text));
    const link = /(https?:\/\/\S+\/reset-password\?token=[^\s>"]+)/.exec(mail.text)?.[1];
    expect(link).toBeDefined();
    await page.goto(link!);
    await page.getByLabel('New password', { exact: true }).waitFor();
    await checkA11y(page, 'reset-password');
    // the form's error, as a screen reader would meet it
    await page.getByLabel('New password', { exact: true }).fill('a-new-vault-passphrase');
    await page.getByLabel('Repeat the new password').fill('something-else-entirely');
    await page.getByRole('button', { name: 'Save new password' }).click();
    await page.getByText('The two passwords differ.').waitFor();
    await checkScreen(page, 'reset-password-error', PREFIX);
  }, SLOW);

  test('home of every role, and the dev mail page', async ({ app, browser, consoleErrors }) => {
    for (const role of ['admin', 'reviewer', 'emc', 'surveyor', 'viewer'] as const) {
      const { context, page } = await signedIn(browser, consoleErrors, app.baseUrl, DEMO_USERS[role]);
      try {
        await page.getByRole('heading', { level: 1 }).first().waitFor();
        await expect.poll(() => page.getByRole('status').filter({ hasText: /Loading/ }).count()).toBe(0);
        await checkA11y(page, `home-${role}`);
        if (role === 'admin') {
          await page.goto(`${app.baseUrl}/dev/mail`);
          await page.getByRole('heading', { name: 'Dev mail' }).waitFor();
          await checkA11y(page, 'dev-mail');
        }
      } finally {
        await context.close();
      }
    }
  }, SLOW);

  test('capture on the surveyor’s device', async ({ app, browser, consoleErrors }) => {
    const ids = await readDemoIds(app.databaseUrl);
    const { context, page } = await signedIn(browser, consoleErrors, app.baseUrl, DEMO_USERS.surveyor);
    try {
      await page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}`);
      await page.getByTestId('take-offline').click();
      await page.getByText('Ready to work offline').waitFor({ timeout: 30_000 });
      await checkA11y(page, 'survey');
      await page.getByTestId('start-capture').click();
      const picker = page.getByLabel(/Or choose a station/);
      await picker.waitFor();
      await expect.poll(() => page.locator('.leaflet-container').getAttribute('data-stations-drawn')).not.toBeNull();
      const options = await picker.locator('option').evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value).filter(Boolean));
      expect(options.length).toBeGreaterThan(0);
      await picker.selectOption(options[0]!);
      await page.getByLabel('|B|', { exact: true }).waitFor();
      await checkA11y(page, 'capture', 12);
    } finally {
      await context.close();
    }
  }, SLOW);

  test('survey map, compare, review table and reports, as the reviewer', async ({ app, browser, consoleErrors }) => {
    const ids = await readDemoIds(app.databaseUrl);
    const [signedOff] = await sql<{ name: string }>(app.databaseUrl, 'SELECT name FROM surveys WHERE id = $1', [ids.signedOffSurveyId]);
    const { context, page } = await signedIn(browser, consoleErrors, app.baseUrl, DEMO_USERS.reviewer);
    try {
      await page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}/map`);
      await page.getByRole('heading', { name: /^Map of / }).waitFor({ timeout: 30_000 });
      const canvas = page.locator('[data-testid="survey-map"] .leaflet-container');
      await expect.poll(async () => Number((await canvas.getAttribute('data-contours-drawn')) ?? '0'), { timeout: 30_000 }).toBeGreaterThan(0);
      await checkA11y(page, 'survey-map', 12);

      await page.getByTestId('compare-select').selectOption({ label: signedOff!.name });
      await page.getByTestId('compare-table').waitFor({ timeout: 30_000 });
      await checkA11y(page, 'survey-map-compare', 4);

      await page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}/review`);
      await page.getByTestId('review-table').waitFor({ timeout: 30_000 });
      await expect.poll(async () => page.getByTestId('review-row').count()).toBeGreaterThan(0);
      await checkA11y(page, 'review', 12);

      await page.goto(`${app.baseUrl}/surveys/${ids.signedOffSurveyId}/report`);
      await page.getByTestId('report-title').waitFor({ timeout: 30_000 });
      await checkA11y(page, 'report-signed-off');
    } finally {
      await context.close();
    }
  }, SLOW);

  test('site setup, instruments, watch bands, EMC flags and an EMC room: every control named, focus visible', async ({ app, browser, consoleErrors }) => {
    const ids = await readDemoIds(app.databaseUrl);
    const [survey] = await sql<{ site_id: string }>(app.databaseUrl, 'SELECT site_id FROM surveys WHERE id = $1', [ids.openSurveyId]);
    const admin = await signedIn(browser, consoleErrors, app.baseUrl, DEMO_USERS.admin);
    try {
      const page = admin.page;
      await page.goto(`${app.baseUrl}/sites`);
      await page.getByRole('table', { name: 'Sites' }).waitFor();
      await checkNamesAndFocus(page, 'sites');
      await page.goto(`${app.baseUrl}/sites/${survey!.site_id}`);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await page.getByRole('list', { name: 'Surveys on this site' }).waitFor();
      await checkNamesAndFocus(page, 'site', 12);
      await page.goto(`${app.baseUrl}/instruments`);
      await page.getByRole('table', { name: 'Instruments' }).waitFor();
      await checkNamesAndFocus(page, 'instruments', 12);
    } finally {
      await admin.context.close();
    }

    const emc = await signedIn(browser, consoleErrors, app.baseUrl, DEMO_USERS.emc);
    try {
      const page = emc.page;
      await page.goto(`${app.baseUrl}/watch-bands`);
      await page.getByRole('table', { name: 'Watch bands' }).waitFor();
      await checkNamesAndFocus(page, 'watch-bands', 12);
      await page.goto(`${app.baseUrl}/surveys/${ids.openSurveyId}/emc`);
      await page.getByRole('heading', { name: /^EMC check/, level: 1 }).waitFor();
      const flag = page.getByTestId('flag-card').first();
      await flag.waitFor({ timeout: 30_000 });
      await checkNamesAndFocus(page, 'emc-flags', 12);
      await flag.getByRole('link').first().click();
      await page.getByTestId('frequency-ruler').waitFor();
      await checkNamesAndFocus(page, 'emc-room', 12);
    } finally {
      await emc.context.close();
    }
  }, SLOW);
});
