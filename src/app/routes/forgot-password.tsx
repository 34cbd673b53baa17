import { Link } from 'react-router-dom';
import { PublicLayout } from '@/components/layout/public-layout';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';

export default function ForgotPasswordRoute() {
  return (
    <PublicLayout title="Reset your password">
      <ForgotPasswordForm />
      <p className="mt-6">
        <Link to="/sign-in" className="inline-flex min-h-touch items-center font-bold">
          Back to sign-in
        </Link>
      </p>
    </PublicLayout>
  );
}
