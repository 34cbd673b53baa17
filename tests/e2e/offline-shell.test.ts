/**
 * The offline promise of the PWA: after one visit with a network, the app shell opens with none,
 * says so, and shows the sites and surveys saved on the device.
 */
import { describe, expect } from 'vitest';
import { DEMO_ORGANISATION, DEMO_USERS, goOffline, login, SIGNED_OUT_SESSION_CHECK, test, waitForPersistedQueries, waitForServiceWorkerControl } from './fixtures';

interface Named {
  name: string;
}

describe('offline shell', () => {
  test('a signed-in surveyor who goes offline and reloads still gets the app, told it is offline, with the saved sites and surveys', async ({
    app,
    page,
    context,
    consoleErrors,
  }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);

    // A signed-out visitor is sent to the sign-in screen.
    await page.goto(`${app.baseUrl}/`);
    await page.waitForURL(/\/sign-in$/);

    await login(page, app.baseUrl, DEMO_USERS.surveyor);
    await page.waitForURL(`${app.baseUrl}/`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe(DEMO_ORGANISATION);
    await expect.poll(() => page.getByTestId('signed-in-user').textContent()).toContain('Surveyor');

    // What the server says this user's organisation has, read with the same cookie.
    const fromServer = await page.evaluate(async () => {
      const session = (await (await fetch('/api/auth/session')).json()) as { memberships: Array<{ organisationId: string }> };
      const orgId = session.memberships[0]!.organisationId;
      const sites = (await (await fetch(`/api/orgs/${orgId}/sites`)).json()) as { sites: Named[] };
      const surveys = (await (await fetch(`/api/orgs/${orgId}/surveys`)).json()) as { surveys: Named[] };
      return { sites: sites.sites.map((s) => s.name), surveys: surveys.surveys.map((s) => s.name) };
    });
    expect(fromServer.sites.length).toBeGreaterThan(0);
    expect(fromServer.surveys.length).toBeGreaterThan(0);

    const cardTitles = async (testId: string) => page.getByTestId(testId).locator('h3').allTextContents();
    await expect.poll(() => cardTitles('site-card')).toEqual(expect.arrayContaining(fromServer.sites));
    await expect.poll(() => cardTitles('survey-card')).toEqual(expect.arrayContaining(fromServer.surveys));
    expect(await page.getByTestId('connection-status').textContent()).toContain('Online');

    await waitForServiceWorkerControl(page);
    await waitForPersistedQueries(page, [
      ['auth', 'session'],
      ['home', 'sites'],
      ['home', 'surveys'],
    ]);

    await goOffline(context);
    const response = await page.reload();
    expect(response?.fromServiceWorker(), 'the offline reload is answered by the service worker').toBe(true);

    await expect.poll(() => page.getByTestId('connection-status').textContent()).toBe('Offline — showing saved data');
    await expect.poll(() => page.getByTestId('saved-at').textContent()).toMatch(/saved on this device today at/);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe(DEMO_ORGANISATION);
    expect(await cardTitles('site-card')).toEqual(expect.arrayContaining(fromServer.sites));
    expect(await cardTitles('survey-card')).toEqual(expect.arrayContaining(fromServer.surveys));
    if (process.env.FRINGEWALK_SCREENSHOT_DIR) {
      await page.screenshot({ path: `${process.env.FRINGEWALK_SCREENSHOT_DIR}/home-offline-light-phone.png`, fullPage: true });
    }
    // The app font came from the precache too.
    expect(await page.evaluate(() => document.fonts.check('16px "Atkinson Hyperlegible"'))).toBe(true);
  });
});
