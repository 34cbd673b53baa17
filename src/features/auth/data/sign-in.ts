import { useMutation, useQueryClient } from '@tanstack/react-query';
import { SessionSchema, type SignIn } from '@shared/schemas/auth';
import { api } from '@/lib/api';
import { authKeys } from './auth-keys';

export function signIn(credentials: SignIn) {
  return api.post('/api/auth/sign-in', credentials, SessionSchema);
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => {
      // Another user may have used this device: drop their saved data before showing ours.
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== authKeys.all[0] });
      queryClient.setQueryData(authKeys.session(), session);
    },
  });
}
