import { useState } from 'react';
import { CircleMarker, Tooltip } from 'react-leaflet';
import { pixelToPlanM, planMToPixel } from '@shared/plans/calibration';
import type { Plan } from '@shared/schemas/plan';
import { formatFluxDensity } from '@shared/units';
import { Alert } from '@/components/alert';
import { showToast } from '@/lib/toast';
import { useSources } from '../data/list-sources';
import { useSaveSource } from '../data/save-source';
import { pixelToLatLng, type PixelPoint } from '../plan-geometry';
import { SETUP_NEEDS_NETWORK } from './form-errors';
import { PlanMap } from './plan-map';
import { SelectField } from '@/components/select-field';

/** Put a site's magnets on this level's plan: choose one, click its centre. */
export function SourcePlacementPanel({ organisationId, siteId, levelId, plan, imageUrl, canEdit }: {
  organisationId: string;
  siteId: string;
  levelId: string;
  plan: Plan;
  imageUrl: string;
  canEdit: boolean;
}) {
  const sources = useSources(organisationId, siteId);
  const save = useSaveSource(organisationId, siteId);
  const [chosen, setChosen] = useState('');
  const calibration = plan.calibration;
  if (!calibration) return <Alert title="Calibrate the plan first">Magnet positions are stored in metres; calibrate the plan, then place them.</Alert>;
  const all = sources.data?.sources ?? [];
  const placed = all.filter((s) => s.levelId === levelId && s.xM !== null && s.yM !== null);
  const candidate = all.find((s) => s.id === chosen);

  const onPlanClick = (point: PixelPoint) => {
    if (!candidate) return;
    const { xM, yM } = pixelToPlanM(point, calibration);
    save.mutate(
      { sourceId: candidate.id, body: { name: candidate.name, kind: candidate.kind, nominalFieldT: candidate.nominalFieldT, levelId, xM, yM } },
      {
        onSuccess: () => {
          showToast({ tone: 'ok', message: `${candidate.name} placed.` });
          setChosen('');
        },
        onError: (error) => showToast({ tone: 'danger', message: (error as { isNetworkError?: boolean }).isNetworkError ? SETUP_NEEDS_NETWORK : (error as Error).message }),
      },
    );
  };

  return (
    <div className="flex flex-col gap-4">
      {all.length === 0 ? (
        <p className="text-fg-muted">No magnets on this site yet: add them on the site page, then place them here.</p>
      ) : (
        canEdit && (
          <SelectField
            label="Magnet to place"
            hint="Choose one, then click its centre on the plan"
            value={chosen}
            onChange={(event) => setChosen(event.target.value)}
            options={[{ value: '', label: 'Choose a magnet' }, ...all.map((s) => ({ value: s.id, label: `${s.name} (${formatFluxDensity(s.nominalFieldT, { significantDigits: 3 })})` }))]}
          />
        )
      )}
      <PlanMap
        imageUrl={imageUrl}
        widthPx={plan.widthPx}
        heightPx={plan.heightPx}
        label="Plan with magnets"
        metresPerPixel={calibration.metresPerPixel}
        onPlanClick={canEdit ? onPlanClick : undefined}
        picking={Boolean(candidate)}
      >
        {placed.map((source) => (
          <CircleMarker
            key={source.id}
            center={pixelToLatLng(planMToPixel({ xM: source.xM ?? 0, yM: source.yM ?? 0 }, calibration))}
            radius={10}
            pathOptions={{ color: '#a3261b', fillColor: '#a3261b', fillOpacity: 0.8 }}
          >
            <Tooltip permanent direction="top">
              {source.name}
            </Tooltip>
          </CircleMarker>
        ))}
      </PlanMap>
    </div>
  );
}
