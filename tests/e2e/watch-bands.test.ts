/**
 * Watch bands in the real browser, as the demo EMC engineer: the demo bands with the picture and the
 * recalled-value marks, the starter set added, a band typed with units (and a swapped pair of edges
 * refused next to the field), a CSV with a bad row checked line by line and only its good rows
 * imported, the CSV downloaded, and the 3 T scanner's receive band shown as watched. Then axe and the sideways
 * check over the screen in both themes at both sizes.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect } from 'vitest';
import { DEMO_USERS, DESKTOP_VIEWPORT, login, test } from './fixtures';
import { checkScreen } from './look-checks';

describe('watch bands', () => {
  test('an EMC engineer keeps the organisation’s watch bands', async ({ app, page }) => {
    await page.setViewportSize(DESKTOP_VIEWPORT);
    await login(page, app.baseUrl, DEMO_USERS.emc);
    await page.getByRole('link', { name: 'Watch bands' }).click();
    await page.getByRole('heading', { name: 'Watch bands', level: 1 }).waitFor();
    const table = page.getByRole('table', { name: 'Watch bands' });
    await table.getByText('Radio astronomy — H I line', { exact: true }).waitFor();
    await page.getByTestId('band-spectrum').waitFor();
    // The demo's GPS L1 row says its width is recalled.
    await table.getByRole('row').filter({ hasText: 'GPS L1' }).getByTestId('recalled-badge').waitFor();

    // The starter set fills in what the demo organisation lacks, once.
    await page.getByRole('button', { name: /^Add the \d+ missing$/ }).click();
    await table.getByText('ISM 5.8 GHz', { exact: true }).waitFor();
    // Bands the demo already watches under its own names are not added twice.
    expect(await table.getByText('Medical implant communication 402–405 MHz', { exact: true }).count()).toBe(0);
    await expect.poll(() => page.getByRole('button', { name: /^Add the \d+ missing$/ }).count()).toBe(0);

    // A band of our own, typed with units; swapped edges are refused next to the field.
    await page.getByRole('button', { name: 'Add band' }).click();
    const form = page.getByRole('form', { name: 'New watch band' });
    await form.getByLabel('Band name').fill('Campus telemetry 433 MHz');
    await form.getByLabel('Lower edge').fill('434.79 MHz');
    await form.getByLabel('Upper edge').fill('433.05 MHz');
    await form.getByLabel('Why it is protected').fill('Nurse-call pagers');
    await form.getByLabel('Source of the edges').fill('Invented for the test');
    await form.getByRole('button', { name: 'Add band' }).click();
    await form.getByText('The upper edge must be above the lower edge.').waitFor();
    await form.getByLabel('Lower edge').fill('433.05 MHz');
    await form.getByLabel('Upper edge').fill('434.79 MHz');
    await form.getByLabel('Severity').selectOption('high');
    await form.getByRole('button', { name: 'Add band' }).click();
    const ours = table.getByRole('row').filter({ hasText: 'Campus telemetry 433 MHz' });
    await ours.waitFor();
    expect(await ours.textContent()).toContain('433.1 MHz – 434.8 MHz');

    // A CSV with one bad row: checked first, then only the good rows imported.
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-bands-'));
    const file = path.join(dir, 'bands.csv');
    fs.writeFileSync(
      file,
      ['name,lower_MHz,upper_MHz,reason,source,severity', 'Lab links 868 MHz,863,870,Sensor network,Invented for the test,medium', 'Backwards band,900,890,Oops,Invented for the test,low'].join('\n'),
    );
    await page.getByLabel('Import bands from a CSV file').setInputFiles(file);
    const report = page.getByTestId('import-report');
    await report.getByText('2 rows, 1 good, 1 with errors.').waitFor();
    expect(await report.getByTestId('import-error').textContent()).toContain('3upper_MHz: The upper edge must be above the lower edge.');
    await report.getByRole('button', { name: 'Import only the 1 good row' }).click();
    await table.getByText('Lab links 868 MHz', { exact: true }).waitFor();
    expect(await table.getByText('Backwards band', { exact: true }).count()).toBe(0);

    // The CSV download carries the organisation's bands with units in the header.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download CSV' }).click()]);
    const csv = fs.readFileSync(await download.path(), 'utf8');
    expect(csv.split('\r\n')[0]).toBe('name,lower_MHz,upper_MHz,reason,source,severity,threshold_dBW_per_m2_Hz,notes');
    expect(csv).toContain('Campus telemetry 433 MHz,433.05,434.79,Nurse-call pagers,Invented for the test,high');
    expect(csv).toContain('Lab links 868 MHz,863,870');

    // The 3 T scanner's receive band, 42.577 478 518 MHz/T × 3 T = 127.7 MHz (CODATA 2018), is already
    // watched by the demo under its own name: shown as watched, not offered twice.
    const scanner = page.getByTestId('mri-band').filter({ hasText: 'MR 1' });
    await scanner.getByText('Receives at 127.7 MHz').waitFor();
    await scanner.getByText('Watched', { exact: true }).waitFor();
    expect(await scanner.getByRole('button', { name: 'Watch this band' }).count()).toBe(0);

    await checkScreen(page, 'watch-bands', 'emc-look');
    fs.rmSync(dir, { recursive: true, force: true });
  }, 180_000);

  test('a reviewer reads the bands but cannot change them', async ({ app, page }) => {
    await login(page, app.baseUrl, DEMO_USERS.reviewer);
    await page.getByRole('link', { name: 'Watch bands' }).click();
    await page.getByRole('table', { name: 'Watch bands' }).getByText('ISM 2.4 GHz', { exact: true }).waitFor();
    expect(await page.getByRole('button', { name: 'Add band' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Edit ISM 2.4 GHz' }).count()).toBe(0);
    expect(await page.getByLabel('Import bands from a CSV file').count()).toBe(0);
  });
});
