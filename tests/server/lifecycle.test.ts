/**
 * The project-local PostgreSQL lifecycle, for real, on a throwaway folder: start, create a database,
 * stop; a stale postmaster.pid (its process long gone, as after a crash or kill -9) does not block the
 * next start; data written before a stop is there after the next start.
 */
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { freePort, makeThrowawayDir, startLocalPostgres, type LocalPostgres } from '../../server/db/local-postgres';

async function query<T extends pg.QueryResultRow>(url: string, text: string): Promise<T[]> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return (await client.query<T>(text)).rows;
  } finally {
    await client.end();
  }
}

async function accepts(url: string): Promise<boolean> {
  try {
    await query(url, 'SELECT 1');
    return true;
  } catch {
    return false;
  }
}

/** A pid with no process behind it: higher than any pid the kernel will hand out here. */
function deadPid(): number {
  const max = Number(fs.readFileSync('/proc/sys/kernel/pid_max', 'utf8').trim());
  for (let pid = max - 1; pid > 1; pid -= 1) {
    try {
      process.kill(pid, 0);
    } catch {
      return pid;
    }
  }
  throw new Error('no free pid found');
}

describe('the local PostgreSQL lifecycle', () => {
  const dir = makeThrowawayDir('fringewalk-lifecycle-');
  let running: LocalPostgres | null = null;
  afterAll(async () => {
    await running?.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('starts on 127.0.0.1, creates the database, keeps data across stop/start and is not blocked by a stale pid file', async () => {
    const port = await freePort();
    running = await startLocalPostgres({ dataDir: dir, port, database: 'lifecycle_check', throwaway: true });
    expect(running.url).toBe(`postgres://fringewalk@127.0.0.1:${port}/lifecycle_check`);
    const [{ db }] = await query<{ db: string }>(running.url, 'SELECT current_database() AS db') as [{ db: string }];
    expect(db).toBe('lifecycle_check');
    const [{ addr }] = (await query<{ addr: string }>(running.url, "SELECT current_setting('listen_addresses') AS addr")) as [{ addr: string }];
    expect(addr).toBe('127.0.0.1');
    await query(running.url, 'CREATE TABLE kept (note text)');
    await query(running.url, "INSERT INTO kept VALUES ('before the stop')");

    const clusterDir = path.join(running.dataDir, 'cluster');
    await running.stop();
    running = null;
    expect(await accepts(`postgres://fringewalk@127.0.0.1:${port}/lifecycle_check`)).toBe(false);
    expect(fs.existsSync(path.join(clusterDir, 'postmaster.pid'))).toBe(false);

    // What a crash leaves behind: a pid file naming a process that no longer exists.
    const pidFile = path.join(clusterDir, 'postmaster.pid');
    fs.writeFileSync(pidFile, `${deadPid()}\n${clusterDir}\n1700000000\n${port}\n${path.join(dir, 'sock')}\n127.0.0.1\n  ${port}001   0\nready\n`);

    running = await startLocalPostgres({ dataDir: dir, port, database: 'lifecycle_check', throwaway: true });
    expect(await query<{ note: string }>(running.url, 'SELECT note FROM kept')).toEqual([{ note: 'before the stop' }]);
    await running.stop();
    running = null;

    // After a reboot the old pid may belong to some other live process; PostgreSQL alone would then
    // refuse to start ("is another postmaster running?"). This process is alive and is not postgres.
    fs.writeFileSync(pidFile, `${process.pid}\n${clusterDir}\n1700000000\n${port}\n${path.join(dir, 'sock')}\n127.0.0.1\n  ${port}001   0\nready\n`);
    running = await startLocalPostgres({ dataDir: dir, port, database: 'lifecycle_check', throwaway: true });
    expect(await query<{ note: string }>(running.url, 'SELECT note FROM kept')).toEqual([{ note: 'before the stop' }]);
    await running.stop();
    running = null;
    expect(await accepts(`postgres://fringewalk@127.0.0.1:${port}/lifecycle_check`)).toBe(false);
  });
});
