import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { FirstRunGuide } from '@/features/first-run/components/first-run-guide';
import { SavedDataNote } from '@/features/home/components/saved-data-note';
import { SiteList } from '@/features/home/components/site-list';
import { SurveyList } from '@/features/home/components/survey-list';
import { useSites } from '@/features/home/data/get-sites';
import { useSurveys } from '@/features/home/data/get-surveys';
import { isApiRequestError } from '@/lib/api';
import { useOnlineStatus } from '@/lib/online-status';
import { ROLE_LABELS } from '@/lib/roles';
import { useSignedIn } from './signed-in-layout';

function ListState({ label, query }: { label: string; query: { isPending: boolean; fetchStatus: string; error: unknown; refetch: () => unknown } }) {
  if (query.fetchStatus === 'paused') return <p className="text-fg-muted">No saved {label} on this device yet.</p>;
  if (query.error) {
    const message = isApiRequestError(query.error) ? query.error.message : 'Could not load.';
    return (
      <Alert tone="danger" title={`Could not load ${label}`}>
        <p>{message}</p>
        <Button variant="secondary" className="mt-2" onClick={() => void query.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  }
  return <p role="status">Loading {label}…</p>;
}

export default function HomeRoute() {
  const { session, membership } = useSignedIn();
  const online = useOnlineStatus();
  const organisationId = membership?.organisationId ?? '';
  const sites = useSites(organisationId);
  const surveys = useSurveys(organisationId);

  if (!membership) {
    return (
      <Alert tone="info" title="You are not in an organisation yet">
        Your account ({session.user.email}) has no membership. Ask an admin of your organisation to send you an invitation.
      </Alert>
    );
  }

  const savedTimes = [sites.data ? sites.dataUpdatedAt : null, surveys.data ? surveys.dataUpdatedAt : null].filter((t): t is number => t !== null);
  const savedAt = savedTimes.length > 0 ? Math.min(...savedTimes) : null;
  const mine = surveys.data?.surveys.filter((s) => s.assignedToMe).length ?? 0;

  return (
    <div className="flex flex-col gap-8">
      <div>
        <h1 className="text-3xl font-bold">{membership.organisationName}</h1>
        <p className="text-fg-muted">
          Signed in as {session.user.name || session.user.email}, {ROLE_LABELS[membership.role]}
          {membership.role === 'surveyor' && surveys.data ? ` · ${mine} ${mine === 1 ? 'survey' : 'surveys'} assigned to you` : ''}
        </p>
      </div>
      <FirstRunGuide userId={session.user.id} role={membership.role} surveys={surveys.data?.surveys} />
      {!online.online && <SavedDataNote savedAt={savedAt} />}
      <section aria-labelledby="surveys-heading" className="flex flex-col gap-3">
        <h2 id="surveys-heading" className="text-2xl font-bold">
          Surveys
        </h2>
        {surveys.data ? <SurveyList surveys={surveys.data.surveys} role={membership.role} /> : <ListState label="surveys" query={surveys} />}
      </section>
      <section aria-labelledby="sites-heading" className="flex flex-col gap-3">
        <h2 id="sites-heading" className="text-2xl font-bold">
          Sites
        </h2>
        {sites.data ? <SiteList sites={sites.data.sites} role={membership.role} /> : <ListState label="sites" query={sites} />}
      </section>
    </div>
  );
}
