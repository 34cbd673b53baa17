/**
 * /surveys/:surveyId/emc — the EMC check of one survey (issue 8 §2–§3): every flag where a predicted
 * cyclotron line falls in a watched band, with its power at a chosen victim distance, worked from open
 * to resolved; and every room with its field interval and the bands its lines touch.
 */
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { EmcFlag, EmcRoom } from '@shared/schemas/emc';
import { DEFAULT_VICTIM_DISTANCE_M } from '@shared/emc/room-lines';
import { formatFluxDensity } from '@shared/units';
import { Alert } from '@/components/alert';
import { EmptyState } from '@/components/empty-state';
import { DataTable } from '@/components/data-table';
import { useSurveySummary } from '@/features/capture/data/get-survey-summary';
import { FlagCard } from '@/features/emc/components/flag-card';
import { useEmcRooms } from '@/features/emc/data/list-emc-rooms';
import { useFlags } from '@/features/emc/data/list-flags';
import { QueryState } from '@/features/site-setup/components/query-state';
import { useSignedIn } from './signed-in-layout';

const STATES: { value: EmcFlag['state'] | 'all'; label: string }[] = [
  { value: 'open', label: 'Open' },
  { value: 'acknowledged', label: 'Acknowledged' },
  { value: 'resolved', label: 'Resolved' },
  { value: 'all', label: 'All' },
];

const room = createColumnHelper<EmcRoom>();

export default function SurveyEmcRoute() {
  const { surveyId = '' } = useParams();
  const { membership } = useSignedIn();
  const organisationId = membership?.organisationId ?? '';
  const canWork = membership?.role === 'emc' || membership?.role === 'admin';
  const [distanceText, setDistanceText] = useState(String(DEFAULT_VICTIM_DISTANCE_M));
  const distance = Number(distanceText);
  const distanceOk = Number.isFinite(distance) && distance > 0 && distance <= 100_000;
  const [victimDistanceM, setVictimDistanceM] = useState(DEFAULT_VICTIM_DISTANCE_M);
  const [state, setState] = useState<EmcFlag['state'] | 'all'>('open');
  const survey = useSurveySummary(organisationId, surveyId);
  const flags = useFlags(organisationId, surveyId, victimDistanceM);
  const rooms = useEmcRooms(organisationId, surveyId);
  const roomHref = (roomId: string | null) => (roomId ? `/surveys/${surveyId}/emc/rooms/${roomId}` : undefined);

  const all = flags.data?.flags ?? [];
  const shown = state === 'all' ? all : all.filter((f) => f.state === state);
  const counts = Object.fromEntries(STATES.map((s) => [s.value, s.value === 'all' ? all.length : all.filter((f) => f.state === s.value).length]));

  const columns = [
    room.accessor('name', {
      header: 'Room',
      cell: (info) => (
        <Link to={roomHref(info.row.original.roomId)!} className="font-bold text-link underline">
          {info.getValue()}
        </Link>
      ),
    }),
    room.accessor((r) => r.field?.highT ?? -1, {
      id: 'field',
      header: 'Field interval',
      cell: (info) => {
        const f = info.row.original.field;
        return f ? `${formatFluxDensity(f.lowT, { significantDigits: 3 })} – ${formatFluxDensity(f.highT, { significantDigits: 3 })}` : 'No reading yet';
      },
    }),
    room.accessor((r) => r.hits.length, {
      id: 'hits',
      header: 'Lines in watched bands',
      cell: (info) => {
        const hits = info.row.original.hits;
        return hits.length === 0 ? 'None' : <span className="font-bold">{[...new Set(hits.map((h) => h.bandName))].join(', ')}</span>;
      },
    }),
    room.accessor((r) => r.emitters.join(', '), { id: 'emitters', header: 'Plasma emitters', cell: (info) => info.getValue() || '—' }),
  ];

  return (
    <div className="flex flex-col gap-6">
      <nav aria-label="Breadcrumb">
        <Link to={`/surveys/${surveyId}`} className="inline-flex min-h-touch items-center">
          ← {survey.data?.name ?? 'The survey'}
        </Link>
      </nav>
      <div>
        <h1 className="text-3xl font-bold">EMC check{survey.data ? `: ${survey.data.name}` : ''}</h1>
        <p className="text-fg-muted">
          Where the stray field would make a plasma radiate into a band you protect. Lines are predicted from the readings (each widened by its gaussmeter’s uncertainty); a
          flag is raised wherever one touches a watch band, and kept current as readings, decisions and bands change.
        </p>
      </div>
      {rooms.data?.provisional && (
        <Alert tone="info" title="The survey is still open">
          Until it is signed off, predictions use every reading not rejected, reviewed or not; flags built on unreviewed readings say “provisional”.
        </Alert>
      )}

      <section aria-labelledby="flags-heading" className="flex flex-col gap-3">
        <h2 id="flags-heading" className="text-2xl font-bold">
          Flags
        </h2>
        <div className="flex flex-wrap items-end gap-4">
          <fieldset className="flex flex-wrap gap-2">
            <legend className="mb-1 font-bold">Show</legend>
            {STATES.map((s) => (
              <label key={s.value} className="inline-flex min-h-touch items-center gap-2 rounded-lg border-2 border-field-border px-3">
                <input type="radio" name="flag-state" value={s.value} checked={state === s.value} onChange={() => setState(s.value)} className="h-5 w-5 accent-accent" />
                {s.label} ({counts[s.value] ?? 0})
              </label>
            ))}
          </fieldset>
          <form
            className="flex flex-col gap-1"
            onSubmit={(event) => {
              event.preventDefault();
              if (distanceOk) setVictimDistanceM(distance);
            }}
          >
            <label htmlFor="victim-distance" className="font-bold">
              Victim receiver distance (m)
            </label>
            <span className="flex gap-2">
              <input
                id="victim-distance"
                inputMode="decimal"
                value={distanceText}
                onChange={(event) => setDistanceText(event.target.value)}
                aria-invalid={distanceOk ? undefined : true}
                aria-describedby="victim-distance-hint"
                className="min-h-touch w-28 rounded-lg border-2 border-field-border bg-surface px-3 text-lg text-fg"
              />
              <button type="submit" className="min-h-touch rounded-lg border-2 border-field-border px-4 font-bold" disabled={!distanceOk}>
                Apply
              </button>
            </span>
            <span id="victim-distance-hint" className={`text-sm ${distanceOk ? 'text-fg-muted' : 'font-bold text-danger'}`}>
              {distanceOk ? 'Free space, isotropic emitter, far field' : 'A distance in metres, greater than 0'}
            </span>
          </form>
        </div>
        {!flags.data ? (
          <QueryState label="flags" query={flags} />
        ) : shown.length === 0 ? (
          all.length === 0 ? (
            <EmptyState title="No predicted line falls in a watched band" action={canWork ? { to: '/watch-bands', label: 'Check the watched bands list' } : undefined}>
              {canWork
                ? 'Flags appear here when a station’s predicted line falls inside a watch band. If you expected one, check the list of bands and the emitters in each room.'
                : 'Flags appear here when a station’s predicted line falls inside a band the organisation protects. An EMC engineer keeps that list.'}
            </EmptyState>
          ) : (
            <EmptyState title={`No ${state} flags`}>Choose another filter to see the rest.</EmptyState>
          )
        ) : (
          <div className="flex flex-col gap-3">
            {shown.map((f) => (
              <FlagCard key={f.id} flag={f} organisationId={organisationId} surveyId={surveyId} canWork={canWork} roomHref={roomHref(f.roomId)} />
            ))}
          </div>
        )}
      </section>

      <section aria-labelledby="rooms-heading" className="flex flex-col gap-3">
        <h2 id="rooms-heading" className="text-2xl font-bold">
          Rooms
        </h2>
        {!rooms.data ? (
          <QueryState label="rooms" query={rooms} />
        ) : (
          <DataTable label="Rooms" data={rooms.data.rooms} columns={columns} getRowId={(r) => r.roomId} initialSorting={[{ id: 'hits', desc: true }]} pageSize={15} />
        )}
      </section>
      <p className="text-sm text-fg-muted">
        Predictions are estimates for planning, not measurements: confirm with an analyser before acting, and follow your site’s radio licence conditions and local EMC rules.
      </p>
    </div>
  );
}
