import { hashKey } from '@tanstack/react-query';
import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import type { ReactNode } from 'react';
import { ToastRegion } from '@/components/toast-region';
import { createQueryClient, persistOptions } from '@/lib/query-client';
import { authKeys } from '@/features/auth/data/auth-keys';

const sessionKey = authKeys.session();

export const queryClient = createQueryClient({
  // A 401 from any other query means the session ended: re-check it, which sends the user to sign-in.
  onUnauthenticated: (query) => {
    if (query.queryHash !== hashKey(sessionKey)) void queryClient.invalidateQueries({ queryKey: sessionKey });
  },
});

export function AppProviders({ children }: { children: ReactNode }) {
  return (
    <PersistQueryClientProvider client={queryClient} persistOptions={persistOptions}>
      {children}
      <ToastRegion />
    </PersistQueryClientProvider>
  );
}
