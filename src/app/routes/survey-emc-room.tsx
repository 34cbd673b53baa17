/**
 * /surveys/:surveyId/emc/rooms/:roomId — one room's EMC picture: its field interval, every predicted
 * line on the frequency ruler with the watch bands, its flags, and the analyser sweeps taken in it with
 * their peaks explained by the lines (or not).
 */
import { Link, useParams } from 'react-router-dom';
import { BUILT_IN_SPECIES, type BuiltInSpeciesId } from '@shared/physics/species';
import { DEFAULT_VICTIM_DISTANCE_M } from '@shared/emc/room-lines';
import { formatFluxDensity, formatFrequency } from '@shared/units';
import { Alert } from '@/components/alert';
import { FrequencyRuler, type RulerLine } from '@/components/frequency-ruler';
import { FlagCard } from '@/features/emc/components/flag-card';
import { SweepPanel } from '@/features/emc/components/sweep-panel';
import { useEmcRooms } from '@/features/emc/data/list-emc-rooms';
import { useFlags } from '@/features/emc/data/list-flags';
import { useSweeps } from '@/features/emc/data/list-sweeps';
import { useWatchBands } from '@/features/emc/data/list-watch-bands';
import { QueryState } from '@/features/site-setup/components/query-state';
import { useSignedIn } from './signed-in-layout';

export default function SurveyEmcRoomRoute() {
  const { surveyId = '', roomId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const canWork = membership?.role === 'emc' || membership?.role === 'admin';
  const rooms = useEmcRooms(organisationId, surveyId);
  const flags = useFlags(organisationId, surveyId, DEFAULT_VICTIM_DISTANCE_M);
  const bands = useWatchBands(organisationId);
  const sweeps = useSweeps(organisationId, surveyId);
  if (!rooms.data) return <QueryState label="the room" query={rooms} />;
  const room = rooms.data.rooms.find((r) => r.roomId === roomId);
  if (!room) {
    return (
      <Alert tone="danger" title="This room is not in the survey">
        <Link to={`/surveys/${surveyId}/emc`} className="text-link underline">
          Back to the EMC check
        </Link>
      </Alert>
    );
  }
  const lines: RulerLine[] = room.lines.map((l) => ({
    speciesId: l.species,
    speciesName: BUILT_IN_SPECIES[l.species as BuiltInSpeciesId]?.name ?? l.species,
    harmonic: l.harmonic,
    lowHz: l.lowHz,
    highHz: l.highHz,
    centreHz: Math.sqrt(l.lowHz * l.highHz),
    hits: room.hits.filter((h) => h.species === l.species && h.harmonic === l.harmonic),
  }));
  const roomFlags = (flags.data?.flags ?? []).filter((f) => f.roomId === roomId);
  const roomSweeps = (sweeps.data?.sweeps ?? []).filter((s) => s.room?.id === roomId);

  return (
    <div className="flex flex-col gap-6">
      <nav aria-label="Breadcrumb">
        <Link to={`/surveys/${surveyId}/emc`} className="inline-flex min-h-touch items-center">
          ← EMC check
        </Link>
      </nav>
      <div>
        <h1 className="text-3xl font-bold">{room.name}</h1>
        <p className="text-fg-muted">
          {room.field
            ? `Field from ${formatFluxDensity(room.field.lowT, { significantDigits: 3 })} to ${formatFluxDensity(room.field.highT, { significantDigits: 3 })} over ${room.field.readings} ${room.field.readings === 1 ? 'reading' : 'readings'} (each widened by its gaussmeter’s uncertainty)${room.provisional ? ', provisional: not all reviewed' : ''}.`
            : 'No field reading in this room yet: nothing to predict.'}
          {room.emitters.length > 0 ? ` Plasma emitters here: ${room.emitters.join(', ')}.` : ''}
        </p>
      </div>

      {room.lines.length > 0 && (
        <section aria-labelledby="ruler-heading" className="flex flex-col gap-2">
          <h2 id="ruler-heading" className="text-2xl font-bold">
            Predicted lines
          </h2>
          <div className="rounded-xl border border-border bg-surface p-3">
            <FrequencyRuler lines={lines} watchBands={bands.data?.watchBands ?? []} />
          </div>
          <ul className="grid grid-cols-1 gap-1 text-sm sm:grid-cols-2" aria-label="Predicted lines">
            {room.lines.map((l) => {
              const hit = room.hits.filter((h) => h.species === l.species && h.harmonic === l.harmonic);
              return (
                <li key={`${l.species}-${l.harmonic}`}>
                  <span className="font-bold">{l.label}</span>: {formatFrequency(l.lowHz)} – {formatFrequency(l.highHz)}
                  {hit.length > 0 && <span className="font-bold text-danger"> — in {hit.map((h) => h.bandName).join(', ')}</span>}
                </li>
              );
            })}
          </ul>
        </section>
      )}

      <section aria-labelledby="room-flags-heading" className="flex flex-col gap-3">
        <h2 id="room-flags-heading" className="text-2xl font-bold">
          Flags in this room
        </h2>
        {!flags.data ? (
          <QueryState label="flags" query={flags} />
        ) : roomFlags.length === 0 ? (
          <p className="text-fg-muted">No line of this room falls in a watched band.</p>
        ) : (
          roomFlags.map((f) => <FlagCard key={f.id} flag={f} organisationId={organisationId} surveyId={surveyId} canWork={canWork} />)
        )}
      </section>

      <section aria-labelledby="room-sweeps-heading" className="flex flex-col gap-3">
        <h2 id="room-sweeps-heading" className="text-2xl font-bold">
          Analyser sweeps in this room
        </h2>
        {!sweeps.data ? (
          <QueryState label="sweeps" query={sweeps} />
        ) : roomSweeps.length === 0 ? (
          <p className="text-fg-muted">No sweep was taken in this room. A surveyor records one with the analyser from the capture screen.</p>
        ) : (
          roomSweeps.map((s) => <SweepPanel key={s.id} organisationId={organisationId} surveyId={surveyId} sweep={s} />)
        )}
      </section>
    </div>
  );
}
