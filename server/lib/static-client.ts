/**
 * Serves the built PWA (dist/): hashed assets cached for a year, and the files that must never be
 * stale — index.html, the service worker and the manifest — with no-cache, so a new release reaches
 * devices on their next visit. Unknown paths outside /api get index.html (client-side routing);
 * /api/* never does, so an API typo is a JSON 404, not a page.
 */
import fs from 'node:fs';
import path from 'node:path';
import express, { Router, type Response } from 'express';

const NO_CACHE_FILES = /(^|\/)(index\.html|sw\.js|registerSW\.js|workbox-[^/]*\.js|manifest\.webmanifest|manifest\.json)$/;
const ONE_YEAR_S = 365 * 24 * 60 * 60;

export const isApiPath = (p: string) => p === '/api' || p.startsWith('/api/');

function setCacheHeaders(res: Response, filePath: string): void {
  const relative = filePath.split(path.sep).join('/');
  if (NO_CACHE_FILES.test(relative)) res.setHeader('Cache-Control', 'no-cache');
  else if (relative.includes('/assets/')) res.setHeader('Cache-Control', `public, max-age=${ONE_YEAR_S}, immutable`);
  else res.setHeader('Cache-Control', 'public, max-age=3600');
  if (relative.endsWith('.webmanifest')) res.setHeader('Content-Type', 'application/manifest+json');
  if (relative.endsWith('/sw.js')) res.setHeader('Service-Worker-Allowed', '/');
}

export function serveClient(clientDir: string): Router {
  const root = path.resolve(clientDir);
  const indexFile = path.join(root, 'index.html');
  const router = Router();
  router.use(express.static(root, { index: false, setHeaders: setCacheHeaders, fallthrough: true }));
  router.use((req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || isApiPath(req.path)) return next();
    // A missing file with an extension (an old hashed asset) is a 404, not the app shell.
    if (path.extname(req.path) !== '' && !req.path.endsWith('.html')) return next();
    if (!fs.existsSync(indexFile)) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexFile);
  });
  return router;
}
