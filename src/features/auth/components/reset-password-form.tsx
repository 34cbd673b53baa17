import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { PasswordResetConfirmSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { Link } from 'react-router-dom';
import { isApiRequestError } from '@/lib/api';
import { applyRequestError } from '@/lib/form-errors';
import { useConfirmPasswordReset } from '../data/confirm-password-reset';

const NEEDS_NETWORK = 'Changing your password needs a network connection. Connect and try again.';

/** The shared payload schema plus a repeat field that never leaves the device. */
const ResetPasswordFormSchema = PasswordResetConfirmSchema.pick({ password: true })
  .extend({ repeatPassword: z.string() })
  .refine((values) => values.password === values.repeatPassword, { path: ['repeatPassword'], message: 'The two passwords differ.' });

export function ResetPasswordForm({ token, onDone }: { token: string; onDone: () => void }) {
  const confirm = useConfirmPasswordReset();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(ResetPasswordFormSchema), defaultValues: { password: '', repeatPassword: '' } });

  const onSubmit = handleSubmit(({ password }) => {
    setFormError(null);
    confirm.mutate(
      { token, password },
      {
        onSuccess: onDone,
        onError: (error) => setFormError(applyRequestError(error, setError, ['password'], { offlineMessage: NEEDS_NETWORK })),
      },
    );
  });

  const tokenInvalid = isApiRequestError(confirm.error) && confirm.error.code === 'TOKEN_INVALID';

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Choose a new password">
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters. A few unrelated words make a strong one."
        error={errors.password?.message}
        {...register('password')}
      />
      <Field label="Repeat the new password" type="password" autoComplete="new-password" error={errors.repeatPassword?.message} {...register('repeatPassword')} />
      {formError && (
        <Alert tone="danger" title={tokenInvalid ? 'This link no longer works' : 'Password not changed'}>
          {tokenInvalid ? (
            <>
              Reset links work once and expire. <Link to="/forgot-password">Request a new link</Link>.
            </>
          ) : (
            formError
          )}
        </Alert>
      )}
      <Button type="submit" busy={confirm.isPending} busyLabel="Saving…">
        Save new password
      </Button>
    </form>
  );
}
