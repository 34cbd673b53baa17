import { Link, useNavigate, useParams } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { PublicLayout } from '@/components/layout/public-layout';
import { setActiveOrganisationId } from '@/features/auth/data/active-organisation';
import { useInvitation } from '@/features/auth/data/get-invitation';
import { InvitationAcceptForm } from '@/features/auth/components/invitation-accept-form';
import { isApiRequestError } from '@/lib/api';
import { useOnlineStatus } from '@/lib/online-status';

export default function InvitationRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const online = useOnlineStatus();
  const invitation = useInvitation(token);

  let content;
  if (invitation.data) {
    const preview = invitation.data;
    content = (
      <InvitationAcceptForm
        token={token}
        preview={preview}
        onAccepted={(session) => {
          const joined = session.memberships.find((m) => m.organisationName === preview.organisationName);
          if (joined) setActiveOrganisationId(joined.organisationId);
          navigate('/', { replace: true });
        }}
      />
    );
  } else if (isApiRequestError(invitation.error) && invitation.error.status === 404) {
    content = (
      <Alert tone="danger" title="This invitation cannot be used">
        It is unknown, has expired or has already been accepted. Ask your organisation’s admin to send a new one.
      </Alert>
    );
  } else if (invitation.error) {
    throw invitation.error;
  } else if (!online.online) {
    content = (
      <Alert tone="offline" title="You are offline">
        Opening an invitation needs a network connection. Connect and this page will load.
      </Alert>
    );
  } else {
    content = <p role="status">Loading the invitation…</p>;
  }

  return (
    <PublicLayout title="Join an organisation">
      {content}
      <p className="mt-6">
        <Link to="/sign-in" className="inline-flex min-h-touch items-center font-bold">
          Already a member? Sign in
        </Link>
      </p>
    </PublicLayout>
  );
}
