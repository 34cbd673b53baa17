import { queryOptions, useQuery } from '@tanstack/react-query';
import { InvitationPreviewSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api';
import { authKeys } from './auth-keys';

export function getInvitation(token: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/invitations/${encodeURIComponent(token)}`, InvitationPreviewSchema, { signal });
}

export const invitationQueryOptions = (token: string) =>
  queryOptions({
    queryKey: authKeys.invitation(token),
    queryFn: ({ signal }) => getInvitation(token, { signal }),
    // An invitation is single-use; keeping its preview on the device would only go stale.
    meta: { persist: false },
    staleTime: 0,
  });

export function useInvitation(token: string) {
  return useQuery(invitationQueryOptions(token));
}
