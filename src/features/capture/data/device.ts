import { v7 as uuidv7 } from 'uuid';
import { db, toCaptureError } from '@/db';

const DEVICE_ID_KEY = 'deviceId';

/** This install's own id, made once and kept in the store (walks record it; it never leaves with a wipe of caches). */
/**
 * The device id if one has been made, read-only: safe inside a live query, where Dexie refuses the
 * read-write transaction getDeviceId needs to make one.
 */
export async function readDeviceId(): Promise<string | null> {
  const row = await db.meta.get(DEVICE_ID_KEY);
  return typeof row?.value === 'string' ? row.value : null;
}

export async function getDeviceId(): Promise<string> {
  try {
    return await db.transaction('rw', db.meta, async () => {
      const row = await db.meta.get(DEVICE_ID_KEY);
      if (typeof row?.value === 'string') return row.value;
      const id = uuidv7();
      await db.meta.put({ key: DEVICE_ID_KEY, value: id });
      return id;
    });
  } catch (error) {
    throw toCaptureError(error);
  }
}

/** A label a surveyor recognises in the review screens ("Chrome on Android"). */
export function deviceLabel(): string | null {
  if (typeof navigator === 'undefined') return null;
  const ua = navigator.userAgent;
  const browser = /Firefox\//.test(ua) ? 'Firefox' : /Edg\//.test(ua) ? 'Edge' : /Chrome\//.test(ua) ? 'Chrome' : /Safari\//.test(ua) ? 'Safari' : 'Browser';
  const os = /Android/.test(ua) ? 'Android' : /iPhone|iPad/.test(ua) ? 'iOS' : /Windows/.test(ua) ? 'Windows' : /Mac OS/.test(ua) ? 'macOS' : /Linux/.test(ua) ? 'Linux' : null;
  return os ? `${browser} on ${os}` : browser;
}
