import { createBrowserRouter } from 'react-router-dom';
import { RouteErrorBoundary } from './route-error-boundary';
import DevMailRoute from './routes/dev-mail';
import ForgotPasswordRoute from './routes/forgot-password';
import HomeRoute from './routes/home';
import InstrumentsRoute from './routes/instruments';
import InvitationRoute from './routes/invitation';
import { LoadingScreen } from './routes/loading-screen';
import NotFoundRoute from './routes/not-found';
import ResetPasswordRoute from './routes/reset-password';
import RootRoute from './routes/root';
import SignInRoute from './routes/sign-in';
import SignedInLayout from './routes/signed-in-layout';
import SitesRoute from './routes/sites';
import SiteDetailRoute from './routes/sites-detail';
import SurveySetupRoute from './routes/survey-setup';
import SurveySetupNewRoute from './routes/survey-setup-new';
import SurveyRoute from './routes/survey';

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
          { path: '/sites', element: <SitesRoute />, errorElement },
          { path: '/sites/:siteId', element: <SiteDetailRoute />, errorElement },
          // The plan screens carry Leaflet and Geoman: loaded only when opened.
          { path: '/sites/:siteId/levels/:levelId', lazy: async () => ({ Component: (await import('./routes/sites-level')).default }), errorElement },
          { path: '/sites/:siteId/new-survey', element: <SurveySetupNewRoute />, errorElement },
          { path: '/survey-setup/:surveyId', element: <SurveySetupRoute />, errorElement },
          { path: '/instruments', element: <InstrumentsRoute />, errorElement },
          { path: '/watch-bands', lazy: async () => ({ Component: (await import('./routes/watch-bands')).default }), errorElement },
          { path: '/surveys/:surveyId/emc', lazy: async () => ({ Component: (await import('./routes/survey-emc')).default }), errorElement },
          { path: '/surveys/:surveyId/emc/rooms/:roomId', lazy: async () => ({ Component: (await import('./routes/survey-emc-room')).default }), errorElement },
          { path: '/surveys/:surveyId', element: <SurveyRoute />, errorElement },
          // Capture carries Leaflet and the forms: loaded when opened (the service worker precaches the chunk).
          { path: '/surveys/:surveyId/capture', lazy: async () => ({ Component: (await import('./routes/capture')).default }), errorElement },
          // The survey map carries Leaflet: loaded when opened.
          { path: '/surveys/:surveyId/map', lazy: async () => ({ Component: (await import('./routes/survey-map')).default }), errorElement },
          // Review carries TanStack Table and Virtual; the report embeds the map (Leaflet): both loaded when opened.
          { path: '/surveys/:surveyId/review', lazy: async () => ({ Component: (await import('./routes/survey-review')).default }), errorElement },
          { path: '/surveys/:surveyId/report', lazy: async () => ({ Component: (await import('./routes/survey-report')).default }), errorElement },
        ],
      },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
]);
