import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { formatLength } from '@shared/units';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { useArchiveSite } from '@/features/site-setup/data/archive-site';
import { useSiteAudit } from '@/features/site-setup/data/get-site-audit';
import { useSite } from '@/features/site-setup/data/get-site';
import { useUpdateSite } from '@/features/site-setup/data/update-site';
import { AuditList } from '@/features/site-setup/components/audit-list';
import { ConfirmButton } from '@/components/confirm-button';
import { canEditSites, reportFormError } from '@/features/site-setup/components/form-errors';
import { LevelForm } from '@/features/site-setup/components/level-form';
import { QueryState } from '@/features/site-setup/components/query-state';
import { SiteEmittersSection } from '@/features/site-setup/components/site-emitters-section';
import { SiteForm } from '@/features/site-setup/components/site-form';
import { SiteSurveysSection } from '@/features/site-setup/components/site-surveys-section';
import { SourcesSection } from '@/features/site-setup/components/sources-section';
import { showToast } from '@/lib/toast';
import { useSignedIn } from './signed-in-layout';
import { EmptyState } from '@/components/empty-state';

export default function SiteDetailRoute() {
  const { siteId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const site = useSite(organisationId, siteId);
  const update = useUpdateSite(organisationId, siteId);
  const archive = useArchiveSite(organisationId, siteId);
  const isAdmin = membership?.role === 'admin';
  const audit = useSiteAudit(organisationId, siteId, { enabled: isAdmin });
  const [editing, setEditing] = useState(false);
  const canEdit = canEditSites(membership?.role);

  if (!site.data) {
    if (site.error) throw site.error;
    return <QueryState label="the site" query={site} />;
  }
  const s = site.data;
  const levels = [...s.levels].sort((a, b) => a.ordinal - b.ordinal);
  const liveLevels = levels.filter((l) => !l.archived);
  const nextOrdinal = levels.length === 0 ? 0 : Math.max(...levels.map((l) => l.ordinal)) + 1;

  return (
    <div className="flex flex-col gap-8">
      <nav aria-label="Breadcrumb">
        <Link to="/sites" className="inline-flex min-h-touch items-center">
          ← All sites
        </Link>
      </nav>
      <section aria-labelledby="site-heading" className="flex flex-col gap-3">
        {editing ? (
          <div className="rounded-xl border border-border bg-surface p-4">
            <h1 id="site-heading" className="mb-3 text-2xl font-bold">
              Edit {s.name}
            </h1>
            <SiteForm
              defaultValues={s}
              submitLabel="Save site"
              busy={update.isPending}
              onCancel={() => setEditing(false)}
              onSubmit={(values, setError) =>
                update.mutate(values, { onSuccess: () => setEditing(false), onError: (error) => reportFormError(error, setError, ['name', 'address', 'notes']) })
              }
            />
          </div>
        ) : (
          <>
            <div className="flex flex-wrap items-start justify-between gap-3">
              <div>
                <h1 id="site-heading" className="text-3xl font-bold">
                  {s.name}
                </h1>
                {s.address && <p className="text-fg-muted">{s.address}</p>}
                {s.notes && <p className="mt-1">{s.notes}</p>}
              </div>
              {canEdit && (
                <div className="flex flex-wrap gap-2">
                  <Button variant="secondary" onClick={() => setEditing(true)}>
                    Edit site
                  </Button>
                  <ConfirmButton
                    title={s.archived ? `Bring back ${s.name}?` : `Archive ${s.name}?`}
                    body={
                      s.archived
                        ? 'The site shows in lists again and new surveys can be planned on it.'
                        : 'The site leaves the active lists and no new surveys can be planned on it. Nothing is deleted: its plans, rooms and surveys stay, and you can bring it back.'
                    }
                    confirmLabel={s.archived ? 'Unarchive' : 'Archive'}
                    busy={archive.isPending}
                    onConfirm={() =>
                      archive.mutate(!s.archived, {
                        onSuccess: (next) => showToast({ tone: 'ok', message: next.archived ? `${next.name} is archived.` : `${next.name} is active again.` }),
                      })
                    }
                  >
                    {s.archived ? 'Unarchive' : 'Archive'}
                  </ConfirmButton>
                </div>
              )}
            </div>
            {s.archived && (
              <Alert tone="warning" title="Archived">
                This site is archived: it is kept with all its surveys, but no new survey can be planned on it.
              </Alert>
            )}
          </>
        )}
      </section>

      <section aria-labelledby="levels-heading" className="flex flex-col gap-3">
        <h2 id="levels-heading" className="text-2xl font-bold">
          Levels and plans
        </h2>
        {levels.length === 0 ? (
          <EmptyState title="No levels yet">
            {canEdit ? 'Add the first one below, then upload its floor plan and calibrate it.' : 'An admin or reviewer adds the levels and their plans.'}
          </EmptyState>
        ) : (
          <ul className="grid grid-cols-1 gap-3 md:grid-cols-2" aria-label="Levels">
            {levels.map((level) => (
              <li key={level.id} className="rounded-xl border border-border bg-surface p-4" data-testid="level-card">
                <div className="flex flex-wrap items-start justify-between gap-2">
                  <h3 className="text-lg font-bold">{level.name}</h3>
                  {level.archived && <span className="rounded-full bg-surface-sunken px-3 py-1 text-sm font-bold text-fg-muted">Archived</span>}
                </div>
                <p className="text-sm">
                  Floor at {formatLength(Math.abs(level.elevationM), { unit: 'm', significantDigits: 3 })}
                  {level.elevationM < 0 ? ' below' : ' above'} the site datum
                </p>
                <p className="text-sm">
                  {!level.plan
                    ? 'No plan uploaded yet'
                    : level.plan.calibration
                      ? `Plan calibrated: ${formatLength(level.plan.calibration.metresPerPixel, { significantDigits: 3 })} per pixel`
                      : 'Plan uploaded, not calibrated yet'}
                </p>
                <Link to={`/sites/${s.id}/levels/${level.id}`} className="mt-2 inline-flex min-h-touch items-center font-bold">
                  {level.plan ? `Open ${level.name} plan` : `Upload ${level.name} plan`}
                </Link>
              </li>
            ))}
          </ul>
        )}
        {canEdit && <LevelForm organisationId={organisationId} siteId={s.id} nextOrdinal={nextOrdinal} />}
      </section>

      <SourcesSection organisationId={organisationId} siteId={s.id} levels={liveLevels} canEdit={canEdit} />
      <SiteEmittersSection organisationId={organisationId} siteId={s.id} />
      <SiteSurveysSection organisationId={organisationId} siteId={s.id} canEdit={canEdit} archived={s.archived} />

      {isAdmin && (
        <section aria-labelledby="audit-heading" className="flex flex-col gap-3">
          <h2 id="audit-heading" className="text-2xl font-bold">
            Audit log
          </h2>
          {audit.data ? <AuditList entries={audit.data.entries} /> : <QueryState label="the audit log" query={audit} />}
        </section>
      )}
    </div>
  );
}
