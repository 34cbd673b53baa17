/**
 * useCurrentWalk runs its query inside a Dexie live query, where read-write transactions are refused;
 * it once asked for the device id that way and crashed the screen that used it.
 */
import { renderHook, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { db } from '@/db';
import { endWalk, startWalk, useCurrentWalk } from '@/features/capture/data';
import { captureContext, type CaptureContext } from './capture-fixtures';

let c: CaptureContext;
beforeEach(async () => {
  await db.delete();
  await db.open();
  c = captureContext();
});
afterEach(() => {
  db.close();
});

describe('the current walk of this device', () => {
  it('is null on a device that has never walked, and follows a walk being started and ended', async () => {
    const { result } = renderHook(() => useCurrentWalk(c.surveyId));
    await waitFor(() => expect(result.current).toBeNull());
    const walk = await startWalk({ surveyId: c.surveyId, orgId: c.orgId, userId: c.userId });
    await waitFor(() => expect(result.current?.id).toBe(walk.id));
    await endWalk(walk.id);
    await waitFor(() => expect(result.current).toBeNull());
  });
});
