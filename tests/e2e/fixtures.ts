/**
 * Browser-test fixtures: Debian's Chromium through playwright-core, the real server (its own
 * database with the demo seed) serving the production build from the e2e global setup, and a
 * console watcher that fails the test on any console error the test did not say it expects.
 */
import { test as base, expect, inject } from 'vitest';
import { chromium, type Browser, type BrowserContext, type ConsoleMessage, type Page } from 'playwright-core';
import { startTestApp, type TestApp } from '../setup/start-app';

export const CHROMIUM_PATH = '/usr/bin/chromium';
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** Demo accounts from the seed; the password is demo-only (README). */
export const DEMO_PASSWORD = 'fringewalk-demo';
export const DEMO_ORGANISATION = 'Harrowby Bridge Hospital & Research Campus';
export const DEMO_USERS = {
  admin: 'admin@harrowby.example',
  reviewer: 'reviewer@harrowby.example',
  emc: 'emc@harrowby.example',
  surveyor: 'surveyor@harrowby.example',
  viewer: 'viewer@harrowby.example',
} as const;

/** Key the query persister writes (src/lib/query-client.ts QUERY_CACHE_STORAGE_KEY). */
export const QUERY_CACHE_STORAGE_KEY = 'fringewalk.query-cache';

export const PHONE_VIEWPORT = { width: 390, height: 844 };
export const DESKTOP_VIEWPORT = { width: 1280, height: 860 };

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS });
}

export interface ExpectedConsoleError {
  /** Matched against the message text. */
  text: RegExp;
  /** Matched against the URL the message points at (for failed requests, the request's URL). */
  url?: RegExp;
  why: string;
}

/** Chromium logs a failed request as a console error; these are the ones the app causes on purpose. */
export const SIGNED_OUT_SESSION_CHECK: ExpectedConsoleError = {
  text: /status of 401/,
  url: /\/api\/auth\/session$/,
  why: 'the app asks for the session before anyone has signed in',
};

export class ConsoleWatcher {
  readonly errors: string[] = [];
  private readonly expected: ExpectedConsoleError[] = [];

  attach(page: Page) {
    page.on('console', (message: ConsoleMessage) => {
      if (message.type() !== 'error') return;
      const url = message.location().url ?? '';
      const ok = this.expected.some((e) => e.text.test(message.text()) && (!e.url || e.url.test(url)));
      if (!ok) this.errors.push(`${message.text()} @ ${url}`);
    });
    page.on('pageerror', (error) => this.errors.push(`uncaught: ${error.message}`));
  }

  expect(...errors: ExpectedConsoleError[]) {
    this.expected.push(...errors);
  }
}

interface FileFixtures {
  browser: Browser;
  app: TestApp;
}
interface TestFixtures {
  context: BrowserContext;
  page: Page;
  consoleErrors: ConsoleWatcher;
}

export const test = base.extend<FileFixtures & TestFixtures>({
  browser: [
    // eslint-disable-next-line no-empty-pattern
    async ({}, use) => {
      const browser = await launchBrowser();
      await use(browser);
      await browser.close();
    },
    { scope: 'file' },
  ],
  app: [
    // eslint-disable-next-line no-empty-pattern
    async ({}, use) => {
      const app = await startTestApp({ seed: 'demo', clientDir: inject('clientDir') });
      await use(app);
      await app.close();
    },
    { scope: 'file' },
  ],
  context: async ({ browser }, use) => {
    const context = await browser.newContext({ viewport: PHONE_VIEWPORT });
    // Fail in seconds, not at the test timeout, when an element never appears.
    context.setDefaultTimeout(10_000);
    await use(context);
    await context.close();
  },
  // eslint-disable-next-line no-empty-pattern
  consoleErrors: async ({}, use) => {
    const watcher = new ConsoleWatcher();
    await use(watcher);
    expect(watcher.errors, 'console errors the test did not expect').toEqual([]);
  },
  page: async ({ context, consoleErrors }, use) => {
    const page = await context.newPage();
    consoleErrors.attach(page);
    await use(page);
  },
});

/** Sign in through the real form, as a user would. */
export async function login(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Resolves once a service worker controls the page (so an offline reload is answered by it). */
export async function waitForServiceWorkerControl(page: Page) {
  await page.waitForFunction(() => navigator.serviceWorker?.controller?.state === 'activated', undefined, { timeout: 30_000 });
}

/**
 * Resolves once the query persister has written queries whose keys start with each given prefix
 * (it saves at most once a second, so reloading straight away would find nothing).
 */
export async function waitForPersistedQueries(page: Page, keyPrefixes: string[][]) {
  await page.waitForFunction(
    ({ storageKey, prefixes }) => {
      const raw = window.localStorage.getItem(storageKey);
      if (!raw) return false;
      const saved = JSON.parse(raw) as { clientState?: { queries?: Array<{ queryKey: unknown[]; state: { status: string } }> } };
      const queries = saved.clientState?.queries ?? [];
      return prefixes.every((prefix) =>
        queries.some((q) => q.state.status === 'success' && prefix.every((part, index) => q.queryKey[index] === part)),
      );
    },
    { storageKey: QUERY_CACHE_STORAGE_KEY, prefixes: keyPrefixes },
    { timeout: 15_000 },
  );
}

/** Cut the browser context off the network: uncached requests fail, navigator.onLine turns false. */
export async function goOffline(context: BrowserContext) {
  await context.setOffline(true);
}
