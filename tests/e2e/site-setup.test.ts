/**
 * Site setup from nothing, through the UI alone (issue 6): as the demo admin, create a site and a
 * level, upload a plan image, calibrate it, draw a room, add an overdue instrument, plan a survey and
 * assign the demo surveyor; the surveyor is e-mailed (local SMTP capture) and finds the survey on the
 * home screen. The plan image is invented for the test (drawn with sharp).
 * Set FRINGEWALK_SCREENSHOT_DIR to save screenshots of each screen (phone and desktop, light and hall).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect } from 'vitest';
import { DESKTOP_VIEWPORT, DEMO_USERS, login, PHONE_VIEWPORT, test } from './fixtures';

const shotsDir = process.env.FRINGEWALK_SCREENSHOT_DIR;
const PLAN_WIDTH_PX = 1200;
const PLAN_HEIGHT_PX = 800;
let workDir = '';
let planPath = '';

/** An invented floor plan: outer walls, a corridor and three rooms. */
async function drawPlan(file: string) {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${PLAN_WIDTH_PX}" height="${PLAN_HEIGHT_PX}">
    <rect width="100%" height="100%" fill="#ffffff"/>
    <g fill="none" stroke="#222" stroke-width="8">
      <rect x="40" y="40" width="1120" height="720"/>
      <line x1="40" y1="420" x2="1160" y2="420"/>
      <line x1="440" y1="40" x2="440" y2="420"/>
      <line x1="800" y1="40" x2="800" y2="420"/>
    </g>
    <text x="120" y="240" font-size="40" font-family="sans-serif">MR suite</text>
  </svg>`;
  await sharp(Buffer.from(svg)).png().toFile(file);
}

beforeAll(async () => {
  workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-site-setup-'));
  planPath = path.join(workDir, 'ground-floor.png');
  await drawPlan(planPath);
});
afterAll(() => {
  if (workDir) fs.rmSync(workDir, { recursive: true, force: true });
});

async function shoot(page: Page, name: string) {
  if (!shotsDir) return;
  const start = page.viewportSize() ?? PHONE_VIEWPORT;
  for (const theme of ['light', 'hall'] as const) {
    await page.evaluate((t) => {
      document.documentElement.dataset.theme = t;
    }, theme);
    for (const [size, viewport] of [
      ['phone', PHONE_VIEWPORT],
      ['desktop', DESKTOP_VIEWPORT],
    ] as const) {
      await page.setViewportSize(viewport);
      await page.waitForTimeout(150);
      await page.screenshot({ path: path.join(shotsDir, `site-${name}-${theme}-${size}.png`), fullPage: true });
    }
  }
  await page.evaluate(() => {
    document.documentElement.dataset.theme = 'light';
  });
  await page.setViewportSize(start);
}

/** Screen position of an image pixel on the plan map (the overlay is stretched over the original size). */
async function planPoint(page: Page, xPx: number, yPx: number) {
  const box = await page.locator('.leaflet-image-layer').first().boundingBox();
  if (!box) throw new Error('plan image not shown');
  return { x: box.x + (xPx / PLAN_WIDTH_PX) * box.width, y: box.y + (yPx / PLAN_HEIGHT_PX) * box.height, scale: box.width / PLAN_WIDTH_PX };
}

async function clickPlan(page: Page, xPx: number, yPx: number) {
  const p = await planPoint(page, xPx, yPx);
  await page.mouse.click(p.x, p.y);
}

describe('site setup', () => {
  test('an admin describes a new site from nothing and the assigned surveyor is e-mailed and sees the survey', async ({ app, page, browser }) => {
    await page.setViewportSize(DESKTOP_VIEWPORT);
    await login(page, app.baseUrl, DEMO_USERS.admin);
    await page.getByRole('link', { name: 'Site setup' }).click();
    await page.getByRole('heading', { name: 'Site setup' }).waitFor();
    await page.getByRole('table', { name: 'Sites' }).waitFor();
    await shoot(page, 'list');

    // Site and level
    await page.getByRole('button', { name: 'New site' }).click();
    await page.getByRole('button', { name: 'Create site' }).click();
    await page.getByText('Give it a name.').waitFor(); // the shared schema's message, next to the field
    await page.getByLabel('Site name').fill('Wexcombe Imaging Annexe');
    await page.getByLabel('Address (optional)').fill('1 Example Row, Harrowby Bridge');
    await page.getByRole('button', { name: 'Create site' }).click();
    await page.getByRole('heading', { name: 'Wexcombe Imaging Annexe', level: 1 }).waitFor();
    const siteUrl = page.url();
    await page.getByLabel('Level name').fill('Ground floor');
    await page.getByRole('button', { name: 'Add level' }).click();
    await page.getByRole('link', { name: 'Upload Ground floor plan' }).click();

    // Plan upload with progress
    await page.getByLabel('Plan image').setInputFiles(planPath);
    await page.getByRole('button', { name: 'Upload plan' }).click();
    await page.getByText('ground-floor.png uploaded.').waitFor();
    await page.locator('.leaflet-image-layer').first().waitFor();

    // Calibration: A and B 1000 px apart along the top wall, typed as 25 m → 0.025 m/px.
    await page.getByRole('button', { name: 'Pick two points on the plan' }).click();
    await clickPlan(page, 100, 40);
    await clickPlan(page, 1100, 40);
    await page.getByLabel('Distance between the two points').fill('25 m');
    const { scale } = await planPoint(page, 0, 0);
    // Clicks land on whole screen pixels: the picked span is 1000 px within one screen pixel's worth.
    const slack = 1 / scale;
    const shown = await page.getByTestId('metres-per-pixel').textContent();
    const mPerPx = Number.parseFloat(shown ?? '') * (shown?.includes('mm') ? 1e-3 : shown?.includes('cm') ? 1e-2 : 1);
    expect(mPerPx).toBeGreaterThan(25 / (1000 + 2 * slack));
    expect(mPerPx).toBeLessThan(25 / (1000 - 2 * slack));
    await page.getByRole('button', { name: 'Set the origin on the plan' }).click();
    await clickPlan(page, 40, 760);
    await page.getByRole('button', { name: 'Save calibration' }).click();
    await page.getByText('Calibration saved.').waitFor();
    await page.getByTestId('scale-bar').waitFor();
    await shoot(page, 'calibrate');

    // A room drawn on the plan with Geoman: four corners, then the first again to close it.
    await page.getByRole('tab', { name: 'Rooms' }).click();
    await page.getByRole('button', { name: 'Draw a room' }).click();
    for (const [x, y] of [
      [60, 60],
      [420, 60],
      [420, 400],
      [60, 400],
      [60, 60],
    ] as const) {
      await clickPlan(page, x, y);
    }
    await page.getByLabel('Room name').fill('MR scanner room');
    await page.getByLabel('Use (optional)').fill('3 T scanner');
    await page.getByLabel('Sensitivity').selectOption('high');
    await page.getByRole('button', { name: 'Save room' }).click();
    const room = page.getByTestId('room-card').filter({ hasText: 'MR scanner room' });
    await room.waitFor();
    // 360 × 340 px at 0.025 m/px = 9 m × 8.5 m = 76.5 m², within the click rounding.
    const area = Number.parseFloat((await room.textContent())?.match(/([\d.]+) m²/)?.[1] ?? 'NaN');
    expect(area).toBeGreaterThan(74);
    expect(area).toBeLessThan(79);
    await shoot(page, 'rooms');

    // An instrument whose calibration fell due in the past shows as overdue.
    await page.getByRole('link', { name: 'Instruments' }).click();
    await page.getByRole('button', { name: 'Add instrument' }).click();
    await page.getByLabel('Make and model').fill('Wexcombe HG-3 gaussmeter');
    await page.getByLabel('Serial number').fill('E2E-0001');
    await page.getByLabel('Calibrated on (optional)').fill('2020-01-15');
    await page.getByLabel('Calibration due on (optional)').fill('2021-01-15');
    await page.getByLabel('Relative uncertainty').fill('0.02');
    await page.getByRole('button', { name: 'Add instrument' }).click();
    const row = page.getByTestId('table-row').filter({ hasText: 'E2E-0001' });
    await row.getByTestId('overdue-badge').waitFor();
    await shoot(page, 'instruments');

    // A survey with the demo surveyor in its team.
    await page.goto(siteUrl);
    await page.getByRole('link', { name: 'New survey' }).click();
    await page.getByLabel('Survey name').fill('Annexe commissioning survey');
    // The site's levels are offered, all ticked; a survey must walk at least one.
    const groundLevel = page.getByRole('group', { name: 'Levels to survey' }).getByRole('checkbox', { name: 'Ground floor' });
    expect(await groundLevel.isChecked()).toBe(true);
    await groundLevel.uncheck();
    await page.getByRole('button', { name: 'Create survey' }).click();
    await page.getByText('Pick at least one level to survey.').waitFor();
    await groundLevel.check();
    await page.getByRole('button', { name: 'Create survey' }).click();
    await page.getByRole('heading', { name: 'Annexe commissioning survey' }).waitFor();
    expect(await page.getByRole('group', { name: 'Levels to survey' }).getByRole('checkbox', { name: 'Ground floor' }).isChecked()).toBe(true);
    // Stored with the organisation's default zone set (the server reads a null one as "no safety lines").
    expect(await page.getByLabel('Zone set').locator('option:checked').textContent()).toMatch(/the organisation’s default/);
    await page.getByRole('checkbox', { name: new RegExp(DEMO_USERS.surveyor) }).check();
    await page.getByRole('button', { name: 'Save team' }).click();
    await expect.poll(() => page.getByTestId('mailed').textContent()).toMatch(/E-mailed a link to/);
    const mail = await app.mail.waitFor((m) => m.to.includes(DEMO_USERS.surveyor) && m.text.includes('/surveys/'));
    expect(mail.text).toContain(app.baseUrl);
    await shoot(page, 'survey');

    await page.goto(siteUrl);
    await page.getByTestId('audit-entry').first().waitFor();
    await shoot(page, 'site');

    // The surveyor, on their own device, finds the survey on the home screen.
    const context = await browser.newContext({ viewport: PHONE_VIEWPORT });
    try {
      const surveyorPage = await context.newPage();
      await login(surveyorPage, app.baseUrl, DEMO_USERS.surveyor);
      await surveyorPage.getByTestId('survey-card').filter({ hasText: 'Annexe commissioning survey' }).waitFor();
    } finally {
      await context.close();
    }
  });
});
