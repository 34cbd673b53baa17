import { Link } from 'react-router-dom';
import type { Role } from '@shared/schemas/common';
import type { SurveySummary } from '@shared/schemas/home';
import { EmptyState } from '@/components/empty-state';

const STATE_LABELS: Record<SurveySummary['state'], string> = {
  open: 'Open',
  submitted: 'Submitted for review',
  signed_off: 'Signed off',
};

const STATE_STYLES: Record<SurveySummary['state'], string> = {
  open: 'bg-accent-soft text-accent-soft-fg',
  submitted: 'bg-warning-soft text-warning',
  signed_off: 'bg-ok-soft text-ok',
};

function formatDay(isoDate: string | null): string | null {
  if (!isoDate) return null;
  const date = new Date(isoDate);
  return Number.isNaN(date.getTime()) ? isoDate : date.toLocaleDateString(undefined, { day: 'numeric', month: 'short', year: 'numeric' });
}

/** What to do when there is no survey yet, by who is looking. */
function NoSurveys({ role }: { role: Role }) {
  if (role === 'admin' || role === 'reviewer') {
    return (
      <EmptyState title="No surveys in this organisation yet" action={{ to: '/sites', label: 'Plan a survey from a site' }}>
        Open a site, start a survey there and assign its surveyors.
      </EmptyState>
    );
  }
  if (role === 'surveyor') {
    return <EmptyState title="No surveys in this organisation yet">When an admin or reviewer adds you to a survey’s team, it appears here, marked “Assigned to you”.</EmptyState>;
  }
  return <EmptyState title="No surveys in this organisation yet">An admin or reviewer plans the surveys; they appear here once they exist.</EmptyState>;
}

/** Surveys of the organisation; the user's own assignments first. */
export function SurveyList({ surveys, role }: { surveys: SurveySummary[]; role: Role }) {
  if (surveys.length === 0) return <NoSurveys role={role} />;
  const ordered = [...surveys].sort((a, b) => Number(b.assignedToMe) - Number(a.assignedToMe));
  return (
    <ul className="grid gap-3 md:grid-cols-2" aria-label="Surveys">
      {ordered.map((survey) => {
        const starts = formatDay(survey.startsOn);
        return (
          <li key={survey.id} className="rounded-xl border border-border bg-surface p-4" data-testid="survey-card">
            <div className="flex flex-wrap items-start justify-between gap-2">
              <h3 className="text-lg font-bold leading-snug">
                <Link to={`/surveys/${survey.id}`} className="inline-flex min-h-touch items-center">
                  {survey.name}
                </Link>
              </h3>
              <span className={`rounded-full px-3 py-1 text-sm font-bold ${STATE_STYLES[survey.state]}`}>{STATE_LABELS[survey.state]}</span>
            </div>
            <p className="text-fg-muted">{survey.siteName}</p>
            <p className="mt-2 text-sm">
              {starts ? `Starts ${starts} · ` : ''}
              {survey.stationCount} {survey.stationCount === 1 ? 'station' : 'stations'} · {survey.readingCount}{' '}
              {survey.readingCount === 1 ? 'reading' : 'readings'}
            </p>
            {survey.assignedToMe && <p className="mt-2 inline-block rounded bg-offline-soft px-2 py-0.5 text-sm font-bold text-offline">Assigned to you</p>}
          </li>
        );
      })}
    </ul>
  );
}
