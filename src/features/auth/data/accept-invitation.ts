import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SessionSchema, type InvitationAcceptSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api';
import { authKeys } from './auth-keys';

export type InvitationAccept = z.infer<typeof InvitationAcceptSchema>;

export function acceptInvitation({ token, ...body }: InvitationAccept & { token: string }) {
  return api.post(`/api/invitations/${encodeURIComponent(token)}/accept`, body, SessionSchema);
}

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (session, { token }) => {
      queryClient.removeQueries({ queryKey: authKeys.invitation(token) });
      queryClient.setQueryData(authKeys.session(), session);
    },
  });
}
