/**
 * The frame of every signed-in screen. It checks the session (from the saved copy when offline),
 * sends a signed-out user to /sign-in, picks the active organisation, builds the role's navigation
 * and hands { session, membership } to the child routes through the outlet context.
 */
import { useIsRestoring } from '@tanstack/react-query';
import { Navigate, Outlet, useLocation, useOutletContext } from 'react-router-dom';
import type { Membership, Session } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { AppShell } from '@/components/layout/app-shell';
import { PublicLayout } from '@/components/layout/public-layout';
import { OrganisationSwitcher } from '@/features/auth/components/organisation-switcher';
import { PendingSyncStatus } from '@/features/capture/components/pending-sync-status';
import { SyncStatus } from '@/features/sync/components/sync-status';
import { useActiveMembership } from '@/features/auth/data/active-organisation';
import { useSession } from '@/features/auth/data/get-session';
import { useSignOut } from '@/features/auth/data/sign-out';
import { useDevMail } from '@/features/dev-mail/data/get-dev-mail';
import { isApiRequestError } from '@/lib/api';
import { usePersistStatus } from '@/lib/query-client';
import { ROLE_LABELS } from '@/lib/roles';
import { navItemsFor } from '../navigation';
import { LoadingScreen } from './loading-screen';

export interface SignedInContext {
  session: Session;
  /** Undefined when the user belongs to no organisation yet. */
  membership: Membership | undefined;
}

export function useSignedIn(): SignedInContext {
  return useOutletContext<SignedInContext>();
}

export default function SignedInLayout() {
  const isRestoring = useIsRestoring();
  const signOut = useSignOut();
  // Signing out clears the cache; asking for the session meanwhile would only earn a 401.
  const signedOut = signOut.isSuccess;
  const session = useSession({ enabled: !signOut.isPending && !signedOut });
  const location = useLocation();
  const persist = usePersistStatus();
  const { membership, choose } = useActiveMembership(session.data);
  const isAdminAnywhere = session.data?.memberships.some((m) => m.role === 'admin') ?? false;
  const devMail = useDevMail({ enabled: isAdminAnywhere });

  if (signedOut) return <Navigate to="/sign-in" replace />;
  if (isRestoring) return <LoadingScreen />;
  if (isApiRequestError(session.error) && session.error.status === 401) {
    return <Navigate to="/sign-in" replace state={{ from: location.pathname + location.search }} />;
  }
  if (!session.data) {
    if (session.error) throw session.error;
    if (session.fetchStatus === 'paused') {
      return (
        <PublicLayout title="Offline">
          <Alert tone="offline" title="Offline — nothing saved on this device yet">
            Signing in needs a network connection. Once you have signed in here with a network, Fringewalk opens
            offline with your saved sites and surveys.
          </Alert>
        </PublicLayout>
      );
    }
    return <LoadingScreen />;
  }

  const navItems = navItemsFor({ role: membership?.role, isAdminAnywhere, devMailAvailable: devMail.isSuccess });
  const context: SignedInContext = { session: session.data, membership };

  return (
    <AppShell
      navItems={navItems}
      userName={session.data.user.name || session.data.user.email}
      roleLabel={membership ? ROLE_LABELS[membership.role] : null}
      organisation={<OrganisationSwitcher memberships={session.data.memberships} activeId={membership?.organisationId} onChoose={choose} />}
      signingOut={signOut.isPending}
      onSignOut={() => signOut.mutate()}
      syncStatus={
        <>
          <PendingSyncStatus />
          {membership && <SyncStatus orgId={membership.organisationId} />}
        </>
      }
      notices={
        persist.error ? (
          <Alert tone="warning" title="Not saved for offline use">
            {persist.error}
          </Alert>
        ) : undefined
      }
    >
      <Outlet context={context} />
    </AppShell>
  );
}
