import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { MailList } from '@/features/dev-mail/components/mail-list';
import { useDevMail } from '@/features/dev-mail/data/get-dev-mail';
import { isApiRequestError } from '@/lib/api';
import { useSignedIn } from './signed-in-layout';

/** Dev only: the e-mails the local SMTP capture received (invitations, password resets). */
export default function DevMailRoute() {
  const { session } = useSignedIn();
  const isAdmin = session.memberships.some((m) => m.role === 'admin');
  const mail = useDevMail({ enabled: isAdmin, live: true });

  let content;
  if (!isAdmin || (isApiRequestError(mail.error) && mail.error.status === 403)) {
    content = <Alert tone="danger" title="Admins only">Captured e-mail is shown to admins only.</Alert>;
  } else if (isApiRequestError(mail.error) && mail.error.status === 404) {
    content = (
      <Alert tone="info" title="Mail capture is not running on this server">
        The local e-mail capture runs only in development and in tests. On a real deployment, e-mail goes to the
        recipients’ inboxes.
      </Alert>
    );
  } else if (mail.data) {
    content = <MailList messages={mail.data.messages} />;
  } else if (mail.error) {
    throw mail.error;
  } else if (mail.fetchStatus === 'paused') {
    content = <Alert tone="offline" title="Offline">Captured e-mail is never saved on the device; connect to read it.</Alert>;
  } else {
    content = <p role="status">Loading captured e-mail…</p>;
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Dev mail</h1>
        {mail.data && (
          <Button variant="secondary" onClick={() => void mail.refetch()} busy={mail.isFetching} busyLabel="Refreshing…">
            Refresh
          </Button>
        )}
      </div>
      <p className="text-fg-muted">E-mail captured by the local SMTP server, newest first. It refreshes every few seconds.</p>
      {content}
    </div>
  );
}
