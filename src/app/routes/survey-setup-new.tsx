import { Link, useNavigate, useParams } from 'react-router-dom';
import { useSite } from '@/features/site-setup/data/get-site';
import { QueryState } from '@/features/site-setup/components/query-state';
import { SurveyForm } from '@/features/site-setup/components/survey-form';
import { useSignedIn } from './signed-in-layout';

export default function SurveySetupNewRoute() {
  const { siteId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const site = useSite(organisationId, siteId);
  const navigate = useNavigate();
  if (!site.data) {
    if (site.error) throw site.error;
    return <QueryState label="the site" query={site} />;
  }
  return (
    <div className="flex flex-col gap-6">
      <nav aria-label="Breadcrumb">
        <Link to={`/sites/${siteId}`} className="inline-flex min-h-touch items-center">
          ← {site.data.name}
        </Link>
      </nav>
      <h1 className="text-3xl font-bold">New survey on {site.data.name}</h1>
      <SurveyForm organisationId={organisationId} siteId={siteId} onSaved={(survey) => navigate(`/survey-setup/${survey.id}`)} />
    </div>
  );
}
