import { Link, useLocation, useNavigate } from 'react-router-dom';
import { PublicLayout } from '@/components/layout/public-layout';
import { SignInForm } from '@/features/auth/components/sign-in-form';

function safeReturnPath(state: unknown): string {
  const from = (state as { from?: unknown } | null)?.from;
  // Only same-app paths; never a full URL handed in from elsewhere.
  return typeof from === 'string' && from.startsWith('/') && !from.startsWith('//') && from !== '/sign-in' ? from : '/';
}

export default function SignInRoute() {
  const navigate = useNavigate();
  const location = useLocation();
  return (
    <PublicLayout title="Sign in">
      <SignInForm onSignedIn={() => navigate(safeReturnPath(location.state), { replace: true })} />
      <p className="mt-6">
        <Link to="/forgot-password" className="inline-flex min-h-touch items-center font-bold">
          Forgot your password?
        </Link>
      </p>
    </PublicLayout>
  );
}
