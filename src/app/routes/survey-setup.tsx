import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { useSurveySettings } from '@/features/site-setup/data/get-survey-settings';
import { canEditSites } from '@/features/site-setup/components/form-errors';
import { QueryState } from '@/features/site-setup/components/query-state';
import { SurveyForm } from '@/features/site-setup/components/survey-form';
import { SurveyTeam } from '@/features/site-setup/components/survey-team';
import { showToast } from '@/lib/toast';
import { useSignedIn } from './signed-in-layout';

export default function SurveySetupRoute() {
  const { surveyId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const survey = useSurveySettings(organisationId, surveyId);
  const canEdit = canEditSites(membership?.role);
  if (!survey.data) {
    if (survey.error) throw survey.error;
    return <QueryState label="the survey" query={survey} />;
  }
  const s = survey.data;
  return (
    <div className="flex flex-col gap-8">
      <nav aria-label="Breadcrumb">
        <Link to={`/sites/${s.siteId}`} className="inline-flex min-h-touch items-center">
          ← Back to the site
        </Link>
      </nav>
      <h1 className="text-3xl font-bold">{s.name}</h1>
      {s.state !== 'open' && (
        <Alert tone="info" title="This survey is no longer open">
          Its settings are fixed once it is submitted; a reviewer can reopen it.
        </Alert>
      )}
      <section aria-labelledby="team-heading" className="flex flex-col gap-3">
        <h2 id="team-heading" className="text-2xl font-bold">
          Team
        </h2>
        {canEdit ? (
          <SurveyTeam key={s.id} organisationId={organisationId} survey={s} />
        ) : (
          <p>
            Surveyors: {s.team.surveyors.map((m) => m.name).join(', ') || 'none yet'}. Reviewers: {s.team.reviewers.map((m) => m.name).join(', ') || 'none yet'}.
          </p>
        )}
      </section>
      {canEdit && s.state === 'open' && (
        <section aria-labelledby="settings-heading" className="flex flex-col gap-3">
          <h2 id="settings-heading" className="text-2xl font-bold">
            Settings
          </h2>
          <SurveyForm
            key={s.revision}
            organisationId={organisationId}
            siteId={s.siteId}
            survey={s}
            onSaved={() => showToast({ tone: 'ok', message: 'Survey settings saved.' })}
          />
        </section>
      )}
    </div>
  );
}
