import { describe, expect } from 'vitest';
import { DEMO_ORGANISATION, DEMO_USERS, login, SIGNED_OUT_SESSION_CHECK, test } from './fixtures';

describe('invitations', () => {
  test('an invited engineer opens the e-mailed link, sees organisation and role, and joins with a name and password', async ({
    app,
    browser,
    page,
  }) => {
    // The admin invites (through the API: the invitation screen arrives with a later issue).
    await login(page, app.baseUrl, DEMO_USERS.admin);
    await page.waitForURL(`${app.baseUrl}/`);
    const invitee = 'new.engineer@harrowby.example';
    const status = await page.evaluate(async (email) => {
      const session = (await (await fetch('/api/auth/session')).json()) as { memberships: Array<{ organisationId: string }> };
      const response = await fetch(`/api/orgs/${session.memberships[0]!.organisationId}/invitations`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ email, role: 'emc' }),
      });
      return response.status;
    }, invitee);
    expect(status).toBe(201);
    const mail = await app.mail.waitFor((m) => m.to.includes(invitee));
    const link = /(https?:\/\/\S+\/invitations\/[^\s>"]+)/.exec(mail.text)?.[1];
    expect(link, 'the e-mail carries an invitation link').toBeDefined();

    // The invitee, on a device of their own.
    const context = await browser.newContext();
    context.setDefaultTimeout(10_000);
    const errors: string[] = [];
    const invitePage = await context.newPage();
    invitePage.on('console', (m) => {
      if (m.type() === 'error' && !(SIGNED_OUT_SESSION_CHECK.text.test(m.text()) && SIGNED_OUT_SESSION_CHECK.url!.test(m.location().url))) errors.push(m.text());
    });
    try {
      await invitePage.goto(link!);
      await invitePage.getByText(DEMO_ORGANISATION).first().waitFor();
      expect(await invitePage.getByText('EMC engineer').count()).toBeGreaterThan(0);
      expect(await invitePage.getByText(invitee).count()).toBeGreaterThan(0);

      await invitePage.getByRole('button', { name: 'Accept and join' }).click();
      await invitePage.getByText('Enter your name.').waitFor();

      await invitePage.getByLabel('Your name').fill('Noor Velasquez-Brandt');
      await invitePage.getByLabel('Choose a password').fill('a-long-enough-passphrase');
      await invitePage.getByRole('button', { name: 'Accept and join' }).click();
      await invitePage.waitForURL(`${app.baseUrl}/`);
      await expect.poll(() => invitePage.getByTestId('signed-in-user').textContent()).toContain('EMC engineer');

      // A used invitation cannot be used again.
      await invitePage.goto(link!);
      await invitePage.getByText('This invitation cannot be used').waitFor();
      expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
