import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api';
import { clearSavedData } from '@/lib/query-client';

export function signOut() {
  return api.post('/api/auth/sign-out');
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    meta: { toastErrors: true },
    // Everything saved for offline reading belonged to this user; remove it from the device.
    onSuccess: () => clearSavedData(queryClient),
  });
}
