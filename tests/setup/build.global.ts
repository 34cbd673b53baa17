/**
 * Vitest global setup for the e2e project: one production build of the client (with the service
 * worker and its precache manifest) into a throwaway folder, so the browser tests run the files a
 * user would get. The folder is handed to tests as inject('clientDir') and removed afterwards.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    clientDir: string;
  }
}

const projectRoot = fileURLToPath(new URL('../..', import.meta.url));

export default async function setup(project: TestProject) {
  const outDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-e2e-client-'));
  // Vitest sets NODE_ENV=test, and Vite would then build React's development bundle with
  // import.meta.env.PROD false (no service worker). Build exactly as `npm run build` does.
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({
      root: projectRoot,
      configFile: path.join(projectRoot, 'vite.config.ts'),
      mode: 'production',
      logLevel: 'warn',
      build: { outDir, emptyOutDir: true, sourcemap: false },
    });
  } finally {
    process.env.NODE_ENV = nodeEnv;
  }
  if (!fs.existsSync(path.join(outDir, 'sw.js'))) throw new Error(`The client build in ${outDir} has no sw.js`);
  project.provide('clientDir', outDir);
  return () => {
    fs.rmSync(outDir, { recursive: true, force: true });
  };
}
