/**
 * Starts tests/setup/sync-server-child.ts as a real child process and talks to it over HTTP with
 * fetch: signing in, pushing and pulling like a device. Used by the fault tests and the benchmark.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import readline from 'node:readline';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const SCRIPT = path.join(ROOT, 'tests/setup/sync-server-child.ts');
export const CHILD_ORIGIN = 'http://127.0.0.1:5180';
export const CHILD_SESSION_SECRET = 'child-session-secret-that-is-long-enough-0123456789';

export interface ChildServer {
  child: ChildProcess;
  baseUrl: string;
  /** Resolves when the process has exited (any way). */
  exited: Promise<void>;
  memory(type: 'memory-reset' | 'memory-report'): Promise<Record<string, number>>;
  stop(): Promise<void>;
}

export async function startChildServer(databaseUrl: string, options: { ipc?: boolean } = {}): Promise<ChildServer> {
  // BENCH_PROFILE=1: the server writes a V8 CPU profile (.cpuprofile) into the system temp folder when it stops.
  const profile = process.env.BENCH_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${path.join(os.tmpdir(), 'fringewalk-server-profiles')}`] : [];
  const child = spawn(process.execPath, [...profile, '--import', 'tsx', SCRIPT], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: databaseUrl, SESSION_SECRET: CHILD_SESSION_SECRET, PUBLIC_URL: CHILD_ORIGIN, PORT: '0', NODE_NO_WARNINGS: '1' },
    stdio: options.ipc ? ['ignore', 'pipe', 'pipe', 'ipc'] : ['ignore', 'pipe', 'pipe'],
  });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  let stderr = '';
  child.stderr!.on('data', (c: Buffer) => (stderr += c.toString()));
  const port = await new Promise<number>((resolve, reject) => {
    const lines = readline.createInterface({ input: child.stdout! });
    const timer = setTimeout(() => reject(new Error(`child server did not start in 30 s:\n${stderr}`)), 30_000);
    lines.on('line', (line) => {
      try {
        const parsed = JSON.parse(line) as { port?: number };
        if (parsed.port) {
          clearTimeout(timer);
          resolve(parsed.port);
        }
      } catch {
        // not our line
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`child server exited (${code}) before listening:\n${stderr}`));
    });
  });
  return {
    child,
    baseUrl: `http://127.0.0.1:${port}`,
    exited,
    memory(type) {
      return new Promise((resolve) => {
        const onMessage = (m: { type?: string } & Record<string, number>) => {
          if (m.type !== type) return;
          child.off('message', onMessage);
          resolve(m);
        };
        child.on('message', onMessage);
        child.send({ type });
      });
    },
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 5_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

/** Signs in over HTTP and returns the session cookie pair. */
export async function signInOver(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: CHILD_ORIGIN },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('fw.sid='));
  if (!cookie) throw new Error('no session cookie');
  return cookie.split(';')[0]!;
}

export async function postJson(baseUrl: string, cookie: string, pathname: string, body: unknown): Promise<{ status: number; body: unknown }> {
  const res = await fetch(`${baseUrl}${pathname}`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: CHILD_ORIGIN, Cookie: cookie },
    body: JSON.stringify(body),
  });
  return { status: res.status, body: await res.json() };
}

export async function getJson(baseUrl: string, cookie: string, pathname: string): Promise<{ status: number; body: unknown }> {
  const res = await fetch(`${baseUrl}${pathname}`, { headers: { Cookie: cookie } });
  return { status: res.status, body: await res.json() };
}
