/**
 * File uploads with real progress. fetch() reports no upload progress, so this one request type goes
 * through XMLHttpRequest (upload.onprogress); every failure still becomes an ApiRequestError shaped
 * like the JSON client's, so forms and toasts treat both alike.
 */
import type { z } from 'zod';
import { ApiErrorSchema } from '@shared/schemas/common';
import { ApiRequestError, CLIENT_ERROR_CODES } from '@/lib/api';

/** A large plan over a slow link takes a while; give up only after this long without an answer. */
export const UPLOAD_TIMEOUT_MS = 5 * 60_000;

export interface UploadProgress {
  loadedBytes: number;
  totalBytes: number;
  /** 0…1, or null while the browser does not know the total yet. */
  fraction: number | null;
}

export interface UploadOptions<S extends z.ZodType> {
  method?: 'POST' | 'PUT';
  /** Multipart field name the server reads (multer's `upload.single(field)`). */
  field?: string;
  schema: S;
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
}

function errorFromXhr(xhr: XMLHttpRequest): ApiRequestError {
  let body: unknown;
  try {
    body = JSON.parse(xhr.responseText);
  } catch {
    body = undefined;
  }
  const parsed = ApiErrorSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiRequestError({ status: xhr.status, code, message, details });
  }
  const message =
    xhr.status === 413
      ? 'The file is too large for the server.'
      : xhr.status >= 500
        ? 'The server had a problem. Try again shortly.'
        : `The upload failed (HTTP ${xhr.status}).`;
  return new ApiRequestError({ status: xhr.status, code: `HTTP_${xhr.status}`, message });
}

export function uploadWithProgress<S extends z.ZodType>(path: string, file: File, options: UploadOptions<S>): Promise<z.infer<S>> {
  const { method = 'POST', field = 'file', schema, onProgress, signal } = options;
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(method, path);
    xhr.withCredentials = true;
    xhr.timeout = UPLOAD_TIMEOUT_MS;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (event) => {
      onProgress?.({
        loadedBytes: event.loaded,
        totalBytes: event.lengthComputable ? event.total : file.size,
        fraction: event.lengthComputable && event.total > 0 ? event.loaded / event.total : null,
      });
    };
    xhr.onload = () => {
      if (xhr.status < 200 || xhr.status >= 300) {
        reject(errorFromXhr(xhr));
        return;
      }
      let json: unknown;
      try {
        json = JSON.parse(xhr.responseText);
      } catch {
        reject(new ApiRequestError({ status: xhr.status, code: CLIENT_ERROR_CODES.badResponse, message: 'The server sent an answer that is not JSON.' }));
        return;
      }
      const parsed = schema.safeParse(json);
      if (!parsed.success) {
        reject(
          new ApiRequestError({
            status: xhr.status,
            code: CLIENT_ERROR_CODES.badResponse,
            message: 'The server sent an answer this version of the app does not understand.',
            details: parsed.error.issues,
          }),
        );
        return;
      }
      resolve(parsed.data as z.infer<S>);
    };
    xhr.onerror = () =>
      reject(new ApiRequestError({ status: 0, code: CLIENT_ERROR_CODES.network, message: 'Cannot reach the server. Check the network connection.' }));
    xhr.ontimeout = () => reject(new ApiRequestError({ status: 0, code: CLIENT_ERROR_CODES.timeout, message: 'The upload took too long.' }));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    const form = new FormData();
    form.append(field, file, file.name);
    xhr.send(form);
  });
}
