import { useState } from 'react';
import type { WatchBand } from '@shared/schemas/watch-band';
import { sameBand, STARTER_WATCH_BANDS } from '@shared/bands/starter-set';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField } from '@/components/select-field';
import { BandSpectrum } from '@/features/emc/components/band-spectrum';
import { MriBandsPanel } from '@/features/emc/components/mri-bands-panel';
import { WatchBandForm } from '@/features/emc/components/watch-band-form';
import { WatchBandImport } from '@/features/emc/components/watch-band-import';
import { WatchBandsTable } from '@/features/emc/components/watch-bands-table';
import { useAddStarterSet } from '@/features/emc/data/add-starter-set';
import { useDeleteWatchBand } from '@/features/emc/data/delete-watch-band';
import { useWatchBands, watchBandsCsvUrl } from '@/features/emc/data/list-watch-bands';
import { useSiteList } from '@/features/site-setup/data/list-sites';
import { QueryState } from '@/features/site-setup/components/query-state';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useSignedIn } from './signed-in-layout';
import { EmptyState } from '@/components/empty-state';

/** The organisation's watch bands (issue 8 §1): kept by EMC engineers and admins, read by everyone. */
export default function WatchBandsRoute() {
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const canEdit = membership?.role === 'emc' || membership?.role === 'admin';
  const bands = useWatchBands(organisationId);
  const sites = useSiteList(organisationId);
  const starter = useAddStarterSet(organisationId);
  const remove = useDeleteWatchBand(organisationId);
  const [editing, setEditing] = useState<WatchBand | 'new' | null>(null);
  const [siteId, setSiteId] = useState('');

  const list = bands.data?.watchBands ?? [];
  const missingStarter = STARTER_WATCH_BANDS.filter((s) => !list.some((b) => b.siteId === null && sameBand(b, s)));
  const liveSites = (sites.data?.sites ?? []).filter((s) => !s.archived);
  const chosenSite = liveSites.find((s) => s.id === siteId) ?? liveSites[0];
  const recalled = list.filter((b) => /recalled/i.test(b.source)).length;

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1 className="text-3xl font-bold">Watch bands</h1>
          <p className="text-fg-muted">
            The radio bands this organisation protects. Predicted cyclotron lines of every survey are checked against them; a line inside a band raises a flag.
          </p>
        </div>
        <div className="flex flex-wrap gap-3">
          {canEdit && editing === null && <Button onClick={() => setEditing('new')}>Add band</Button>}
          <a href={watchBandsCsvUrl(organisationId)} download className="inline-flex min-h-touch items-center rounded-lg border-2 border-field-border px-5 font-bold text-link">
            Download CSV
          </a>
        </div>
      </div>

      {canEdit && bands.data && missingStarter.length > 0 && (
        <Alert tone="info" title={list.length === 0 ? 'Start from the starter set' : `${missingStarter.length} starter ${missingStarter.length === 1 ? 'band is' : 'bands are'} not on your list`}>
          <p className="mb-3">
            Radio astronomy (ITU Radio Regulations Article 5), the ISM bands, the GNSS carriers, VHF aviation and the medical-implant band, each with its published source. Values
            recalled rather than read from the source say so until someone checks them.
          </p>
          <Button
            busy={starter.isPending}
            onClick={() =>
              starter.mutate(undefined, {
                onSuccess: (r) => showToast({ tone: 'ok', message: `Added ${r.added.length} starter ${r.added.length === 1 ? 'band' : 'bands'}.` }),
                onError: (e) => showToast({ tone: 'danger', message: isApiRequestError(e) ? e.message : 'Could not add the starter set.' }),
              })
            }
          >
            Add {missingStarter.length === STARTER_WATCH_BANDS.length ? 'the starter set' : `the ${missingStarter.length} missing`}
          </Button>
        </Alert>
      )}

      {editing !== null && (
        <section aria-labelledby="band-form-heading" className="rounded-xl border border-border bg-surface p-4">
          <h2 id="band-form-heading" className="mb-3 text-2xl font-bold">
            {editing === 'new' ? 'New watch band' : `Edit ${editing.name}`}
          </h2>
          <WatchBandForm key={editing === 'new' ? 'new' : editing.id} organisationId={organisationId} band={editing === 'new' ? undefined : editing} onDone={() => setEditing(null)} />
        </section>
      )}

      {!bands.data ? (
        <QueryState label="watch bands" query={bands} />
      ) : list.length === 0 ? (
        <EmptyState title="No watch bands yet">
          {canEdit ? 'Add the starter set above, import a CSV, or add your own bands.' : 'An EMC engineer or an admin adds the bands this organisation protects.'}
        </EmptyState>
      ) : (
        <>
          <BandSpectrum bands={list} />
          {recalled > 0 && (
            <p className="text-sm">
              <span className="font-bold">{recalled}</span> {recalled === 1 ? 'band has edges' : 'bands have edges'} recalled from memory: check {recalled === 1 ? 'it' : 'them'} against the named
              source before relying on a flag.
            </p>
          )}
          <WatchBandsTable
            bands={list}
            onEdit={canEdit ? (band) => setEditing(band) : undefined}
            onDelete={
              canEdit
                ? (band) =>
                    remove.mutate(band.id, {
                      onSuccess: () => showToast({ tone: 'ok', message: `Stopped watching ${band.name}.` }),
                      onError: (e) => showToast({ tone: 'danger', message: isApiRequestError(e) ? e.message : 'Could not remove the band.' }),
                    })
                : undefined
            }
            deleting={remove.isPending ? remove.variables : null}
          />
        </>
      )}

      {canEdit && (
        <section aria-labelledby="import-heading" className="flex flex-col gap-3">
          <h2 id="import-heading" className="text-2xl font-bold">
            Import
          </h2>
          <WatchBandImport organisationId={organisationId} />
        </section>
      )}

      <section aria-labelledby="mri-heading" className="flex flex-col gap-3">
        <h2 id="mri-heading" className="text-2xl font-bold">
          MRI receive bands
        </h2>
        <p className="text-fg-muted">A scanner listens at its proton precession frequency. A cyclotron line near it can show up in images, so each site can watch its scanners’ bands.</p>
        {!sites.data ? (
          <QueryState label="sites" query={sites} />
        ) : !chosenSite ? (
          <p className="text-fg-muted">No sites yet.</p>
        ) : (
          <>
            {liveSites.length > 1 && (
              <SelectField label="Site" className="sm:max-w-sm" value={chosenSite.id} onChange={(e) => setSiteId(e.target.value)} options={liveSites.map((s) => ({ value: s.id, label: s.name }))} />
            )}
            <MriBandsPanel key={chosenSite.id} organisationId={organisationId} siteId={chosenSite.id} siteName={chosenSite.name} canEdit={canEdit} />
          </>
        )}
      </section>
    </div>
  );
}
