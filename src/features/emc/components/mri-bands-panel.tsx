import { formatFluxDensity, formatFrequency } from '@shared/units';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useAddMriBand, useMriBands } from '../data/mri-bands';

/**
 * The receive band of each MRI scanner on a site, derived from its field (proton precession), offered
 * as a band of that site. Precession is not a cyclotron line; the label says so.
 */
export function MriBandsPanel({ organisationId, siteId, siteName, canEdit }: { organisationId: string; siteId: string; siteName: string; canEdit: boolean }) {
  const suggestions = useMriBands(organisationId, siteId);
  const add = useAddMriBand(organisationId, siteId);
  if (suggestions.isPending) return <p role="status">Reading {siteName}’s magnets…</p>;
  if (suggestions.error) {
    return (
      <Alert tone="danger" title="Could not read the site’s magnets">
        {suggestions.error.message}
      </Alert>
    );
  }
  const list = suggestions.data.suggestions;
  if (list.length === 0) return <p className="text-fg-muted">{siteName} has no MRI magnet. Add one in Site setup to offer its receive band here.</p>;
  return (
    <ul className="flex flex-col gap-3" aria-label={`MRI receive bands at ${siteName}`}>
      {list.map((s) => (
        <li key={s.sourceId} className="flex flex-wrap items-center justify-between gap-3 rounded-xl border border-border bg-surface p-3" data-testid="mri-band">
          <div className="flex flex-col">
            <span className="font-bold">
              {s.sourceName} ({formatFluxDensity(s.nominalFieldT)})
            </span>
            <span>
              Receives at {formatFrequency((s.band.lowerHz + s.band.upperHz) / 2)}, watched {formatFrequency(s.band.lowerHz)} – {formatFrequency(s.band.upperHz)}
            </span>
            <span className="text-sm text-fg-muted">Proton precession (42.577 MHz per tesla), not a cyclotron line. The ±500 kHz width is common practice: set the scanner’s own figure if you know it.</span>
          </div>
          {s.existingId ? (
            <span className="rounded-full bg-ok-soft px-3 py-1 text-sm font-bold text-ok">Watched</span>
          ) : (
            canEdit && (
              <Button
                busy={add.isPending && add.variables === s.sourceId}
                onClick={() =>
                  add.mutate(s.sourceId, {
                    onSuccess: (band) => showToast({ tone: 'ok', message: `Now watching ${band.name}.` }),
                    onError: (e) => showToast({ tone: 'danger', message: isApiRequestError(e) ? e.message : 'Could not add the band.' }),
                  })
                }
              >
                Watch this band
              </Button>
            )
          )}
        </li>
      ))}
    </ul>
  );
}
