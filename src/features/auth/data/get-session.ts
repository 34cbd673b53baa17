import { queryOptions, useQuery } from '@tanstack/react-query';
import { SessionSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api';
import { authKeys } from './auth-keys';

export function getSession({ signal }: { signal?: AbortSignal } = {}) {
  return api.get('/api/auth/session', SessionSchema, { signal });
}

export const sessionQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.session(),
    queryFn: ({ signal }) => getSession({ signal }),
  });

export function useSession({ enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...sessionQueryOptions(), enabled });
}
