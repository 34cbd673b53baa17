import { useLiveQuery } from 'dexie-react-hooks';
import type { Walk } from '@shared/schemas/capture';
import { normaliseWalk } from '@/db';
import { readDeviceId } from './device';
import { findOpenWalk } from './start-walk';

/**
 * This device's open walk in the survey, or null. Read-only, so it may run inside a live query: a
 * device that has no id yet cannot have opened a walk.
 */
export async function queryCurrentWalk(surveyId: string): Promise<Walk | null> {
  const deviceId = await readDeviceId();
  if (!deviceId) return null;
  const walk = await findOpenWalk(surveyId, deviceId);
  return walk ? normaliseWalk(walk) : null;
}

/** This device's open walk in the survey: undefined while loading, null when none is open. */
export function useCurrentWalk(surveyId: string): Walk | null | undefined {
  return useLiveQuery(() => queryCurrentWalk(surveyId), [surveyId]);
}
