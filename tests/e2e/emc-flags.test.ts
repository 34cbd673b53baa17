/**
 * The EMC check in the real browser, as the demo EMC engineer: from the home screen to the open demo
 * survey's flags; the etch room's flag (the ECR tool's 87.5 mT puts the electron line at about
 * 2.45 GHz, inside the 2.4 GHz ISM band: fₑ = 27.99 GHz/T × 0.0875 T, CODATA 2018); the room's page with
 * its lines on the frequency ruler and its sweep's trace with the predicted line over it and the peaks
 * explained; the flag acknowledged with a note. Then axe and the sideways check.
 */
import { describe, expect } from 'vitest';
import { DEMO_USERS, DESKTOP_VIEWPORT, login, test } from './fixtures';
import { checkScreen } from './look-checks';

describe('EMC check', () => {
  test('an EMC engineer finds the etch room’s 2.4 GHz flag and acknowledges it', async ({ app, page }) => {
    await page.setViewportSize(DESKTOP_VIEWPORT);
    await login(page, app.baseUrl, DEMO_USERS.emc);
    await page.getByTestId('survey-card').filter({ hasText: '2026 annual fringe-field check' }).getByRole('link').first().click();
    await page.getByTestId('open-emc').click();
    await page.getByRole('heading', { name: /^EMC check/, level: 1 }).waitFor();

    // The flag job runs in the background from start-up: look again until its first pass has landed.
    const flag = page.getByRole('article', { name: /electron line n = 1 in ISM 2\.4 GHz, .*etch/i });
    await expect
      .poll(
        async () => {
          if (await flag.count()) return true;
          await page.reload();
          await page.getByRole('heading', { name: /^EMC check/, level: 1 }).waitFor();
          return (await flag.count()) > 0;
        },
        { timeout: 20_000, interval: 1_000 },
      )
      .toBe(true);
    expect(await flag.getByTestId('flag-state').textContent()).toBe('Open');
    await flag.getByTestId('provisional-badge').waitFor();
    // The ECR tool in the room: its fundamental's power and flux density are shown.
    expect(await flag.getByTestId('flag-emission').textContent()).toMatch(/Emitted by 2\.45 GHz ECR plasma-etch tool/);
    await checkScreen(page, 'survey-flags', 'emc-look');

    // The room's own page: its lines on the ruler, the hit named.
    await flag.getByRole('link').first().click();
    await page.getByTestId('frequency-ruler').waitFor();
    await page.getByRole('list', { name: 'Predicted lines' }).getByText(/ISM 2\.4 GHz/).first().waitFor();
    const roomFlag = page.getByRole('article', { name: /electron line n = 1 in ISM 2\.4 GHz/ });

    // The room's sweep: the trace drawn with the predicted lines over it, and its peaks explained.
    const sweep = page.getByTestId('sweep-panel').first();
    await sweep.locator('canvas').waitFor();
    await sweep.getByRole('group', { name: 'Frequency axis' }).waitFor();
    const peaks = sweep.getByRole('table', { name: /Peaks of this sweep/ });
    await peaks.getByRole('row').filter({ hasText: 'Explained' }).first().waitFor();
    expect(await peaks.textContent()).toMatch(/electron line n = 1|e⁻ n=1/);

    // Acknowledge with a note: an empty note is refused next to the box.
    await roomFlag.getByRole('button', { name: 'Acknowledge' }).click();
    await roomFlag.getByText('Say what is being done about it.').waitFor();
    await roomFlag.getByLabel('Acknowledge with a note').fill('Tool owner told; shielding quote requested.');
    await roomFlag.getByRole('button', { name: 'Acknowledge' }).click();
    await expect.poll(() => roomFlag.getByTestId('flag-state').textContent()).toBe('Acknowledged');
    await roomFlag.getByText('Tool owner told; shielding quote requested.').first().waitFor();
    await roomFlag.getByLabel('Resolve: the action taken').waitFor();
    await checkScreen(page, 'room', 'emc-look');
  }, 180_000);
});
