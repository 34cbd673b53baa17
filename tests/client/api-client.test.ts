/**
 * The api client against the real server (its own database, no seed): every failure arrives as a
 * typed ApiRequestError with the server's code and message. Only the "proxy answered with an HTML
 * page" case uses a hand-made Response: the real server never answers that way.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SessionSchema } from '@shared/schemas/auth';
import { z } from 'zod';
import { ApiRequestError, apiRequest, CLIENT_ERROR_CODES, errorFromResponse, fieldIssues } from '@/lib/api';
import { onlineStatus } from '@/lib/online-status';
import { startTestApp, type TestApp } from '../setup/start-app';
import { closedPortUrl, pointWindowAt } from './helpers';

let app: TestApp;

beforeAll(async () => {
  app = await startTestApp({ seed: 'none' });
  pointWindowAt(app.baseUrl);
});
afterAll(async () => {
  await app?.close();
});

async function failure(promise: Promise<unknown>): Promise<ApiRequestError> {
  const error = await promise.then(
    () => {
      throw new Error('expected the request to fail');
    },
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(ApiRequestError);
  return error as ApiRequestError;
}

describe('api client', () => {
  it('parses a successful answer with the payload schema', async () => {
    const health = await apiRequest('/api/health', { schema: z.object({ ok: z.boolean(), database: z.enum(['up', 'down']) }) });
    expect(health).toEqual({ ok: true, database: 'up' });
  });

  it('when not signed in, the session request fails with 401 UNAUTHENTICATED', async () => {
    const error = await failure(apiRequest('/api/auth/session', { schema: SessionSchema }));
    expect(error.status).toBe(401);
    expect(error.code).toBe('UNAUTHENTICATED');
    expect(error.message.length).toBeGreaterThan(0);
    expect(error.isNetworkError).toBe(false);
  });

  it('a wrong password fails with 401 INVALID_CREDENTIALS and the server’s message', async () => {
    const error = await failure(
      apiRequest('/api/auth/sign-in', { method: 'POST', body: { email: 'nobody@harrowby.example', password: 'not-a-password' }, schema: SessionSchema }),
    );
    expect(error.status).toBe(401);
    expect(error.code).toBe('INVALID_CREDENTIALS');
  });

  it('a body that fails validation carries field issues the form can place next to its fields', async () => {
    const error = await failure(apiRequest('/api/auth/sign-in', { method: 'POST', body: { email: 'not-an-email', password: 'x' } }));
    expect(error.status).toBe(400);
    expect(error.code).toBe('VALIDATION_FAILED');
    expect(fieldIssues(error).map((issue) => issue.field)).toContain('email');
  });

  it('an unknown API route is a JSON 404 NOT_FOUND', async () => {
    const error = await failure(apiRequest('/api/no-such-route', { schema: z.object({}) }));
    expect(error.status).toBe(404);
    expect(error.code).toBe('NOT_FOUND');
  });

  it('an answer that does not match the schema is BAD_RESPONSE, not a crash later', async () => {
    const error = await failure(apiRequest('/api/health', { schema: z.object({ ok: z.literal('yes') }) }));
    expect(error.code).toBe(CLIENT_ERROR_CODES.badResponse);
    expect(error.status).toBe(200);
  });

  it('no server at all is status 0 NETWORK_ERROR, and marks the server unreachable', async () => {
    const error = await failure(apiRequest(`${await closedPortUrl()}/api/health`, { schema: z.object({}) }));
    expect(error.status).toBe(0);
    expect(error.code).toBe(CLIENT_ERROR_CODES.network);
    expect(error.isNetworkError).toBe(true);
    expect(onlineStatus.get()).toMatchObject({ online: false, reason: 'server-unreachable' });
    // The next answered request brings it back.
    await apiRequest('/api/health', { schema: z.object({ ok: z.boolean() }) });
    expect(onlineStatus.get().online).toBe(true);
  });

  it('a non-JSON error page (from a proxy in front of the server) still becomes a typed error', async () => {
    const error = await errorFromResponse(new Response('<html>Bad gateway</html>', { status: 502, headers: { 'Content-Type': 'text/html' } }));
    expect(error).toMatchObject({ status: 502, code: 'HTTP_502' });
    expect(error.message).toMatch(/server had a problem/);
  });

  it('reads field issues in the other common detail shapes', () => {
    const fromList = new ApiRequestError({ status: 400, code: 'X', message: 'm', details: [{ path: ['name'], message: 'Enter your name.' }] });
    const fromMap = new ApiRequestError({ status: 400, code: 'X', message: 'm', details: { fieldErrors: { password: ['Too short.'] } } });
    expect(fieldIssues(fromList)).toEqual([{ field: 'name', message: 'Enter your name.' }]);
    expect(fieldIssues(fromMap)).toEqual([{ field: 'password', message: 'Too short.' }]);
  });
});
