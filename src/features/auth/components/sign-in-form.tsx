import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { SignInSchema, type Session } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { applyRequestError } from '@/lib/form-errors';
import { useOnlineStatus } from '@/lib/online-status';
import { useSignIn } from '../data/sign-in';

export const SIGN_IN_NEEDS_NETWORK = 'Signing in needs a network connection. Move to where there is signal, or connect to Wi-Fi, and try again.';

export function SignInForm({ onSignedIn }: { onSignedIn: (session: Session) => void }) {
  const online = useOnlineStatus();
  const signIn = useSignIn();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(SignInSchema), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    signIn.mutate(values, {
      onSuccess: onSignedIn,
      onError: (error) => setFormError(applyRequestError(error, setError, ['email', 'password'], { offlineMessage: SIGN_IN_NEEDS_NETWORK })),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {!online.online && (
        <Alert tone="offline" title="You are offline">
          {SIGN_IN_NEEDS_NETWORK}
        </Alert>
      )}
      <Field label="E-mail" type="email" autoComplete="username" inputMode="email" error={errors.email?.message} {...register('email')} />
      <Field label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...register('password')} />
      {formError && (
        <Alert tone="danger" title="Not signed in" role="alert">
          <span data-testid="sign-in-error">{formError}</span>
        </Alert>
      )}
      <Button type="submit" busy={signIn.isPending} busyLabel="Signing in…">
        Sign in
      </Button>
    </form>
  );
}
