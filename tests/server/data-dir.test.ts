/**
 * Where the local cluster lives. As root, initdb and postgres run as an unprivileged user, so the data
 * folder must be reachable by "others"; a fresh clone has no .data/ yet, and that must not send the
 * first start elsewhere than the next ones (the data of the first start would seem lost).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { resolveDataDir } from '../../server/db/local-postgres';

const root = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-datadir-'));
fs.chmodSync(root, 0o755);
afterAll(() => fs.rmSync(root, { recursive: true, force: true }));
const isRoot = process.getuid?.() === 0;

describe('the local cluster folder', () => {
  it('is the asked-for folder when it and its parents do not exist yet', () => {
    const wanted = path.join(root, 'clone', '.data', 'pg');
    expect(resolveDataDir(wanted)).toBe(wanted);
    fs.mkdirSync(wanted, { recursive: true });
    expect(resolveDataDir(wanted)).toBe(wanted);
  });

  it('is made absolute', () => {
    expect(path.isAbsolute(resolveDataDir('.data/pg'))).toBe(true);
  });

  it.runIf(isRoot)('as root, falls back to a stable folder when a parent is closed to others, and says so', () => {
    const closed = path.join(root, 'closed');
    fs.mkdirSync(closed, { mode: 0o700 });
    fs.chmodSync(closed, 0o700);
    const messages: string[] = [];
    const first = resolveDataDir(path.join(closed, '.data', 'pg'), (m) => messages.push(m));
    expect(first).not.toContain(closed);
    expect(resolveDataDir(path.join(closed, '.data', 'pg'))).toBe(first);
    expect(messages.join(' ')).toMatch(/cannot reach/);
  });
});
