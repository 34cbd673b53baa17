import { formatFluxDensity, formatFrequency } from '@shared/units';
import type { OfflineWatchBand } from '@shared/schemas/offline';
import { harmonicLabel, type FieldFeedback } from '../lib/feedback';
import type { FieldUnit } from '../lib/reading-form';
import { FrequencyRuler } from '@/components/frequency-ruler';

export interface FeedbackPanelProps {
  feedback: FieldFeedback | null;
  unit: FieldUnit;
  watchBands: readonly OfflineWatchBand[];
}

function zoneTone(zoneIndex: number, zoneCount: number): string {
  if (zoneIndex < 0) return 'border-ok bg-ok-soft';
  if (zoneIndex >= zoneCount - 1) return 'border-danger bg-danger-soft';
  return 'border-warning bg-warning-soft';
}

/**
 * What the typed field means, computed on the device from shared/physics as soon as |B| can be read:
 * the safety class and its cautions, the predicted lines, and any line that lands in a watch band.
 */
export function FeedbackPanel({ feedback, unit, watchBands }: FeedbackPanelProps) {
  if (!feedback) {
    return (
      <section aria-label="Computed feedback" className="rounded-lg border-2 border-dashed border-border p-3 text-fg-muted" data-testid="feedback">
        Type |B| to see the safety class and the predicted cyclotron lines.
      </section>
    );
  }
  const { classification: c } = feedback;
  const zoneCount = c.nextThreshold ? c.zoneIndex + 2 : c.zoneIndex + 1;
  const bandName = (id: string) => watchBands.find((b) => b.id === id)?.name ?? 'a watch band';
  const [ownCaution, ...general] = c.threshold ? c.cautions : [null, ...c.cautions];
  return (
    <section aria-label="Computed feedback" className="flex flex-col gap-3" data-testid="feedback" aria-live="polite">
      <div className={`rounded-lg border-l-8 px-3 py-2 ${zoneTone(c.zoneIndex, Math.max(zoneCount, 1))}`} data-testid="safety-class">
        <p className="text-sm text-fg-muted">
          |B| = <span className="font-bold text-fg">{formatFluxDensity(feedback.fieldT, { unit })}</span> · {c.follows}
          {feedback.zoneSetIsDefault ? ' (the survey names no zone set; default shown)' : ''}
        </p>
        <p className="text-lg font-bold text-fg">{c.label}</p>
        {ownCaution && <p className="text-fg">{ownCaution}</p>}
        {c.nextThreshold && (
          <p className="text-sm text-fg-muted">
            Next line: {c.nextThreshold.label} at {formatFluxDensity(c.nextThreshold.thresholdTesla, { unit })}
          </p>
        )}
        <details className="mt-1 text-sm">
          <summary className="min-h-touch cursor-pointer py-3 font-bold text-fg">General cautions</summary>
          <ul className="list-disc pl-5 text-fg">
            {general.map((text) => (
              <li key={text}>{text}</li>
            ))}
          </ul>
        </details>
      </div>

      {feedback.hits.length > 0 && (
        <div role="alert" className="rounded-lg border-l-8 border-danger bg-danger-soft px-3 py-2 text-fg" data-testid="band-hits">
          <p className="font-bold text-danger">Predicted line inside a watch band</p>
          <ul>
            {feedback.hits.map((h) => (
              <li key={`${h.speciesId}-${h.harmonic}-${h.watchBandId}`}>
                {h.speciesId} {harmonicLabel(h.harmonic)} {formatFrequency(h.lineLowHz)} – {formatFrequency(h.lineHighHz)} in <strong>{bandName(h.watchBandId)}</strong>
              </li>
            ))}
          </ul>
        </div>
      )}

      <FrequencyRuler lines={feedback.lines} watchBands={watchBands} />

      <details>
        <summary className="min-h-touch cursor-pointer py-3 font-bold">
          Predicted lines ({feedback.lines.length}, ±{(feedback.relativeUncertainty * 100).toFixed(1)} % from the instrument)
        </summary>
        <table className="w-full text-sm">
          <thead>
            <tr className="text-left text-fg-muted">
              <th className="py-1 pr-2">Species</th>
              <th className="py-1 pr-2">n</th>
              <th className="py-1">Line</th>
            </tr>
          </thead>
          <tbody>
            {feedback.lines.map((l) => (
              <tr key={`${l.speciesId}-${l.harmonic}`} className={l.hits.length ? 'font-bold text-danger' : ''}>
                <td className="py-1 pr-2">{l.speciesName}</td>
                <td className="py-1 pr-2">{l.harmonic}</td>
                <td className="py-1">
                  {formatFrequency(l.centreHz)} ({formatFrequency(l.lowHz)} – {formatFrequency(l.highHz)})
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="text-xs text-fg-muted">Cold lines f = n·|q|B/(2πm) (Jackson §12.2). Hot plasma lines sit slightly lower.</p>
      </details>
    </section>
  );
}
