/**
 * The client for `npm start`: built with Vite's build() API into dist/, skipped when dist/ is newer
 * than every input (src/, shared/, public/, index.html and the config files), so a restart is fast.
 * For `npm run dev`, Vite's dev server in middleware mode, mounted in the same Express app.
 */
import fs from 'node:fs';
import type { Server } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const PROJECT_ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const DIST_DIR = path.join(PROJECT_ROOT, 'dist');
const INPUTS = ['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package.json'];

function newestMtimeMs(target: string): number {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(target);
  } catch {
    return 0;
  }
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) {
    if (entry === 'node_modules' || entry.startsWith('.')) continue;
    newest = Math.max(newest, newestMtimeMs(path.join(target, entry)));
  }
  return newest;
}

export function clientBuildIsFresh(root = PROJECT_ROOT, distDir = DIST_DIR): boolean {
  const built = newestMtimeMs(path.join(distDir, 'index.html'));
  if (built === 0) return false;
  const inputs = Math.max(...INPUTS.map((name) => newestMtimeMs(path.join(root, name))));
  return built > inputs;
}

export async function buildClient(log: (message: string) => void): Promise<string> {
  if (clientBuildIsFresh()) {
    log('The client build in dist/ is up to date.');
    return DIST_DIR;
  }
  log('Building the client with Vite (a few seconds)…');
  const started = Date.now();
  const { build } = await import('vite');
  await build({ root: PROJECT_ROOT, configFile: path.join(PROJECT_ROOT, 'vite.config.ts'), logLevel: 'warn', mode: 'production' });
  log(`Client built in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  return DIST_DIR;
}

export async function createViteDevMiddleware(httpServer: Server) {
  const { createServer } = await import('vite');
  const vite = await createServer({
    root: PROJECT_ROOT,
    configFile: path.join(PROJECT_ROOT, 'vite.config.ts'),
    appType: 'spa',
    // HMR shares the app's own HTTP server, so dev is one port too.
    server: { middlewareMode: true, hmr: { server: httpServer } },
  });
  return vite;
}
