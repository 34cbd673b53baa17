import { describe, expect } from 'vitest';
import { DEMO_USERS, goOffline, login, SIGNED_OUT_SESSION_CHECK, test, waitForServiceWorkerControl } from './fixtures';

describe('sign-in screen', () => {
  test('a wrong password is refused with the reason shown in the form, and the user stays signed out', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK, {
      text: /status of 401/,
      url: /\/api\/auth\/sign-in$/,
      why: 'the server refuses the wrong password with 401',
    });
    await login(page, app.baseUrl, DEMO_USERS.surveyor, 'not-the-password');

    const error = page.getByRole('form', { name: 'Sign in' }).getByRole('alert');
    await expect.poll(() => error.textContent()).toMatch(/Not signed in/);
    expect((await page.getByTestId('sign-in-error').textContent())?.trim()).not.toBe('');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(await page.evaluate(async () => (await fetch('/api/auth/session')).status)).toBe(401);
  });

  test('an empty form is not sent: each field says what is missing next to it', async ({ app, page, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    let signInRequests = 0;
    page.on('request', (request) => {
      if (request.url().endsWith('/api/auth/sign-in')) signInRequests += 1;
    });
    await page.goto(`${app.baseUrl}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByText('Enter a valid e-mail address.').count()).toBe(1);
    expect(await page.getByText('Enter your password.').count()).toBe(1);
    expect(await page.getByLabel('E-mail').getAttribute('aria-invalid')).toBe('true');
    expect(signInRequests).toBe(0);
  });

  test('offline, the sign-in screen still opens and says signing in needs a network', async ({ app, page, context, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK);
    await page.goto(`${app.baseUrl}/sign-in`);
    await waitForServiceWorkerControl(page);
    await goOffline(context);
    await page.reload();

    await expect.poll(() => page.getByTestId('connection-status').textContent()).toBe('Offline — showing saved data');
    await expect.poll(() => page.getByText('Signing in needs a network connection', { exact: false }).count()).toBeGreaterThan(0);

    await page.getByLabel('E-mail').fill(DEMO_USERS.surveyor);
    await page.getByLabel('Password').fill('fringewalk-demo');
    consoleErrors.expect({ text: /ERR_INTERNET_DISCONNECTED/, url: /\/api\/auth\/sign-in$/, why: 'the sign-in request cannot leave the device' });
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByTestId('sign-in-error').textContent()).toMatch(/needs a network connection/);
  });
});
