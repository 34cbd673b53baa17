/**
 * The one way the PWA talks to the server: same-origin JSON over fetch, the session cookie sent
 * automatically, every failure turned into an ApiRequestError (status 0 when no answer came back).
 * Successful bodies are parsed with the payload's zod schema from shared/schemas, so a server that
 * drifts from the contract fails loudly here instead of deep inside a component.
 */
import type { z } from 'zod';
import { ApiErrorSchema } from '@shared/schemas/common';
import { markServerReachable, markServerUnreachable } from './online-status';

/** Codes the client makes itself, for failures that never reached the server's error handler. */
export const CLIENT_ERROR_CODES = {
  network: 'NETWORK_ERROR',
  timeout: 'TIMEOUT',
  badResponse: 'BAD_RESPONSE',
} as const;

/** Slow links in basements are common; a request with no answer after this long counts as failed. */
export const REQUEST_TIMEOUT_MS = 20_000;

export class ApiRequestError extends Error {
  override readonly name = 'ApiRequestError';
  /** HTTP status, or 0 when no response arrived (offline, DNS, timeout). */
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(init: { status: number; code: string; message: string; details?: unknown }) {
    super(init.message);
    this.status = init.status;
    this.code = init.code;
    this.details = init.details;
  }

  /** True when the request never got an answer: show it as "offline", not as a server fault. */
  get isNetworkError(): boolean {
    return this.status === 0;
  }
}

export function isApiRequestError(error: unknown): error is ApiRequestError {
  return error instanceof ApiRequestError;
}

/** A field error the server reported for a request body, e.g. from zod validation. */
export interface FieldIssue {
  field: string;
  message: string;
}

/**
 * Field-level problems in `details`, whichever of the common shapes the server used:
 * `[{ path: ['email'], message }]`, `{ issues: [...] }`, or `{ fieldErrors: { email: ['…'] } }`.
 */
export function fieldIssues(error: ApiRequestError): FieldIssue[] {
  const details = error.details as unknown;
  const fromList = (list: unknown[]): FieldIssue[] =>
    list.flatMap((item) => {
      if (typeof item !== 'object' || item === null) return [];
      const { path, field, message } = item as { path?: unknown; field?: unknown; message?: unknown };
      const name = Array.isArray(path) ? path.join('.') : typeof path === 'string' ? path : field;
      return typeof name === 'string' && name !== '' && typeof message === 'string' ? [{ field: name, message }] : [];
    });
  if (Array.isArray(details)) return fromList(details);
  if (typeof details === 'object' && details !== null) {
    const { issues, fieldErrors } = details as { issues?: unknown; fieldErrors?: unknown };
    if (Array.isArray(issues)) return fromList(issues);
    if (typeof fieldErrors === 'object' && fieldErrors !== null) {
      return Object.entries(fieldErrors as Record<string, unknown>).flatMap(([field, messages]) => {
        const first: unknown = Array.isArray(messages) ? messages[0] : messages;
        return typeof first === 'string' ? [{ field, message: first }] : [];
      });
    }
  }
  return [];
}

function genericMessage(status: number): string {
  if (status === 401) return 'Please sign in again.';
  if (status === 403) return 'Your role does not allow this.';
  if (status === 404) return 'Not found.';
  if (status === 429) return 'Too many attempts. Wait a minute and try again.';
  if (status >= 500) return 'The server had a problem. Try again shortly.';
  return `The request failed (HTTP ${status}).`;
}

/** Turn a non-2xx response into an ApiRequestError, using the server's error shape when present. */
export async function errorFromResponse(response: Response): Promise<ApiRequestError> {
  let body: unknown;
  try {
    body = await response.json();
  } catch {
    body = undefined;
  }
  const parsed = ApiErrorSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiRequestError({ status: response.status, code, message, details });
  }
  return new ApiRequestError({ status: response.status, code: `HTTP_${response.status}`, message: genericMessage(response.status) });
}

export interface RequestOptions<S extends z.ZodType | undefined> {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  /** Schema for the success body; omit for 204-style answers. */
  schema?: S;
  signal?: AbortSignal;
  timeoutMs?: number;
}

type Result<S> = S extends z.ZodType ? z.infer<S> : undefined;

export async function apiRequest<S extends z.ZodType | undefined = undefined>(
  path: string,
  options: RequestOptions<S> = {},
): Promise<Result<S>> {
  const { method = 'GET', body, schema, signal, timeoutMs = REQUEST_TIMEOUT_MS } = options;
  const controller = new AbortController();
  let timedOut = false;
  const timer = setTimeout(() => {
    timedOut = true;
    controller.abort();
  }, timeoutMs);
  const forwardAbort = () => controller.abort();
  signal?.addEventListener('abort', forwardAbort, { once: true });

  let response: Response;
  try {
    response = await fetch(path, {
      method,
      credentials: 'same-origin',
      headers: {
        Accept: 'application/json',
        ...(body === undefined ? {} : { 'Content-Type': 'application/json' }),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: controller.signal,
    });
  } catch (cause) {
    // A caller's own cancellation (TanStack Query unmounting) is not a failure to report.
    if (signal?.aborted) throw cause;
    markServerUnreachable();
    throw timedOut
      ? new ApiRequestError({ status: 0, code: CLIENT_ERROR_CODES.timeout, message: 'The server took too long to answer.' })
      : new ApiRequestError({
          status: 0,
          code: CLIENT_ERROR_CODES.network,
          message: 'Cannot reach the server. Check the network connection.',
        });
  } finally {
    clearTimeout(timer);
    signal?.removeEventListener('abort', forwardAbort);
  }

  markServerReachable();
  if (!response.ok) throw await errorFromResponse(response);
  if (schema === undefined || response.status === 204) return undefined as Result<S>;

  let json: unknown;
  try {
    json = await response.json();
  } catch {
    throw new ApiRequestError({ status: response.status, code: CLIENT_ERROR_CODES.badResponse, message: 'The server sent an answer that is not JSON.' });
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    throw new ApiRequestError({
      status: response.status,
      code: CLIENT_ERROR_CODES.badResponse,
      message: 'The server sent an answer this version of the app does not understand.',
      details: parsed.error.issues,
    });
  }
  return parsed.data as Result<S>;
}

export const api = {
  get<S extends z.ZodType>(path: string, schema: S, options: { signal?: AbortSignal } = {}) {
    return apiRequest(path, { ...options, method: 'GET', schema });
  },
  post<S extends z.ZodType | undefined = undefined>(path: string, body?: unknown, schema?: S) {
    return apiRequest(path, { method: 'POST', body: body ?? {}, schema });
  },
};
