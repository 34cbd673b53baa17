import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { PasswordResetConfirmSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { PublicLayout } from '@/components/layout/public-layout';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';

const TokenSchema = PasswordResetConfirmSchema.shape.token;

export default function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const [done, setDone] = useState(false);
  const token = params.get('token') ?? '';
  const tokenOk = TokenSchema.safeParse(token).success;

  return (
    <PublicLayout title="Choose a new password">
      {done ? (
        <Alert tone="ok" title="Password changed">
          You can now <Link to="/sign-in">sign in with your new password</Link>.
        </Alert>
      ) : tokenOk ? (
        <ResetPasswordForm token={token} onDone={() => setDone(true)} />
      ) : (
        <Alert tone="danger" title="This link is incomplete">
          Open the link from the e-mail exactly as it was sent, or <Link to="/forgot-password">request a new one</Link>.
        </Alert>
      )}
    </PublicLayout>
  );
}
