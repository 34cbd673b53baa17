/** One level: its plan (upload, calibration) and what is drawn on it. Lazy-loaded: it carries Leaflet. */
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { useSite } from '@/features/site-setup/data/get-site';
import { planImageUrl } from '@/features/site-setup/data/get-plan';
import { CalibrationPanel } from '@/features/site-setup/components/calibration-panel';
import { EmittersPanel } from '@/features/site-setup/components/emitters-panel';
import { canEditSites } from '@/features/site-setup/components/form-errors';
import { PlanUpload } from '@/features/site-setup/components/plan-upload';
import { QueryState } from '@/features/site-setup/components/query-state';
import { RoomsPanel } from '@/features/site-setup/components/rooms-panel';
import { SourcePlacementPanel } from '@/features/site-setup/components/source-placement-panel';
import { useSignedIn } from './signed-in-layout';

const TABS = [
  { id: 'calibrate', label: 'Calibrate' },
  { id: 'rooms', label: 'Rooms' },
  { id: 'magnets', label: 'Magnets' },
  { id: 'emitters', label: 'Emitters' },
] as const;
type TabId = (typeof TABS)[number]['id'];

export default function SiteLevelRoute() {
  const { siteId = '', levelId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const site = useSite(organisationId, siteId);
  const canEdit = canEditSites(membership?.role);
  const [tab, setTab] = useState<TabId>('calibrate');

  if (!site.data) {
    if (site.error) throw site.error;
    return <QueryState label="the level" query={site} />;
  }
  const level = site.data.levels.find((l) => l.id === levelId);
  if (!level) {
    return (
      <Alert tone="danger" title="No such level">
        This level is not on {site.data.name}. <Link to={`/sites/${siteId}`}>Back to the site</Link>
      </Alert>
    );
  }
  const plan = level.plan;
  // A new upload is a new plan id, so the image URL changes with it (calibration never changes the image).
  const imageUrl = plan ? `${planImageUrl(organisationId, plan.id)}&v=${plan.id}` : '';
  const props = { organisationId, siteId, levelId, canEdit };

  return (
    <div className="flex flex-col gap-6">
      <nav aria-label="Breadcrumb">
        <Link to={`/sites/${siteId}`} className="inline-flex min-h-touch items-center">
          ← {site.data.name}
        </Link>
      </nav>
      <div>
        <h1 className="text-3xl font-bold">{level.name}</h1>
        <p className="text-fg-muted">
          {plan
            ? `Plan ${plan.originalName ?? ''} · ${plan.widthPx} × ${plan.heightPx} px${plan.calibration ? '' : ' · not calibrated yet'}`
            : 'No plan yet: upload the floor plan of this level to calibrate it and draw its rooms.'}
        </p>
      </div>
      {canEdit && <PlanUpload organisationId={organisationId} siteId={siteId} levelId={levelId} hasPlan={Boolean(plan)} />}
      {plan && (
        <>
          <div role="tablist" aria-label="Plan tools" className="flex flex-wrap gap-2">
            {TABS.map((t) => (
              <Button
                key={t.id}
                role="tab"
                aria-selected={tab === t.id}
                aria-controls={`panel-${t.id}`}
                id={`tab-${t.id}`}
                variant={tab === t.id ? 'primary' : 'secondary'}
                onClick={() => setTab(t.id)}
              >
                {t.label}
              </Button>
            ))}
          </div>
          <div role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`}>
            {tab === 'calibrate' && <CalibrationPanel key={plan.id} organisationId={organisationId} siteId={siteId} plan={plan} imageUrl={imageUrl} canEdit={canEdit} />}
            {tab === 'rooms' && <RoomsPanel {...props} plan={plan} imageUrl={imageUrl} />}
            {tab === 'magnets' && <SourcePlacementPanel {...props} plan={plan} imageUrl={imageUrl} />}
            {tab === 'emitters' && <EmittersPanel {...props} />}
          </div>
        </>
      )}
    </div>
  );
}
