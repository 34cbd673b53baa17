/**
 * The sync's wire calls, through the app's api client (same-origin, session cookie, errors as
 * ApiRequestError, bodies parsed with the shared schemas). File uploads and downloads need raw bodies
 * and headers the JSON client does not do, so they use fetch here with the same error shape.
 */
import { PullResponseSchema, PushResponseSchema, type PullResponse, type PushResponse } from '@shared/schemas/sync';
import type { Mutation } from '@shared/sync/mutation';
import { AttachmentUploadResultSchema, type AttachmentUploadResult } from '@shared/schemas/sync';
import { apiRequest, ApiRequestError, CLIENT_ERROR_CODES, errorFromResponse } from '@/lib/api';
import { markServerReachable, markServerUnreachable } from '@/lib/online-status';

/** A push of 500 readings with photos' hashes is ~400 KB; give slow links room. */
export const SYNC_REQUEST_TIMEOUT_MS = 60_000;

export function postPush(orgId: string, body: { deviceId: string; mutations: Mutation[] }, signal?: AbortSignal): Promise<PushResponse> {
  return apiRequest(`/api/orgs/${orgId}/sync/push`, { method: 'POST', body, schema: PushResponseSchema, signal, timeoutMs: SYNC_REQUEST_TIMEOUT_MS });
}

async function rawFetch(url: string, init: RequestInit, options: { callerSignal?: AbortSignal } = {}): Promise<Response> {
  try {
    const response = await fetch(url, { credentials: 'same-origin', ...init });
    markServerReachable();
    return response;
  } catch (cause) {
    if (options.callerSignal?.aborted) throw cause;
    markServerUnreachable();
    throw new ApiRequestError({ status: 0, code: CLIENT_ERROR_CODES.network, message: 'Cannot reach the server. Check the network connection.' });
  }
}

/**
 * One pull page. Sent with `cache: 'no-store'`: the same URL (same cursor) asked again later must reach
 * the server, never an HTTP cache — a cached page would skip every change made since it was stored.
 * `Cache-Control: no-cache` on the request says the same to caches that ignore the fetch option
 * (happy-dom's, which the client tests run in).
 */
export async function getPull(orgId: string, since: string, limit: number, signal?: AbortSignal): Promise<PullResponse> {
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(), SYNC_REQUEST_TIMEOUT_MS);
  const forward = () => controller.abort();
  signal?.addEventListener('abort', forward, { once: true });
  try {
    const response = await rawFetch(`/api/orgs/${orgId}/sync/pull?since=${encodeURIComponent(since)}&limit=${limit}`, {
      cache: 'no-store',
      headers: { Accept: 'application/json', 'Cache-Control': 'no-cache' },
      signal: controller.signal,
    }, { callerSignal: signal });
    if (!response.ok) throw await errorFromResponse(response);
    const parsed = PullResponseSchema.safeParse(await response.json().catch(() => undefined));
    if (!parsed.success) {
      throw new ApiRequestError({ status: response.status, code: CLIENT_ERROR_CODES.badResponse, message: 'The server sent an answer this version of the app does not understand.', details: parsed.error.issues });
    }
    return parsed.data as PullResponse;
  } finally {
    clearTimeout(timer);
    signal?.removeEventListener('abort', forward);
  }
}

/** PUT one whole file; the server checks it against the SHA-256 the record names. */
export async function putAttachment(
  orgId: string,
  file: { recordId: string; kind: 'photo' | 'trace'; data: ArrayBuffer; mime: string; sha256: string },
  signal?: AbortSignal,
): Promise<AttachmentUploadResult> {
  const response = await rawFetch(`/api/orgs/${orgId}/attachments/${file.recordId}/${file.kind}`, {
    method: 'PUT',
    headers: { 'Content-Type': file.mime, 'X-Content-SHA256': file.sha256, Accept: 'application/json' },
    body: file.data,
    signal,
  }, { callerSignal: signal });
  if (!response.ok) throw await errorFromResponse(response);
  const parsed = AttachmentUploadResultSchema.safeParse(await response.json().catch(() => undefined));
  if (!parsed.success) {
    throw new ApiRequestError({ status: response.status, code: CLIENT_ERROR_CODES.badResponse, message: 'The server sent an answer this version of the app does not understand.' });
  }
  return parsed.data;
}

export async function getAttachment(orgId: string, recordId: string, kind: 'photo' | 'trace', signal?: AbortSignal): Promise<{ data: ArrayBuffer; mime: string }> {
  const response = await rawFetch(`/api/orgs/${orgId}/attachments/${recordId}/${kind}`, { signal, cache: 'no-store', headers: { 'Cache-Control': 'no-cache' } }, { callerSignal: signal });
  if (!response.ok) throw await errorFromResponse(response);
  return { data: await response.arrayBuffer(), mime: response.headers.get('content-type')?.split(';')[0]?.trim() || 'application/octet-stream' };
}
