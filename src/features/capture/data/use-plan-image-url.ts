import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useMemo } from 'react';
import { db } from '@/db';

/** An object URL of the plan's cached image (revoked when it changes or on unmount); null when none is cached, undefined while loading. */
export function usePlanImageUrl(planId: string | null | undefined): string | null | undefined {
  const row = useLiveQuery(async () => (planId ? ((await db.planImages.get(planId)) ?? null) : null), [planId]);
  const url = useMemo(() => (row ? URL.createObjectURL(new Blob([row.data], { type: row.mime })) : row), [row]);
  useEffect(
    () => () => {
      if (url) URL.revokeObjectURL(url);
    },
    [url],
  );
  return url;
}
