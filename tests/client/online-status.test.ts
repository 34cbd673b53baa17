/**
 * The online-status store and hook: the browser's own flag, plus a /api/health probe against the
 * real server (and against a port where nothing listens) deciding whether the server is reachable.
 */
import { act, renderHook } from '@testing-library/react';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { createOnlineStatusStore, useOnlineStatus } from '@/lib/online-status';
import { startTestApp, type TestApp } from '../setup/start-app';
import { closedPortUrl, pointWindowAt } from './helpers';

let app: TestApp;
const stops: Array<() => void> = [];

function setBrowserOnline(online: boolean) {
  // happy-dom has no network switch; this is the flag a real browser flips, then the event it fires.
  Object.defineProperty(window.navigator, 'onLine', { configurable: true, get: () => online });
  window.dispatchEvent(new Event(online ? 'online' : 'offline'));
}

beforeAll(async () => {
  app = await startTestApp({ seed: 'none' });
  pointWindowAt(app.baseUrl);
});
afterEach(() => {
  while (stops.length) stops.pop()!();
  setBrowserOnline(true);
});
afterAll(async () => {
  await app?.close();
});

describe('online status', () => {
  it('is online when the server answers /api/health', async () => {
    const store = createOnlineStatusStore();
    expect(await store.probe()).toBe(true);
    expect(store.get()).toMatchObject({ online: true, reason: 'online' });
  });

  it('counts a failed health probe as offline even while the browser says it is online', async () => {
    const store = createOnlineStatusStore({ healthUrl: `${await closedPortUrl()}/api/health` });
    expect(await store.probe()).toBe(false);
    expect(store.get()).toMatchObject({ online: false, reason: 'server-unreachable' });
  });

  it('follows the browser’s offline and online events, re-probing when the network returns', async () => {
    const store = createOnlineStatusStore({ onlineProbeIntervalMs: 60_000 });
    stops.push(store.start());
    const { result } = renderHook(() => useOnlineStatus(store));
    await expect.poll(() => result.current.online).toBe(true);

    act(() => setBrowserOnline(false));
    expect(result.current).toMatchObject({ online: false, reason: 'browser-offline' });

    act(() => setBrowserOnline(true));
    await expect.poll(() => result.current.reason).toBe('online');
  });

  it('keeps probing while the server is unreachable and recovers once it answers', async () => {
    const deadUrl = `${await closedPortUrl()}/api/health`;
    let probes = 0;
    // The first probe goes to a port where nothing listens; later ones reach the real server.
    const store = createOnlineStatusStore({
      offlineProbeIntervalMs: 50,
      fetchImpl: (input, init) => fetch(++probes === 1 ? deadUrl : input, init),
    });
    const seen: string[] = [];
    store.subscribe(() => seen.push(store.get().reason));
    stops.push(store.start());
    await expect.poll(() => seen).toEqual(['server-unreachable', 'online']);
    expect(probes).toBeGreaterThanOrEqual(2);
  });
});
