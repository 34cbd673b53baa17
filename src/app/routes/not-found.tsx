import { Link } from 'react-router-dom';
import { PublicLayout } from '@/components/layout/public-layout';

export default function NotFoundRoute() {
  return (
    <PublicLayout title="Not found">
      <p>There is no screen at this address.</p>
      <p className="mt-4">
        <Link to="/" className="inline-flex min-h-touch items-center font-bold">
          Go to the home screen
        </Link>
      </p>
    </PublicLayout>
  );
}
