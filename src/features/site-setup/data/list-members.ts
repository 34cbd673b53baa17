import { queryOptions, useQuery } from '@tanstack/react-query';
import { MemberListSchema } from '@shared/schemas/member';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listMembers(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/members`, MemberListSchema, { signal });
}

export const membersQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.members(organisationId),
    queryFn: ({ signal }) => listMembers(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useMembers(organisationId: string, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...membersQueryOptions(organisationId), enabled: enabled && organisationId !== '' });
}
