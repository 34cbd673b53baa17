import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { PasswordResetRequestSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { applyRequestError } from '@/lib/form-errors';
import { useRequestPasswordReset } from '../data/request-password-reset';

const NEEDS_NETWORK = 'Requesting a reset link needs a network connection. Connect and try again.';

export function ForgotPasswordForm() {
  const request = useRequestPasswordReset();
  const [formError, setFormError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(PasswordResetRequestSchema), defaultValues: { email: '' } });

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    request.mutate(values, {
      onSuccess: () => setSentTo(values.email),
      onError: (error) => setFormError(applyRequestError(error, setError, ['email'], { offlineMessage: NEEDS_NETWORK })),
    });
  });

  if (sentTo) {
    return (
      <Alert tone="ok" title="Check your e-mail">
        If an account exists for <strong>{sentTo}</strong>, we have sent it a link to choose a new password. The link
        works once and expires; request another if it does.
      </Alert>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Request a password reset">
      <p className="text-fg-muted">Enter the e-mail address you sign in with. We will send you a link to choose a new password.</p>
      <Field label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register('email')} />
      {formError && (
        <Alert tone="danger" title="Not sent">
          {formError}
        </Alert>
      )}
      <Button type="submit" busy={request.isPending} busyLabel="Sending…">
        Send reset link
      </Button>
    </form>
  );
}
