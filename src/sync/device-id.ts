import { v7 as uuidv7 } from 'uuid';
import type { FringewalkDb } from '@/db';

const DEVICE_ID_KEY = 'deviceId';

/**
 * This install's id, in the given store (the same `meta` row the capture feature's getDeviceId uses,
 * so walks and pushes name one device).
 */
export async function getDeviceIdIn(db: FringewalkDb): Promise<string> {
  return db.transaction('rw', db.meta, async () => {
    const row = await db.meta.get(DEVICE_ID_KEY);
    if (typeof row?.value === 'string') return row.value;
    const id = uuidv7();
    await db.meta.put({ key: DEVICE_ID_KEY, value: id });
    return id;
  });
}
