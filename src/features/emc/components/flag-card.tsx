import { useId, useState } from 'react';
import { Link } from 'react-router-dom';
import type { EmcFlag } from '@shared/schemas/emc';
import { REFERENCE_ANALYSER } from '@shared/emc/room-lines';
import { formatFluxDensity, formatFrequency, formatPower } from '@shared/units';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useWorkFlag } from '../data/work-flag';
import { SeverityChip } from './severity-chip';

const STATE_LABEL: Record<EmcFlag['state'], string> = { open: 'Open', acknowledged: 'Acknowledged', resolved: 'Resolved' };
const STATE_CHIP: Record<EmcFlag['state'], string> = {
  open: 'bg-danger-soft text-danger',
  acknowledged: 'bg-warning-soft text-warning',
  resolved: 'bg-ok-soft text-ok',
};

/** W/m² and dB figures have no unit in shared/units (nobody types them): format them here. */
const sci = (value: number, unit: string) => `${value.toPrecision(3).replace('e+', 'e')} ${unit}`;

function When({ iso }: { iso: string | null }) {
  if (!iso) return null;
  return <time dateTime={iso}>{new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' })}</time>;
}

export function FlagCard({
  flag,
  organisationId,
  surveyId,
  canWork,
  roomHref,
}: {
  flag: EmcFlag;
  organisationId: string;
  surveyId: string;
  canWork: boolean;
  /** Where the room's page is; omitted on the room's own page. */
  roomHref?: string;
}) {
  const d = flag.details;
  const e = d.emission;
  const work = useWorkFlag(organisationId, surveyId);
  const [text, setText] = useState('');
  const [error, setError] = useState<string | null>(null);
  const inputId = useId();
  const step = flag.state === 'open' ? 'acknowledge' : flag.state === 'acknowledged' ? 'resolve' : null;
  const title = `${flag.label} in ${d.bandName}`;

  return (
    <article className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4" aria-label={`${title}, ${d.roomName}`} data-testid="flag-card">
      <header className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-xl font-bold">{title}</h3>
        <span className="flex flex-wrap items-center gap-2">
          <SeverityChip severity={flag.severity} />
          <span className={`rounded-full px-3 py-1 text-sm font-bold ${STATE_CHIP[flag.state]}`} data-testid="flag-state">
            {STATE_LABEL[flag.state]}
          </span>
        </span>
      </header>
      <p>
        {roomHref ? (
          <Link to={roomHref} className="font-bold text-link underline">
            {d.roomName}
          </Link>
        ) : (
          <span className="font-bold">{d.roomName}</span>
        )}
        : the line spans {formatFrequency(d.lineLowHz)} – {formatFrequency(d.lineHighHz)} from {formatFluxDensity(d.fieldLowT, { significantDigits: 3 })} to{' '}
        {formatFluxDensity(d.fieldHighT, { significantDigits: 3 })} ({d.readings} {d.readings === 1 ? 'reading' : 'readings'}, widened by their uncertainty) and overlaps{' '}
        {d.bandName} ({formatFrequency(d.bandLowerHz)} – {formatFrequency(d.bandUpperHz)}) over{' '}
        <span className="font-bold">
          {formatFrequency(flag.overlapLowerHz ?? 0)} – {formatFrequency(flag.overlapUpperHz ?? 0)}
        </span>
        .
      </p>
      {d.provisional && (
        <p className="w-fit rounded-full bg-warning-soft px-3 py-1 text-sm font-bold text-warning" data-testid="provisional-badge">
          Provisional: some readings behind it are not reviewed yet
        </p>
      )}
      {e ? (
        <dl className="grid grid-cols-1 gap-x-4 gap-y-1 text-sm sm:grid-cols-2" data-testid="flag-emission">
          <dt className="text-fg-muted">Emitted by {d.emitters.join(', ')}</dt>
          <dd className="font-bold">{sci(e.emittedPowerW, 'W')} ({formatPower(e.emittedPowerW, { unit: 'dBm', significantDigits: 3 })}) at {formatFluxDensity(e.fieldT, { significantDigits: 3 })}</dd>
          <dt className="text-fg-muted">Flux density {e.victimDistanceM} m away</dt>
          <dd className="font-bold">{sci(e.fluxDensityWPerM2, 'W/m²')}</dd>
          <dt className="text-fg-muted">Spread over the line</dt>
          <dd className="font-bold">{e.spectralFluxDensityDbWPerM2Hz.toFixed(1)} dB(W/(m²·Hz))</dd>
          <dt className="text-fg-muted">Against the band’s threshold</dt>
          <dd className="font-bold">
            {e.marginDb === null
              ? 'The band names no threshold (see the analyser below)'
              : e.marginDb > 0
                ? `${e.marginDb.toFixed(1)} dB above ${e.thresholdDbWPerM2Hz} dB(W/(m²·Hz))`
                : `${(-e.marginDb).toFixed(1)} dB below ${e.thresholdDbWPerM2Hz} dB(W/(m²·Hz))`}
          </dd>
          <dt className="text-fg-muted">On an analyser there (0 dBi, RBW {REFERENCE_ANALYSER.rbwHz / 1e3} kHz, noise {REFERENCE_ANALYSER.danlDbmPerHz} dBm/Hz)</dt>
          <dd className="font-bold">
            {e.receivedInRbwDbm.toFixed(1)} dBm against a floor of {e.analyserNoiseFloorDbm.toFixed(1)} dBm:{' '}
            {e.noiseMarginDb > 0 ? `${e.noiseMarginDb.toFixed(1)} dB above the noise, visible` : `${(-e.noiseMarginDb).toFixed(1)} dB below the noise`}
          </dd>
        </dl>
      ) : (
        <p className="text-sm text-fg-muted">
          {d.emitters.length === 0
            ? 'No plasma emitter is recorded in this room: the line would radiate only if a plasma were there.'
            : 'Power is estimated for the fundamental electron line only; harmonics and ion lines radiate far less.'}
        </p>
      )}
      {flag.acknowledgementNote && (
        <p className="text-sm">
          <span className="font-bold">Acknowledged</span> <When iso={flag.acknowledgedAt} />: {flag.acknowledgementNote}
        </p>
      )}
      {flag.resolution && (
        <p className="text-sm">
          <span className="font-bold">Resolved</span> <When iso={flag.resolvedAt} />: {flag.resolution}
        </p>
      )}
      {canWork && step && (
        <form
          className="flex flex-col gap-2"
          noValidate
          onSubmit={(event) => {
            event.preventDefault();
            if (!text.trim()) {
              setError(step === 'acknowledge' ? 'Say what is being done about it.' : 'Say what was done: lamp replaced, gauge moved, shielding added…');
              return;
            }
            setError(null);
            work.mutate(
              { flagId: flag.id, step, text: text.trim() },
              {
                onSuccess: () => {
                  setText('');
                  showToast({ tone: 'ok', message: step === 'acknowledge' ? 'Flag acknowledged.' : 'Flag resolved.' });
                },
                onError: (err) => setError(isApiRequestError(err) ? err.message : 'Could not save; try again.'),
              },
            );
          }}
        >
          <label htmlFor={inputId} className="font-bold">
            {step === 'acknowledge' ? 'Acknowledge with a note' : 'Resolve: the action taken'}
          </label>
          <textarea
            id={inputId}
            value={text}
            onChange={(event) => setText(event.target.value)}
            rows={2}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${inputId}-error` : undefined}
            className="rounded-lg border-2 border-field-border bg-surface p-2 text-lg text-fg"
            placeholder={step === 'acknowledge' ? 'Tool owner told; shielding quote requested' : 'Shielding added around the applicator'}
          />
          {error && (
            <p id={`${inputId}-error`} className="text-sm font-bold text-danger">
              {error}
            </p>
          )}
          <Button type="submit" className="w-fit" busy={work.isPending}>
            {step === 'acknowledge' ? 'Acknowledge' : 'Resolve'}
          </Button>
        </form>
      )}
    </article>
  );
}
