/** Small helpers for supertest API tests: demo accounts, signing in, reading links out of e-mails. */
import type { Express } from 'express';
import pg from 'pg';
import request from 'supertest';
import { expect } from 'vitest';
import { SessionSchema, type Session } from '../../shared/schemas/auth';
import { ApiErrorSchema, type Role } from '../../shared/schemas/common';
import { TRUSTED_ORIGIN } from './test-app';

import { DEMO_PASSWORD } from '../../server/db/seed/demo-data';

/** The demo seed's shared password (demo data only). */
export { DEMO_PASSWORD };
export const demoEmail = (role: Role) => `${role}@harrowby.example`;
export const KESTREL_ADMIN = 'admin@kestrel.example';

export interface SignedIn {
  agent: ReturnType<typeof request.agent>;
  /** The raw `fw.sid=…` pair, for replaying the cookie by hand. */
  cookie: string;
  session: Session;
}

export function sessionCookie(res: request.Response): string {
  const header = res.headers['set-cookie'] as unknown as string[] | undefined;
  const line = header?.find((c) => c.startsWith('fw.sid='));
  if (!line) throw new Error('no fw.sid cookie in the response');
  return line.split(';')[0]!;
}

export async function signIn(app: Express, email: string, password = DEMO_PASSWORD): Promise<SignedIn> {
  const agent = request.agent(app);
  const res = await agent.post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email, password });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return { agent, cookie: sessionCookie(res), session: SessionSchema.parse(res.body) };
}

/** Asserts the one error shape and returns the code. */
export function expectError(res: request.Response, status: number, code?: string): void {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(res.headers['content-type']).toMatch(/application\/json/);
  const parsed = ApiErrorSchema.parse(res.body);
  if (code) expect(parsed.error.code).toBe(code);
}

/** The token at the end of a link like `${base}/invitations/<token>` or `…?token=<token>` in a mail text. */
export function tokenFromLink(text: string, pattern: RegExp): string {
  const match = pattern.exec(text);
  if (!match?.[1]) throw new Error(`no link matching ${pattern} in:\n${text}`);
  return decodeURIComponent(match[1]);
}

export async function countRows(databaseUrl: string, table: string, where = 'true'): Promise<number> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query<{ n: number }>(`SELECT count(*)::int AS n FROM "${table}" WHERE ${where}`);
    return rows[0]!.n;
  } finally {
    await client.end();
  }
}

export async function sql<T extends pg.QueryResultRow = pg.QueryResultRow>(databaseUrl: string, text: string, values: unknown[] = []): Promise<T[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    return (await client.query<T>(text, values)).rows;
  } finally {
    await client.end();
  }
}
