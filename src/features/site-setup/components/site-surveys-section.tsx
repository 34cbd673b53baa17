import { Link } from 'react-router-dom';
import { useSiteSurveys } from '../data/list-site-surveys';
import { QueryState } from './query-state';
import { EmptyState } from '@/components/empty-state';

const STATE_LABELS = { open: 'Open', submitted: 'Submitted for review', signed_off: 'Signed off' } as const;

export function SiteSurveysSection({ organisationId, siteId, canEdit, archived }: { organisationId: string; siteId: string; canEdit: boolean; archived: boolean }) {
  const surveys = useSiteSurveys(organisationId, siteId);
  return (
    <section aria-labelledby="site-surveys-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="site-surveys-heading" className="text-2xl font-bold">
          Surveys
        </h2>
        {canEdit && !archived && (
          <Link to={`/sites/${siteId}/new-survey`} className="inline-flex min-h-touch items-center rounded-lg bg-accent px-5 font-bold text-accent-fg no-underline hover:bg-accent-hover">
            New survey
          </Link>
        )}
      </div>
      {!surveys.data ? (
        <QueryState label="surveys" query={surveys} />
      ) : surveys.data.length === 0 ? (
        <EmptyState title="No surveys on this site yet">
          {canEdit
            ? archived
              ? 'Bring the site back from the archive to plan one.'
              : 'Plan one with “New survey” and assign its surveyors.'
            : 'An admin or reviewer plans the surveys of this site.'}
        </EmptyState>
      ) : (
        <ul className="grid grid-cols-1 gap-3 md:grid-cols-2" aria-label="Surveys on this site">
          {surveys.data.map((survey) => (
            <li key={survey.id} className="rounded-xl border border-border bg-surface p-4">
              <Link to={`/survey-setup/${survey.id}`} className="inline-flex min-h-touch items-center text-lg font-bold">
                {survey.name}
              </Link>
              <p className="text-sm">
                {STATE_LABELS[survey.state]}
                {survey.startsOn ? ` · starts ${survey.startsOn}` : ''} · {survey.stationCount} {survey.stationCount === 1 ? 'station' : 'stations'}
              </p>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
