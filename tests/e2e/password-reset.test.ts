import { describe, expect } from 'vitest';
import { DEMO_ORGANISATION, DEMO_USERS, login, QUERY_CACHE_STORAGE_KEY, SIGNED_OUT_SESSION_CHECK, test, waitForPersistedQueries } from './fixtures';

describe('password reset', () => {
  test('a user who forgot the password gets a link by e-mail, chooses a new one and signs in with it', async ({ app, page, consoleErrors }) => {
    const email = DEMO_USERS.viewer;
    await page.goto(`${app.baseUrl}/forgot-password`);
    await page.getByLabel('E-mail').fill(email);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await page.getByText('Check your e-mail').waitFor();

    const mail = await app.mail.waitFor((m) => m.to.includes(email) && /reset-password\?token=/.test(m.text));
    const link = /(https?:\/\/\S+\/reset-password\?token=[^\s>"]+)/.exec(mail.text)?.[1];
    expect(link, 'the e-mail carries a reset link').toBeDefined();

    await page.goto(link!);
    const newPassword = 'a-new-vault-passphrase';
    await page.getByLabel('New password', { exact: true }).fill(newPassword);
    await page.getByLabel('Repeat the new password').fill('something-else-entirely');
    await page.getByRole('button', { name: 'Save new password' }).click();
    await page.getByText('The two passwords differ.').waitFor();

    await page.getByLabel('Repeat the new password').fill(newPassword);
    await page.getByRole('button', { name: 'Save new password' }).click();
    await page.getByText('Password changed').waitFor();

    await login(page, app.baseUrl, email, newPassword);
    await page.waitForURL(`${app.baseUrl}/`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe(DEMO_ORGANISATION);
    expect(await page.getByTestId('signed-in-user').textContent()).toContain('Viewer');

    // Signing out removes this user's saved data from the device.
    await waitForPersistedQueries(page, [['home', 'sites']]);
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(`${app.baseUrl}/sign-in`);
    const saved = await page.evaluate((key) => window.localStorage.getItem(key) ?? '', QUERY_CACHE_STORAGE_KEY);
    expect(saved).not.toContain('"home"');
    expect(saved).not.toContain(email);
    consoleErrors.expect({ ...SIGNED_OUT_SESSION_CHECK, why: 'the test itself checks the server forgot the session' });
    expect(await page.evaluate(async () => (await fetch('/api/auth/session')).status)).toBe(401);
  });
});
