import { useState } from 'react';
import type { Instrument } from '@shared/schemas/instrument';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { useInstruments } from '@/features/site-setup/data/list-instruments';
import { AntennaFactorUpload } from '@/features/site-setup/components/antenna-factor-upload';
import { InstrumentForm } from '@/features/site-setup/components/instrument-form';
import { InstrumentsTable } from '@/features/site-setup/components/instruments-table';
import { QueryState } from '@/features/site-setup/components/query-state';
import { useSignedIn } from './signed-in-layout';
import { EmptyState } from '@/components/empty-state';

export default function InstrumentsRoute() {
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const instruments = useInstruments(organisationId);
  const isAdmin = membership?.role === 'admin';
  const canUploadFactors = isAdmin || membership?.role === 'emc';
  const [editing, setEditing] = useState<Instrument | 'new' | null>(null);
  const list = instruments.data?.instruments ?? [];
  const overdue = list.filter((i) => i.calibrationOverdue && !i.archived).length;
  const antennas = list.filter((i) => i.kind === 'antenna' && !i.archived);

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1 className="text-3xl font-bold">Instruments</h1>
          <p className="text-fg-muted">Gaussmeters, analysers and antennas with their calibration. Admins get an e-mail two weeks before a calibration falls due.</p>
        </div>
        {isAdmin && editing === null && <Button onClick={() => setEditing('new')}>Add instrument</Button>}
      </div>
      {overdue > 0 && (
        <Alert tone="danger" title={`${overdue} ${overdue === 1 ? 'instrument is' : 'instruments are'} overdue for calibration`}>
          Readings taken with an overdue instrument are marked in reports. Send it for calibration or archive it.
        </Alert>
      )}
      {editing !== null && (
        <section aria-labelledby="instrument-form-heading" className="rounded-xl border border-border bg-surface p-4">
          <h2 id="instrument-form-heading" className="mb-3 text-2xl font-bold">
            {editing === 'new' ? 'New instrument' : `Edit ${editing.model}`}
          </h2>
          <InstrumentForm
            key={editing === 'new' ? 'new' : editing.id}
            organisationId={organisationId}
            instrument={editing === 'new' ? undefined : editing}
            onDone={() => setEditing(null)}
          />
        </section>
      )}
      {!instruments.data ? (
        <QueryState label="instruments" query={instruments} />
      ) : list.length === 0 ? (
        <EmptyState title="No instruments yet">
          {isAdmin
            ? 'Use “Add instrument” above for each gaussmeter, analyser and antenna, with its serial and calibration due date.'
            : 'An admin adds the gaussmeters, analysers and antennas here; ask one if yours is missing.'}
        </EmptyState>
      ) : (
        <InstrumentsTable instruments={list} onEdit={isAdmin ? (instrument) => setEditing(instrument) : undefined} />
      )}
      {canUploadFactors && antennas.length > 0 && (
        <section aria-labelledby="antenna-heading" className="flex flex-col gap-3">
          <h2 id="antenna-heading" className="text-2xl font-bold">
            Antenna factors
          </h2>
          <ul className="flex flex-col gap-3">
            {antennas.map((antenna) => (
              <li key={antenna.id} className="rounded-xl border border-border bg-surface p-4">
                <p className="font-bold">
                  {antenna.model} · {antenna.serial}
                </p>
                <AntennaFactorUpload organisationId={organisationId} instrument={antenna} />
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
