import { createBrowserRouter } from 'react-router-dom';
import { RouteErrorBoundary } from './route-error-boundary';
import DevMailRoute from './routes/dev-mail';
import ForgotPasswordRoute from './routes/forgot-password';
import HomeRoute from './routes/home';
import InvitationRoute from './routes/invitation';
import { LoadingScreen } from './routes/loading-screen';
import NotFoundRoute from './routes/not-found';
import ResetPasswordRoute from './routes/reset-password';
import RootRoute from './routes/root';
import SignInRoute from './routes/sign-in';
import SignedInLayout from './routes/signed-in-layout';

const errorElement = <RouteErrorBoundary />;

export const router = createBrowserRouter([
  {
    element: <RootRoute />,
    errorElement,
    hydrateFallbackElement: <LoadingScreen />,
    children: [
      { path: '/sign-in', element: <SignInRoute />, errorElement },
      { path: '/forgot-password', element: <ForgotPasswordRoute />, errorElement },
      { path: '/reset-password', element: <ResetPasswordRoute />, errorElement },
      { path: '/invitations/:token', element: <InvitationRoute />, errorElement },
      {
        element: <SignedInLayout />,
        errorElement,
        children: [
          { path: '/', element: <HomeRoute />, errorElement },
          { path: '/dev/mail', element: <DevMailRoute />, errorElement },
        ],
      },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
]);
