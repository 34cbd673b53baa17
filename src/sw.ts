/// <reference lib="webworker" />
/**
 * The service worker: precaches the built app shell (HTML, JS, CSS, fonts, icons, manifest) so the
 * app opens with no network after the first visit, and answers every navigation with index.html
 * (the router takes it from there) — except /api/, which must always reach the server.
 * skipWaiting + clientsClaim: without them a freshly installed worker never controls the open page.
 */
import { clientsClaim } from 'workbox-core';
import { cleanupOutdatedCaches, createHandlerBoundToURL, precacheAndRoute, type PrecacheEntry } from 'workbox-precaching';
import { NavigationRoute, registerRoute } from 'workbox-routing';

declare const self: ServiceWorkerGlobalScope & { __WB_MANIFEST: Array<PrecacheEntry | string> };

void self.skipWaiting();
clientsClaim();
cleanupOutdatedCaches();
precacheAndRoute(self.__WB_MANIFEST);
registerRoute(new NavigationRoute(createHandlerBoundToURL('index.html'), { denylist: [/^\/api\//] }));
