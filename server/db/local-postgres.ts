/**
 * A project-local PostgreSQL server on loopback, for `npm start`, `npm run dev` and the tests.
 *
 * Duties, in order: find the server binaries (PATH, then /usr/lib/postgresql/<version>/bin); when
 * none are found and we are root on Debian, install the `postgresql` package with apt-get; otherwise
 * stop with one sentence naming the package. Then initialise a cluster in a data folder (as root, owned
 * by an unprivileged system user, because initdb and postgres refuse to run as root), start it on
 * 127.0.0.1 only with its unix socket inside the data folder, and stop it cleanly on request.
 * A stale postmaster.pid left by a crash is detected (no live postgres process behind it) and removed.
 */
import { execFile, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';

const execFileAsync = promisify(execFile);

export class PostgresSetupError extends Error {
  override name = 'PostgresSetupError';
}

export interface LocalPostgresOptions {
  /** Folder that holds the cluster (created if missing). */
  dataDir: string;
  port: number;
  /** Database to create if it does not exist. */
  database: string;
  /** Throwaway clusters for tests trade durability for speed. Never for real data. */
  throwaway?: boolean;
  log?: (message: string) => void;
}

export interface LocalPostgres {
  /** postgres://… URL of the database on the local server. */
  url: string;
  /** URL of the maintenance database, for CREATE/DROP DATABASE. */
  adminUrl: string;
  dataDir: string;
  port: number;
  /** Stops the server if this process started it; safe to call twice. */
  stop(): Promise<void>;
}

const DB_USER = 'fringewalk';
const UNPRIVILEGED_USERS = ['postgres', 'fringewalk-db'];

function isRoot(): boolean {
  return typeof process.getuid === 'function' && process.getuid() === 0;
}

function hasBinaries(dir: string): boolean {
  return ['initdb', 'pg_ctl', 'postgres'].every((name) => fs.existsSync(path.join(dir, name)));
}

/** Folder holding initdb, pg_ctl and postgres, or null. PATH first, then Debian's versioned folders (newest first). */
export function findPostgresBinDir(): string | null {
  for (const dir of (process.env.PATH ?? '').split(path.delimiter)) {
    if (!dir) continue;
    const initdb = path.join(dir, 'initdb');
    if (fs.existsSync(initdb)) {
      // Debian links only some tools into PATH; follow the link to the versioned folder.
      const real = path.dirname(fs.realpathSync(initdb));
      if (hasBinaries(real)) return real;
      if (hasBinaries(dir)) return dir;
    }
  }
  const debianRoot = '/usr/lib/postgresql';
  if (fs.existsSync(debianRoot)) {
    const versions = fs
      .readdirSync(debianRoot)
      .filter((v) => /^\d+(\.\d+)?$/.test(v))
      .sort((a, b) => Number(b) - Number(a));
    for (const version of versions) {
      const dir = path.join(debianRoot, version, 'bin');
      if (hasBinaries(dir)) return dir;
    }
  }
  return null;
}

/** Finds the binaries, installing Debian's `postgresql` package when we are root and it is missing. */
export function ensurePostgresBinaries(log: (m: string) => void = () => {}): string {
  const found = findPostgresBinDir();
  if (found) return found;
  const debian = fs.existsSync('/etc/debian_version');
  if (isRoot() && debian) {
    log('PostgreSQL server not found: installing the Debian package "postgresql" with apt-get…');
    const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
    const update = spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
    const install = spawnSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env });
    if (update.status !== 0 || install.status !== 0) {
      throw new PostgresSetupError('Installing the PostgreSQL server failed: run "apt-get install postgresql" as root, then try again.');
    }
    const after = findPostgresBinDir();
    if (after) return after;
  }
  throw new PostgresSetupError(
    'No PostgreSQL server was found: install the "postgresql" package (for example "sudo apt-get install postgresql"), or set DATABASE_URL to an existing server.',
  );
}

function userExists(name: string): boolean {
  return spawnSync('id', ['-u', name], { stdio: 'ignore' }).status === 0;
}

/** The unprivileged system user that owns the cluster when we run as root. */
function ensureClusterUser(): string {
  for (const name of UNPRIVILEGED_USERS) if (userExists(name)) return name;
  const name = UNPRIVILEGED_USERS[1]!;
  const made = spawnSync('useradd', ['--system', '--no-create-home', '--shell', '/usr/sbin/nologin', name], { stdio: 'inherit' });
  if (made.status !== 0) throw new PostgresSetupError(`Could not create the system user "${name}" that runs the local PostgreSQL server.`);
  return name;
}

function uidGid(user: string): { uid: number; gid: number } {
  const uid = Number(spawnSync('id', ['-u', user], { encoding: 'utf8' }).stdout.trim());
  const gid = Number(spawnSync('id', ['-g', user], { encoding: 'utf8' }).stdout.trim());
  return { uid, gid };
}

/** True when every ancestor of `dir` lets "others" enter it, so an unprivileged user can reach it. */
function reachableByOthers(dir: string): boolean {
  let current = path.resolve(dir);
  for (;;) {
    const parent = path.dirname(current);
    if (parent === current) return true;
    current = parent;
    // A folder that does not exist yet will be made by us with the usual 0755 mode; only the ones
    // that exist can lock the unprivileged user out. (Treating a missing one as unreachable sent the
    // first start of a fresh clone to the fallback folder and every later start to .data/.)
    if (!fs.existsSync(current)) continue;
    if ((fs.statSync(current).mode & 0o001) === 0) return false;
  }
}

/**
 * As root, the data folder must be reachable by the unprivileged user. A project under /root is not,
 * so fall back to a stable folder under /var/tmp named after the project path (said in the log).
 */
export function resolveDataDir(preferred: string, log: (m: string) => void = () => {}): string {
  preferred = path.resolve(preferred);
  if (!isRoot() || reachableByOthers(preferred)) return preferred;
  const hash = createHash('sha1').update(path.resolve(preferred)).digest('hex').slice(0, 10);
  const fallback = path.join('/var/tmp', `fringewalk-pg-${hash}`);
  log(`The unprivileged database user cannot reach ${preferred}; keeping the cluster in ${fallback} instead.`);
  return fallback;
}

interface RunAs {
  (bin: string, args: string[]): Promise<{ stdout: string; stderr: string }>;
}

function makeRunner(binDir: string, owner: string | null): RunAs {
  return async (bin, args) => {
    const exe = path.join(binDir, bin);
    if (owner) {
      return execFileAsync('runuser', ['-u', owner, '--', exe, ...args], { cwd: '/', maxBuffer: 8 << 20 });
    }
    return execFileAsync(exe, args, { cwd: '/', maxBuffer: 8 << 20 });
  };
}

function processIsPostgres(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch {
    return false;
  }
  try {
    const cmd = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8');
    return /postgres|postmaster/.test(cmd);
  } catch {
    return true; // alive, and we cannot tell: assume it is ours
  }
}

/** Removes postmaster.pid and socket lock files whose process is gone (left by a crash or a kill -9). */
function clearStaleLocks(clusterDir: string, socketDir: string, log: (m: string) => void): 'clear' | 'running' {
  const pidFile = path.join(clusterDir, 'postmaster.pid');
  if (!fs.existsSync(pidFile)) return 'clear';
  const pid = Number(fs.readFileSync(pidFile, 'utf8').split('\n')[0]);
  if (Number.isInteger(pid) && pid > 0 && processIsPostgres(pid)) return 'running';
  log('Removing a stale postmaster.pid left by an earlier run.');
  fs.rmSync(pidFile, { force: true });
  if (fs.existsSync(socketDir)) {
    for (const name of fs.readdirSync(socketDir)) {
      if (name.startsWith('.s.PGSQL.')) fs.rmSync(path.join(socketDir, name), { force: true });
    }
  }
  return 'clear';
}

async function waitForConnections(binDir: string, socketDir: string, port: number, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const ready = spawnSync(path.join(binDir, 'pg_isready'), ['-h', '127.0.0.1', '-p', String(port), '-q'], { stdio: 'ignore' });
    if (ready.status === 0) return;
    if (Date.now() > deadline) throw new PostgresSetupError(`PostgreSQL did not accept connections on 127.0.0.1:${port} in time (socket folder ${socketDir}).`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function createDatabaseIfMissing(binDir: string, port: number, database: string): Promise<void> {
  const psql = path.join(binDir, 'psql');
  const exists = spawnSync(psql, ['-h', '127.0.0.1', '-p', String(port), '-U', DB_USER, '-d', 'postgres', '-tAc', `SELECT 1 FROM pg_database WHERE datname = '${database.replace(/'/g, "''")}'`], {
    encoding: 'utf8',
  });
  if (exists.status !== 0) throw new PostgresSetupError(`Could not query the local PostgreSQL server: ${exists.stderr.trim()}`);
  if (exists.stdout.trim() === '1') return;
  const made = spawnSync(path.join(binDir, 'createdb'), ['-h', '127.0.0.1', '-p', String(port), '-U', DB_USER, database], { encoding: 'utf8' });
  if (made.status !== 0) throw new PostgresSetupError(`Could not create the database "${database}": ${made.stderr.trim()}`);
}

export async function startLocalPostgres(options: LocalPostgresOptions): Promise<LocalPostgres> {
  const log = options.log ?? (() => {});
  const binDir = ensurePostgresBinaries(log);
  const owner = isRoot() ? ensureClusterUser() : null;
  const dataDir = resolveDataDir(options.dataDir, log);
  const clusterDir = path.join(dataDir, 'cluster');
  const socketDir = path.join(dataDir, 'sock');
  const run = makeRunner(binDir, owner);

  fs.mkdirSync(dataDir, { recursive: true });
  fs.mkdirSync(socketDir, { recursive: true, mode: 0o700 });
  fs.chmodSync(socketDir, 0o700);
  if (owner) {
    const { uid, gid } = uidGid(owner);
    fs.chownSync(dataDir, uid, gid);
    fs.chownSync(socketDir, uid, gid);
    if (fs.existsSync(clusterDir)) fs.chownSync(clusterDir, uid, gid);
  }

  if (!fs.existsSync(path.join(clusterDir, 'PG_VERSION'))) {
    log(`Initialising a PostgreSQL cluster in ${clusterDir}…`);
    fs.rmSync(clusterDir, { recursive: true, force: true });
    const args = ['-D', clusterDir, '-U', DB_USER, '-A', 'trust', '-E', 'UTF8', '--locale=C'];
    if (options.throwaway) args.push('--no-sync');
    try {
      await run('initdb', args);
    } catch (error) {
      throw new PostgresSetupError(`initdb failed: ${(error as { stderr?: string }).stderr ?? String(error)}`);
    }
  }

  const state = clearStaleLocks(clusterDir, socketDir, log);
  let startedHere = false;
  if (state === 'running') {
    log('A PostgreSQL server is already running on this data folder; using it.');
  } else {
    const serverOptions = [
      '-c listen_addresses=127.0.0.1',
      `-p ${options.port}`,
      `-c unix_socket_directories=${socketDir}`,
    ];
    if (options.throwaway) serverOptions.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off');
    const logFile = path.join(dataDir, 'postgres.log');
    if (owner && !fs.existsSync(logFile)) {
      fs.writeFileSync(logFile, '');
      const { uid, gid } = uidGid(owner);
      fs.chownSync(logFile, uid, gid);
    }
    try {
      await run('pg_ctl', ['-D', clusterDir, '-l', logFile, '-w', '-t', '30', '-o', serverOptions.join(' '), 'start']);
    } catch (error) {
      const tail = fs.existsSync(logFile) ? fs.readFileSync(logFile, 'utf8').split('\n').slice(-8).join('\n') : '';
      throw new PostgresSetupError(`PostgreSQL did not start on 127.0.0.1:${options.port}: ${(error as { stderr?: string }).stderr?.trim() || String(error)}\nIts log ends:\n${tail}`);
    }
    startedHere = true;
  }
  await waitForConnections(binDir, socketDir, options.port, 30_000);
  await createDatabaseIfMissing(binDir, options.port, options.database);

  let stopped = false;
  return {
    url: `postgres://${DB_USER}@127.0.0.1:${options.port}/${options.database}`,
    adminUrl: `postgres://${DB_USER}@127.0.0.1:${options.port}/postgres`,
    dataDir,
    port: options.port,
    async stop() {
      if (stopped || !startedHere) return;
      stopped = true;
      try {
        await run('pg_ctl', ['-D', clusterDir, '-m', 'fast', '-w', '-t', '30', 'stop']);
      } catch (error) {
        log(`Stopping PostgreSQL failed: ${(error as { stderr?: string }).stderr ?? String(error)}`);
      }
    },
  };
}

/** A free TCP port on 127.0.0.1, chosen by the kernel. */
export async function freePort(): Promise<number> {
  const net = await import('node:net');
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

/** A fresh temporary folder for a throwaway cluster (reachable by the unprivileged user when root). */
export function makeThrowawayDir(prefix = 'fringewalk-test-pg-'): string {
  const base = isRoot() ? '/var/tmp' : os.tmpdir();
  const dir = fs.mkdtempSync(path.join(base, prefix));
  fs.chmodSync(dir, 0o755);
  return dir;
}
