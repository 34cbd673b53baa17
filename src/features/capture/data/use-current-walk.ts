import { useLiveQuery } from 'dexie-react-hooks';
import type { Walk } from '@shared/schemas/capture';
import { normaliseWalk } from '@/db';
import { getDeviceId } from './device';
import { findOpenWalk } from './start-walk';

/** This device's open walk in the survey: undefined while loading, null when none is open. */
export function useCurrentWalk(surveyId: string): Walk | null | undefined {
  return useLiveQuery(async () => {
    const walk = await findOpenWalk(surveyId, await getDeviceId());
    return walk ? normaliseWalk(walk) : null;
  }, [surveyId]);
}
