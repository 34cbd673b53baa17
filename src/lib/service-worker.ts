/**
 * Registers the service worker (production builds only: in dev Vite serves modules the worker
 * would cache stale). The worker calls skipWaiting + clientsClaim, so a new version takes control
 * at once; the page then offers a reload so old code and new assets never mix for long.
 */
import { Workbox } from 'workbox-window';
import { showToast } from './toast';

export function registerServiceWorker() {
  if (!('serviceWorker' in navigator)) return;
  const workbox = new Workbox('/sw.js', { scope: '/' });
  workbox.addEventListener('controlling', (event) => {
    if (event.isUpdate) showToast({ tone: 'info', message: 'Fringewalk was updated. Reload the page to use the new version.' });
  });
  workbox.register().catch(() => {
    showToast({ tone: 'danger', message: 'This browser did not install the offline copy of Fringewalk: it will not open without a network.' });
  });
}
