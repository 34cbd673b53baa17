import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { PasswordResetConfirmSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api';

export type PasswordResetConfirm = z.infer<typeof PasswordResetConfirmSchema>;

export function confirmPasswordReset(body: PasswordResetConfirm) {
  return api.post('/api/auth/password-reset/confirm', body);
}

export function useConfirmPasswordReset() {
  return useMutation({ mutationFn: confirmPasswordReset });
}
