/**
 * A full offline walkdown in Debian's Chromium: the demo surveyor takes the open survey offline, the
 * browser goes offline, the page reloads (app and plan still open), stations are placed, 20 field
 * readings and 2 sweeps are logged, the page is closed and a new one opened: everything is still on the
 * device and the outbox (the header count) holds it. Bad input shows its message and stores nothing;
 * the fluxgate whose calibration fell due on 2026-06-30 shows its warning.
 */
import type { Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { DEMO_USERS, goOffline, login, SIGNED_OUT_SESSION_CHECK, test, waitForPersistedQueries, waitForServiceWorkerControl } from './fixtures';

const SURVEY_NAME = '2026 annual fringe-field check';

/** Counts straight from IndexedDB (not through the app), so the check does not trust the UI. */
async function storeCounts(page: Page) {
  return page.evaluate(
    () =>
      new Promise<{ readings: number; sweeps: number; outboxReadings: number; outboxSweeps: number; outboxStations: number }>((resolve, reject) => {
        const open = indexedDB.open('fringewalk');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const tx = db.transaction(['fieldReadings', 'sweeps', 'outbox'], 'readonly');
          const all = <T>(name: string) =>
            new Promise<T[]>((res, rej) => {
              const r = tx.objectStore(name).getAll();
              r.onsuccess = () => res(r.result as T[]);
              r.onerror = () => rej(r.error);
            });
          void Promise.all([
            all<{ deleted: boolean; walkId: string }>('fieldReadings'),
            all<{ deleted: boolean }>('sweeps'),
            all<{ entity: string; status: string; recordId: string }>('outbox'),
          ]).then(([readings, sweeps, outbox]) => {
            const pendingIds = (entity: string) => new Set(outbox.filter((o) => o.entity === entity && o.status === 'pending').map((o) => o.recordId)).size;
            db.close();
            resolve({
              readings: readings.filter((r) => !r.deleted).length,
              sweeps: sweeps.filter((s) => !s.deleted).length,
              outboxReadings: pendingIds('field_readings'),
              outboxSweeps: pendingIds('sweeps'),
              outboxStations: pendingIds('stations'),
            });
          }, reject);
        };
      }),
  );
}

/** Tap the plan at a fraction of its box. */
async function tapPlan(page: Page, fx: number, fy: number) {
  const box = await page.locator('.leaflet-container').boundingBox();
  if (!box) throw new Error('no plan on screen');
  await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
}

describe('offline field capture', () => {
  test('a whole walkdown with the network off survives closing the page and is counted in the outbox', async ({ app, page, context, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK, {
      text: /Failed to load resource|net::ERR_INTERNET_DISCONNECTED/,
      why: 'offline, the app asks the server for the session and the survey and is refused by the network',
    });

    await login(page, app.baseUrl, DEMO_USERS.surveyor);
    await page.waitForURL(`${app.baseUrl}/`);
    await page.getByRole('link', { name: SURVEY_NAME }).first().click();
    await page.waitForURL(/\/surveys\/[0-9a-f-]+$/);
    const surveyUrl = page.url();
    await page.getByTestId('take-offline').click();
    await page.getByText('Ready to work offline').waitFor({ timeout: 30_000 });
    expect(await page.getByText('Some plan images are missing').count(), 'the demo plans are in the object store').toBe(0);
    await waitForServiceWorkerControl(page);
    await waitForPersistedQueries(page, [['auth', 'session']]);

    await goOffline(context);
    await page.reload();
    await page.getByTestId('start-capture').click();
    await page.waitForURL(/\/capture$/);
    const captureUrl = page.url();
    await page.reload();

    // The app and the plan open with no network: the cached plan image and the stations drawn on it.
    await page.locator('.leaflet-container').waitFor();
    await expect
      .poll(() => page.locator('.leaflet-image-layer').evaluate((img) => (img as HTMLImageElement).complete && (img as HTMLImageElement).naturalWidth > 0))
      .toBe(true);
    await expect.poll(() => page.locator('.leaflet-container').getAttribute('data-stations-drawn')).not.toBeNull();
    const stationsBefore = Number(await page.locator('.leaflet-container').getAttribute('data-stations-drawn'));

    // The overdue fluxgate shows its warning; the Hall meter does not.
    const meter = page.getByLabel('Gaussmeter');
    const options = await meter.locator('option').allTextContents();
    const fluxgate = options.find((o) => /fluxgate/i.test(o));
    expect(fluxgate, 'the demo fluxgate is offered').toBeDefined();
    expect(fluxgate).toContain('calibration overdue');
    await meter.selectOption({ label: fluxgate! });
    await page.getByText('Calibration overdue', { exact: true }).first().waitFor();
    const hall = options.find((o) => /Hall/.test(o))!;
    await meter.selectOption({ label: hall });
    await expect.poll(() => page.getByText('Calibration overdue', { exact: true }).count()).toBe(0);

    // The store already holds the survey's readings from the server; count what this walk adds.
    const before = await storeCounts(page);
    expect(before).toMatchObject({ outboxReadings: 0, outboxSweeps: 0 });
    const added = async () => (await storeCounts(page)).readings - before.readings;

    // An invalid entry shows its message next to the box and stores nothing.
    await tapPlan(page, 0.2, 0.2);
    await page.getByTestId('station-panel').getByText(/station/i).first().waitFor();
    const field = page.getByLabel('|B|', { exact: true });
    await field.fill('0,52');
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText(/use a point for decimals/).waitFor();
    expect(await added()).toBe(0);

    // 20 readings: a new station every 4 readings, each tap somewhere else on the plan.
    const spots: Array<[number, number]> = [
      [0.15, 0.3],
      [0.35, 0.55],
      [0.6, 0.35],
      [0.8, 0.65],
      [0.5, 0.8],
    ];
    for (let i = 0; i < 20; i++) {
      if (i % 4 === 0) {
        const [fx, fy] = spots[i / 4]!;
        await tapPlan(page, fx, fy);
      }
      await field.fill(i === 7 ? '87.5' : (0.05 + i * 0.13).toFixed(2));
      if (i === 7) {
        // The electron line at 87.5 mT lands in the 2.4 GHz ISM band (ITU RR 5.150), and the form says so.
        await expect.poll(() => page.getByTestId('band-hits').textContent()).toContain('ISM 2.4 GHz');
      }
      await page.getByRole('button', { name: 'Save reading' }).click();
      await expect.poll(() => added()).toBe(i + 1);
      await expect.poll(() => field.inputValue()).toBe('');
    }
    await expect.poll(() => page.locator('.leaflet-container').getAttribute('data-stations-drawn')).not.toBe(String(stationsBefore));

    // Two sweeps at the last station.
    await page.getByRole('tab', { name: 'Sweep' }).click();
    for (const [start, stop, peak] of [
      ['2300', '2600', '2449.6'],
      ['1380', '1440', '1420.4'],
    ] as const) {
      await page.getByLabel('Start frequency', { exact: true }).fill(start);
      await page.getByLabel('Stop frequency', { exact: true }).fill(stop);
      await page.getByRole('button', { name: 'Add peak marker' }).click();
      await page.getByLabel('Peak 1 frequency', { exact: true }).fill(peak);
      await page.getByLabel('Peak 1 level (dBm)', { exact: true }).fill('-52.5');
      await page.getByRole('button', { name: 'Save sweep' }).click();
      await page.getByText('Sweep saved on this device.').first().waitFor();
      await expect.poll(async () => (await page.getByRole('button', { name: /Remove peak/ }).count())).toBe(0);
    }

    const counts = await storeCounts(page);
    expect(counts).toMatchObject({ readings: before.readings + 20, sweeps: before.sweeps + 2, outboxReadings: 20, outboxSweeps: 2 });
    expect(counts.outboxStations).toBeGreaterThanOrEqual(1);
    await expect.poll(() => page.getByTestId('pending-sync').textContent()).toContain('20 readings');

    // A half-filled form is kept as a draft on the device (written after a pause in typing).
    await page.getByRole('tab', { name: 'Field reading' }).click();
    await field.fill('0.77');
    await page.locator('#reading-notes').fill('half-way through');
    await expect.poll(() => page.evaluate(() => new Promise<boolean>((resolve) => {
      const open = indexedDB.open('fringewalk');
      open.onsuccess = () => {
        const r = open.result.transaction('drafts').objectStore('drafts').getAll();
        r.onsuccess = () => {
          open.result.close();
          resolve((r.result as Array<{ value: { reading?: { magnitude?: string } } }>).some((d) => d.value.reading?.magnitude === '0.77'));
        };
      };
    }))).toBe(true);
    await page.close();

    // A new page, still offline: everything is there and still counted.
    const again = await context.newPage();
    consoleErrors.attach(again);
    await again.goto(captureUrl);
    await again.getByRole('tab', { name: /Walk \(22\)/ }).click();
    await expect.poll(() => again.getByTestId('walk-entry').count()).toBe(22);
    expect(await again.getByTestId('walk-count').textContent()).toBe('20 readings, 2 sweeps in this walk');
    const header = await again.getByTestId('pending-sync').textContent();
    expect(header).toContain('20 readings');
    expect(header).toContain('2 sweeps');
    expect(await storeCounts(again)).toEqual(counts);
    // The draft came back with the page.
    await again.getByRole('tab', { name: 'Field reading' }).click();
    expect(await again.getByLabel('|B|', { exact: true }).inputValue()).toBe('0.77');
    expect(await again.locator('#reading-notes').inputValue()).toBe('half-way through');

    // Edit one reading, delete one sweep (after a confirmation): a new revision and a tombstone, both queued.
    await again.getByRole('tab', { name: /Walk/ }).click();
    const newestReading = again.getByTestId('walk-entry').filter({ hasText: '|B|' }).first();
    await newestReading.getByRole('button', { name: 'Edit' }).click();
    await expect.poll(() => again.getByLabel('|B|', { exact: true }).inputValue()).not.toBe('');
    await again.getByLabel('|B|', { exact: true }).fill('2.5');
    await again.getByRole('button', { name: 'Save changes' }).click();
    await again.getByText('Reading corrected on this device.').first().waitFor();
    await again.getByRole('tab', { name: /Walk/ }).click();
    await expect.poll(() => again.getByTestId('walk-entry').filter({ hasText: '2.500 mT' }).count()).toBe(1);
    const sweepEntry = again.getByTestId('walk-entry').filter({ hasText: 'Sweep' }).first();
    await sweepEntry.getByRole('button', { name: 'Delete' }).click();
    await sweepEntry.getByRole('button', { name: 'Yes, delete' }).click();
    await expect.poll(() => again.getByTestId('walk-entry').count()).toBe(21);
    const afterEdits = await storeCounts(again);
    // Still 20 readings and 2 sweeps waiting: an edit and a tombstone are changes to records already queued.
    expect(afterEdits).toMatchObject({ readings: before.readings + 20, sweeps: before.sweeps + 1, outboxReadings: 20, outboxSweeps: 2 });
    await again.goto(surveyUrl);
    await expect.poll(() => again.getByTestId('survey-pending').textContent()).toContain('20 readings');
  });
});
