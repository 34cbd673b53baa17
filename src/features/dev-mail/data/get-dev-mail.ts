import { queryOptions, useQuery } from '@tanstack/react-query';
import { DevMailListSchema } from '@shared/schemas/dev-mail';
import { api } from '@/lib/api';
import { devMailKeys } from './dev-mail-keys';

/** While the page is open, new messages show up without a reload. */
export const DEV_MAIL_REFRESH_MS = 5_000;

export function getDevMail({ signal }: { signal?: AbortSignal } = {}) {
  return api.get('/api/dev/mail', DevMailListSchema, { signal });
}

export const devMailQueryOptions = () =>
  queryOptions({
    queryKey: devMailKeys.list(),
    queryFn: ({ signal }) => getDevMail({ signal }),
    // Captured mail holds reset and invitation links: never keep it on the device.
    meta: { persist: false },
  });

export function useDevMail({ enabled = true, live = false }: { enabled?: boolean; live?: boolean } = {}) {
  return useQuery({ ...devMailQueryOptions(), enabled, refetchInterval: live ? DEV_MAIL_REFRESH_MS : false });
}
