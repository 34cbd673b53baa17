import { formatFluxDensity, formatFrequency } from '@shared/units';
import type { SweepSummary } from '@shared/schemas/emc-sweep';
import { Alert } from '@/components/alert';
import { useSweepExplained } from '../data/get-sweep-explained';
import { SpectrumChart } from './spectrum-chart';

/** One analyser sweep: its spectrum with the predicted lines and watch bands over it, and its peaks explained. */
export function SweepPanel({ organisationId, surveyId, sweep }: { organisationId: string; surveyId: string; sweep: SweepSummary }) {
  const explained = useSweepExplained(organisationId, surveyId, sweep.id);
  const heading = `Sweep ${formatFrequency(sweep.startHz)} – ${formatFrequency(sweep.stopHz)} at ${sweep.station.label ?? 'a station'}`;
  return (
    <section aria-label={heading} className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4" data-testid="sweep-panel">
      <h3 className="text-xl font-bold">{heading}</h3>
      <p className="text-sm text-fg-muted">
        {new Date(sweep.measuredAt).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' })} · RBW {formatFrequency(sweep.rbwHz)} · {sweep.detector.replace('_', '-')}{' '}
        detector
      </p>
      {explained.isPending ? (
        <p role="status">Matching the peaks with the predicted lines…</p>
      ) : explained.error ? (
        <Alert tone="danger" title="Could not explain this sweep">
          {explained.error.message}
        </Alert>
      ) : (
        <>
          <p className="text-sm">
            {explained.data.fieldInterval
              ? `Lines predicted from ${formatFluxDensity(explained.data.fieldInterval.lowT, { significantDigits: 3 })} to ${formatFluxDensity(explained.data.fieldInterval.highT, { significantDigits: 3 })} (${explained.data.fieldInterval.note})`
              : 'No field reading here: no line can be predicted, so every peak is unexplained.'}
          </p>
          <SpectrumChart
            trace={explained.data.trace.points}
            peaks={explained.data.peaks}
            lines={explained.data.lines.filter((l) => l.inSpan)}
            watchBands={explained.data.watchBands}
            startHz={explained.data.sweep.startHz}
            stopHz={explained.data.sweep.stopHz}
            traceNote={explained.data.trace.reason}
          />
          <details className="text-sm">
            <summary className="cursor-pointer font-bold">How peaks are found and matched</summary>
            <p className="mt-2">{explained.data.peakRule}</p>
            <p className="mt-1">Analyser frequency accuracy: {explained.data.frequencyAccuracy.source}.</p>
          </details>
        </>
      )}
    </section>
  );
}
