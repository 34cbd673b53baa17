import { Outlet, ScrollRestoration } from 'react-router-dom';

/** The root route: nothing but the outlet; each child route brings its own frame and error element. */
export default function RootRoute() {
  return (
    <>
      <Outlet />
      <ScrollRestoration />
    </>
  );
}
