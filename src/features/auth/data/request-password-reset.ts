import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { PasswordResetRequestSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api';

export type PasswordResetRequest = z.infer<typeof PasswordResetRequestSchema>;

/** The server answers 202 whether or not the address has an account (no account enumeration). */
export function requestPasswordReset(body: PasswordResetRequest) {
  return api.post('/api/auth/password-reset/request', body);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
