import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '@/components/button';
import { useCreateSite } from '@/features/site-setup/data/create-site';
import { useSiteList } from '@/features/site-setup/data/list-sites';
import { canEditSites, reportFormError } from '@/features/site-setup/components/form-errors';
import { SiteForm } from '@/features/site-setup/components/site-form';
import { SitesTable } from '@/features/site-setup/components/sites-table';
import { QueryState } from '@/features/site-setup/components/query-state';
import { useSignedIn } from './signed-in-layout';
import { EmptyState } from '@/components/empty-state';

export default function SitesRoute() {
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const sites = useSiteList(organisationId);
  const createSite = useCreateSite(organisationId);
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);
  const canEdit = canEditSites(membership?.role);

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1 className="text-3xl font-bold">Site setup</h1>
          <p className="text-fg-muted">Describe each facility before anyone walks it: levels and plans, rooms, magnets, emitters and surveys.</p>
        </div>
        {canEdit && !creating && <Button onClick={() => setCreating(true)}>New site</Button>}
      </div>
      {creating && (
        <section aria-labelledby="new-site-heading" className="rounded-xl border border-border bg-surface p-4">
          <h2 id="new-site-heading" className="mb-3 text-2xl font-bold">
            New site
          </h2>
          <SiteForm
            submitLabel="Create site"
            busy={createSite.isPending}
            onCancel={() => setCreating(false)}
            onSubmit={(values, setError) =>
              createSite.mutate(values, {
                onSuccess: (site) => navigate(`/sites/${site.id}`),
                onError: (error) => reportFormError(error, setError, ['name', 'address', 'notes']),
              })
            }
          />
        </section>
      )}
      {sites.data ? (
        sites.data.sites.length === 0 ? (
          <EmptyState title="No sites yet">
            {canEdit ? 'Start with “New site” above: give it a name, then add its levels and upload a plan for each.' : 'An admin or reviewer adds sites here.'}
          </EmptyState>
        ) : (
          <SitesTable sites={sites.data.sites} />
        )
      ) : (
        <QueryState label="sites" query={sites} />
      )}
    </div>
  );
}
