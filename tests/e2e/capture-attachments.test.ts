/**
 * Files captured with readings and sweeps, in Debian's Chromium with the network off: a camera-sized
 * photo is shrunk on the device (the stored file is smaller, still a JPEG image, long side at most
 * 1,600 px, same aspect) and kept as an attachment named by its SHA-256; a sweep's trace CSV is kept
 * byte for byte as an attachment; a plan with no scale yet is drawn one metre per pixel and says so.
 */
import { createHash } from 'node:crypto';
import type { Page } from 'playwright-core';
import { describe, expect } from 'vitest';
import { planRaster } from '../fixtures/plan-images';
import { DEMO_USERS, goOffline, login, SIGNED_OUT_SESSION_CHECK, test, waitForPersistedQueries, waitForServiceWorkerControl } from './fixtures';

const SURVEY_NAME = '2026 annual fringe-field check';

interface StoredAttachment {
  recordId: string;
  kind: string;
  mime: string;
  bytes: number;
  sha256: string;
  data: number[];
}

/** Straight from IndexedDB (not through the app): every attachment, its bytes as numbers. */
function storedAttachments(page: Page): Promise<StoredAttachment[]> {
  return page.evaluate(
    () =>
      new Promise<StoredAttachment[]>((resolve, reject) => {
        const open = indexedDB.open('fringewalk');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const r = open.result.transaction('attachments').objectStore('attachments').getAll();
          r.onsuccess = () => {
            open.result.close();
            resolve((r.result as Array<StoredAttachment & { data: ArrayBuffer }>).map((a) => ({ ...a, data: [...new Uint8Array(a.data)] })));
          };
          r.onerror = () => reject(r.error);
        };
      }),
  );
}

function storedRecord(page: Page, store: 'fieldReadings' | 'sweeps', id: string): Promise<Record<string, unknown> | undefined> {
  return page.evaluate(
    ({ store, id }) =>
      new Promise<Record<string, unknown> | undefined>((resolve, reject) => {
        const open = indexedDB.open('fringewalk');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const r = open.result.transaction(store).objectStore(store).get(id);
          r.onsuccess = () => {
            open.result.close();
            resolve(r.result as Record<string, unknown> | undefined);
          };
        };
      }),
    { store, id },
  );
}

async function tapPlan(page: Page, fx: number, fy: number) {
  const box = await page.locator('.leaflet-container').boundingBox();
  if (!box) throw new Error('no plan on screen');
  await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
}

/** Sign in, take the demo survey offline, cut the network and open the capture screen. */
async function openCaptureOffline(page: Page, baseUrl: string, context: Parameters<typeof goOffline>[0]) {
  await login(page, baseUrl, DEMO_USERS.surveyor);
  await page.waitForURL(`${baseUrl}/`);
  await page.getByRole('link', { name: SURVEY_NAME }).first().click();
  await page.waitForURL(/\/surveys\/[0-9a-f-]+$/);
  await page.getByTestId('take-offline').click();
  await page.getByText('Ready to work offline').waitFor({ timeout: 30_000 });
  await waitForServiceWorkerControl(page);
  await waitForPersistedQueries(page, [['auth', 'session']]);
  await goOffline(context);
  await page.reload();
  await page.getByTestId('start-capture').click();
  await page.waitForURL(/\/capture$/);
  await page.locator('.leaflet-container[data-stations-drawn]').waitFor();
}

describe('photos, traces and plans with no scale, on the device', () => {
  test('a photo is shrunk before it is stored, a trace is kept as it is, and an uncalibrated plan says so', async ({ app, page, context, consoleErrors }) => {
    consoleErrors.expect(SIGNED_OUT_SESSION_CHECK, {
      text: /Failed to load resource|net::ERR_INTERNET_DISCONNECTED/,
      why: 'offline, the app asks the server for the session and the survey and is refused by the network',
    });
    await openCaptureOffline(page, app.baseUrl, context);

    // ---- a 3,200 × 2,400 JPEG, as a phone camera would give (an invented drawing made with sharp) ----
    const original = await planRaster('jpeg', 3200, 2400);
    await tapPlan(page, 0.3, 0.4);
    await page.getByLabel('|B|', { exact: true }).fill('0.61');
    await page.locator('#reading-photo').setInputFiles({ name: 'probe-at-door.jpg', mimeType: 'image/jpeg', buffer: original });
    await page.getByText('probe-at-door.jpg: resized on this device before it is stored.').waitFor();
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText('Reading saved on this device.').first().waitFor();
    await expect.poll(async () => (await storedAttachments(page)).filter((a) => a.kind === 'photo').length).toBe(1);
    const photo = (await storedAttachments(page)).find((a) => a.kind === 'photo')!;
    expect(photo.mime).toBe('image/jpeg');
    expect(photo.bytes).toBe(photo.data.length);
    expect(photo.bytes).toBeLessThan(original.length);
    // Still a JPEG: SOI marker FF D8 at the start, EOI FF D9 at the end (ITU-T T.81, Annex B).
    expect(photo.data.slice(0, 2)).toEqual([0xff, 0xd8]);
    expect(photo.data.slice(-2)).toEqual([0xff, 0xd9]);
    // And the browser decodes it at the shrunk size: long side 1,600 px, the 4:3 shape kept.
    const size = await page.evaluate(async (bytes) => {
      const bitmap = await createImageBitmap(new Blob([new Uint8Array(bytes)], { type: 'image/jpeg' }));
      return { width: bitmap.width, height: bitmap.height };
    }, photo.data);
    expect(size).toEqual({ width: 1600, height: 1200 });
    // The reading names the file by its SHA-256, checked with Node's own hash of the stored bytes.
    const reading = await storedRecord(page, 'fieldReadings', photo.recordId);
    expect(reading?.photoSha256).toBe(createHash('sha256').update(Buffer.from(photo.data)).digest('hex'));
    expect(photo.sha256).toBe(reading?.photoSha256);
    expect(reading?.photoObjectKey).toBeNull();

    // ---- a sweep with its trace file ----
    const csv = Buffer.from('frequency_hz,level_dbm\n2400000000,-71.2\n2425000000,-64.8\n2449600000,-52.5\n2475000000,-66.0\n2500000000,-70.9\n');
    await page.getByRole('tab', { name: 'Sweep' }).click();
    await page.getByLabel('Start frequency', { exact: true }).fill('2400');
    await page.getByLabel('Stop frequency', { exact: true }).fill('2500');
    await page.getByRole('button', { name: 'Add peak marker' }).click();
    await page.getByLabel('Peak 1 frequency', { exact: true }).fill('2449.6');
    await page.getByLabel('Peak 1 level (dBm)', { exact: true }).fill('-52.5');
    await page.locator('#sweep-trace').setInputFiles({ name: 'sweep-2g4.csv', mimeType: 'text/csv', buffer: csv });
    await expect.poll(() => page.getByTestId('trace-summary').textContent()).toContain('5 rows');
    await page.getByRole('button', { name: 'Save sweep' }).click();
    await page.getByText('Sweep saved on this device.').first().waitFor();
    await expect.poll(async () => (await storedAttachments(page)).filter((a) => a.kind === 'trace').length).toBe(1);
    const trace = (await storedAttachments(page)).find((a) => a.kind === 'trace')!;
    expect(Buffer.from(trace.data).equals(csv)).toBe(true);
    expect(trace.mime).toBe('text/csv');
    const sweep = await storedRecord(page, 'sweeps', trace.recordId);
    expect(sweep?.traceSha256).toBe(createHash('sha256').update(csv).digest('hex'));
    expect(sweep?.traceObjectKey).toBeNull();

    // ---- a plan with no scale yet: one metre per pixel, origin at the bottom-left corner, and a warning ----
    const plan = await page.evaluate(
      () =>
        new Promise<{ widthPx: number; heightPx: number }>((resolve, reject) => {
          const open = indexedDB.open('fringewalk');
          open.onsuccess = () => {
            const tx = open.result.transaction('plans', 'readwrite');
            const store = tx.objectStore('plans');
            const all = store.getAll();
            all.onsuccess = () => {
              // Every plan of the site loses its scale, as a freshly uploaded drawing has none.
              const plans = all.result as Array<Record<string, unknown> & { widthPx: number; heightPx: number }>;
              for (const p of plans) store.put({ ...p, metresPerPixel: null, originXPx: null, originYPx: null });
              tx.oncomplete = () => {
                open.result.close();
                resolve({ widthPx: plans[0]!.widthPx, heightPx: plans[0]!.heightPx });
              };
            };
            tx.onerror = () => reject(tx.error);
          };
        }),
    );
    await page.reload();
    await page.locator('.leaflet-container[data-stations-drawn]').waitFor();
    await page.getByText('Plan not calibrated: positions are in pixels').waitFor();
    // The plan is fitted to the view, so the middle of the map is the middle of the image:
    // (width/2, height/2) in "metres" that are pixels (src/features/capture/lib/plan-frame.ts).
    await tapPlan(page, 0.5, 0.5);
    const where = await page.getByTestId('station-panel').getByText(/x -?[\d.]+ m, y -?[\d.]+ m/).textContent();
    const [, x, y] = /x (-?[\d.]+) m, y (-?[\d.]+) m/.exec(where ?? '')!;
    expect(Math.abs(Number(x) - plan.widthPx / 2)).toBeLessThan(plan.widthPx * 0.02);
    expect(Math.abs(Number(y) - plan.heightPx / 2)).toBeLessThan(plan.heightPx * 0.02);
  });
});
