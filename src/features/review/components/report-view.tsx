/**
 * The survey report (issue 7 §5): HTML made to be printed (the browser saves it as PDF). Every number
 * names the reading it comes from, the instrument that took it and the person who did; the signature
 * block gives who signed, when, and the SHA-256 of the report's data, which anyone can recompute from
 * GET …/report (the hash of the RFC 8785 canonical JSON of `data`).
 */
import type { ReactNode } from 'react';
import type { SurveyReport } from '@shared/schemas/review';
import { formatFluxDensity, formatFrequency } from '@shared/units';
import { Button } from '@/components/button';
import { VERDICT_LABELS } from '../lib/review-rows';
// The print stylesheet (a file, not a <style> element: the Content-Security-Policy allows 'self' styles only).
import './report-print.css';


const fmtT = (t: number | null) => (t === null ? '—' : formatFluxDensity(t, { unit: 'mT', significantDigits: 4 }));
const day = (iso: string | null) => (iso ? iso.slice(0, 10) : '—');
const time = (iso: string) => iso.replace('T', ' ').slice(0, 16) + ' UTC';
const short = (id: string) => id.slice(0, 8);

const CAL_WORDS = { in_date: 'In date', overdue: 'Overdue', unknown: 'No due date recorded' } as const;

function Section({ id, title, children, className = '' }: { id: string; title: string; children: ReactNode; className?: string }) {
  return (
    <section aria-labelledby={id} className={`flex flex-col gap-2 ${className}`}>
      <h2 id={id} className="text-xl font-bold">
        {title}
      </h2>
      {children}
    </section>
  );
}

/** A table that scrolls sideways on a narrow screen instead of widening the page (reachable by keyboard). */
function Wide({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="relative overflow-x-auto print:overflow-visible" role="region" aria-label={label} tabIndex={0}>
      {children}
    </div>
  );
}

const th = 'px-2 py-1 text-left font-bold';
const td = 'px-2 py-1 align-top';

export function ReportView({ report, map }: { report: SurveyReport; map: ReactNode }) {
  const { data, status } = report;
  const people = new Map(data.people.map((p) => [p.userId, p]));
  const instruments = new Map(data.instruments.map((i) => [i.id, i]));
  const levels = new Map(data.levels.map((l) => [l.id, l.name]));
  const rooms = new Map(data.rooms.map((r) => [r.id, r]));
  const stations = new Map(data.stations.map((s) => [s.id, s]));
  const name = (id: string | null | undefined) => (id ? (people.get(id)?.name ?? short(id)) : '—');
  const inst = (id: string | null) => {
    const i = id ? instruments.get(id) : undefined;
    return i ? `${i.model} · ${i.serial}` : '—';
  };
  const byStation = new Map<string, typeof data.readings>();
  for (const r of data.readings) byStation.set(r.stationId, [...(byStation.get(r.stationId) ?? []), r]);
  const readingsSorted = [...data.readings].sort((a, b) => (a.measuredAt < b.measuredAt ? -1 : a.measuredAt > b.measuredAt ? 1 : a.id < b.id ? -1 : 1));
  const verdictCount = (v: 'accepted' | 'remeasure' | 'rejected') => data.readings.filter((r) => r.decision?.verdict === v).length + data.sweeps.filter((s) => s.decision?.verdict === v).length;
  const undecided = data.readings.filter((r) => !r.decision).length + data.sweeps.filter((s) => !s.decision).length;
  const hashMatches = status.reportSha256 !== null && status.reportSha256 === report.dataSha256;

  return (
    <article className="flex flex-col gap-6" data-print-report data-testid="survey-report">
      <div className="print:hidden flex flex-wrap gap-3">
        <Button onClick={() => window.print()} data-testid="print-report">
          Print or save as PDF
        </Button>
      </div>

      <header className="fw-report-header flex flex-col gap-1">
        <p className="text-fg-muted">Stray-field survey report</p>
        <h1 className="text-3xl font-bold" data-testid="report-title">
          {data.survey.name}
        </h1>
        <p>
          {data.site.name}
          {data.site.address && ` · ${data.site.address}`}
        </p>
        <p>
          Survey period {day(data.survey.startsOn)} to {day(data.survey.endsOn)} · measured {data.method.firstMeasuredAt ? time(data.method.firstMeasuredAt) : '—'} to{' '}
          {data.method.lastMeasuredAt ? time(data.method.lastMeasuredAt) : '—'}
        </p>
        {status.state !== 'signed_off' && (
          <p className="font-bold text-warning" data-testid="report-draft">
            Draft: this survey is {status.state === 'open' ? 'open' : 'submitted for review'} and not signed off.
          </p>
        )}
      </header>

      <Section id="report-signature" title="Signature" className="fw-keep rounded-xl border-2 border-border p-3">
        {status.state === 'signed_off' && status.signedOffBy && status.signedOffAt ? (
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 wrap-anywhere" data-testid="signature-block">
            <dt className="font-bold">Signed off by</dt>
            <dd>
              {status.signedOffBy.name} ({people.get(status.signedOffBy.userId)?.email ?? short(status.signedOffBy.userId)})
            </dd>
            <dt className="font-bold">Signed off at</dt>
            <dd>{time(status.signedOffAt)}</dd>
            {data.submitted && (
              <>
                <dt className="font-bold">Submitted by</dt>
                <dd>
                  {name(data.submitted.byUserId)}, {time(data.submitted.at)}
                </dd>
              </>
            )}
            <dt className="font-bold">Report data SHA-256</dt>
            <dd className="break-all font-mono text-sm" data-testid="signature-sha256">
              {status.reportSha256 ?? 'none recorded'}
            </dd>
            <dt className="font-bold">Check</dt>
            <dd data-testid="signature-check">
              {status.reportSha256 === null
                ? `No hash was recorded at sign-off. The data below hashes to ${report.dataSha256}.`
                : hashMatches
                  ? 'The data below hashes to the signed value.'
                  : `The data below hashes to ${report.dataSha256}, not the signed value: it has changed since sign-off.`}
            </dd>
          </dl>
        ) : (
          <p className="wrap-anywhere">Not signed off yet. The hash of the report data as it stands is {report.dataSha256}.</p>
        )}
        <p className="text-sm text-fg-muted">
          The hash is SHA-256 of the UTF-8 bytes of the RFC 8785 canonical JSON of the report data (GET the report from the API and recompute it).
        </p>
      </Section>

      <Section id="report-method" title="Method">
        <ul className="list-disc pl-5">
          <li>
            {data.method.fieldReadingCount} field readings and {data.method.sweepCount} spectrum sweeps at {data.method.stationCount} stations on {data.levels.length}{' '}
            {data.levels.length === 1 ? 'level' : 'levels'} ({data.levels.map((l) => l.name).join(', ')}).
          </li>
          <li>
            Probe orientations: {data.method.probeOrientations.join(', ').replace(/_/g, ' ') || '—'}; units typed: {data.method.enteredUnits.join(', ') || '—'}; {data.method.zeroedCount} readings
            taken with the meter zeroed first. Values are stored in tesla and shown here in millitesla.
          </li>
          <li>
            Safety classes against {data.zoneSet ? `${data.zoneSet.name} (${data.zoneSet.edition})` : 'no zone set'}
            {data.zoneSet && `: ${data.zoneSet.thresholds.map((t) => `${t.name} at ${fmtT(t.fieldT)}`).join('; ')}`}. A field at or above a threshold is in its zone.
          </li>
          <li>
            Cyclotron lines predicted for {data.survey.species.join(', ')} up to harmonic {data.survey.maxHarmonic}; readings closer than {data.survey.repeatRadiusM} m are grouped as repeats.
          </li>
          <li>
            Decisions: {verdictCount('accepted')} accepted, {verdictCount('rejected')} rejected, {verdictCount('remeasure')} waiting for re-measure, {undecided} undecided. Rejected readings are listed but
            do not set a room’s class.
          </li>
        </ul>
        {data.survey.notes && <p>{data.survey.notes}</p>}
      </Section>

      <Section id="report-instruments" title="Instruments">
        <Wide label="Instruments">
          <table className="w-full border-collapse text-sm" data-testid="report-instruments">
            <thead>
              <tr>
                <th className={th}>Instrument</th>
                <th className={th}>Kind</th>
                <th className={th}>Calibrated</th>
                <th className={th}>Due</th>
                <th className={th}>Certificate</th>
                <th className={th}>Status at last use</th>
                <th className={th}>Records</th>
              </tr>
            </thead>
            <tbody>
              {data.instruments.map((i) => (
                <tr key={i.id} className="border-t border-border">
                  <td className={td}>
                    {i.model} · {i.serial}
                    {i.probe && ` (${i.probe})`}
                    {i.relativeUncertainty !== null && `, u = ${(i.relativeUncertainty * 100).toPrecision(2)} %`}
                  </td>
                  <td className={td}>{i.kind}</td>
                  <td className={td}>{day(i.calibratedOn)}</td>
                  <td className={td}>{day(i.calibrationDueOn)}</td>
                  <td className={td}>{i.calibrationCertificate ?? '—'}</td>
                  <td className={`${td} ${i.calibration === 'overdue' ? 'font-bold text-danger' : ''}`}>{CAL_WORDS[i.calibration]}</td>
                  <td className={td}>{i.readingCount}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Wide>
      </Section>

      <Section id="report-map" title="Map with isogauss lines" className="fw-page-break">
        {map}
      </Section>

      <Section id="report-rooms" title="Rooms and their highest class">
        <Wide label="Rooms and their highest class">
          <table className="w-full border-collapse text-sm">
            <thead>
              <tr>
                <th className={th}>Room</th>
                <th className={th}>Level</th>
                <th className={th}>Highest |B| (not rejected)</th>
                <th className={th}>Class</th>
              </tr>
            </thead>
            <tbody>
              {[...data.rooms].sort((a, b) => (b.maxFieldT ?? -1) - (a.maxFieldT ?? -1)).map((r) => (
                <tr key={r.id} className="border-t border-border">
                  <td className={td}>{r.name}</td>
                  <td className={td}>{levels.get(r.levelId) ?? '—'}</td>
                  <td className={td}>{fmtT(r.maxFieldT)}</td>
                  <td className={td}>{r.highestClass?.label ?? '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Wide>
      </Section>

      <Section id="report-stations" title="Stations">
        <Wide label="Stations">
          <table className="w-full border-collapse text-sm" data-testid="report-stations">
            <thead>
              <tr>
                <th className={th}>Station</th>
                <th className={th}>Level · room</th>
                <th className={th}>x, y, height (m)</th>
                <th className={th}>Readings</th>
                <th className={th}>Highest |B| (not rejected)</th>
                <th className={th}>Class</th>
              </tr>
            </thead>
            <tbody>
              {data.stations.map((s) => {
                const list = (byStation.get(s.id) ?? []).filter((r) => r.decision?.verdict !== 'rejected');
                const top = list.reduce<(typeof list)[number] | null>((m, r) => (!m || r.fieldT > m.fieldT ? r : m), null);
                return (
                  <tr key={s.id} className="border-t border-border">
                    <td className={td}>{s.label ?? short(s.id)}</td>
                    <td className={td}>
                      {levels.get(s.levelId) ?? '—'} · {s.roomId ? (rooms.get(s.roomId)?.name ?? '—') : 'outside rooms'}
                    </td>
                    <td className={`${td} tabular-nums`}>
                      {s.xM.toFixed(2)}, {s.yM.toFixed(2)}, {s.heightM.toFixed(2)}
                    </td>
                    <td className={td}>{byStation.get(s.id)?.length ?? 0}</td>
                    <td className={`${td} tabular-nums`}>{top ? `${fmtT(top.fieldT)} (reading ${short(top.id)})` : '—'}</td>
                    <td className={td}>{top?.safetyClass?.label ?? '—'}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </Wide>
      </Section>

      <Section id="report-readings" title="Readings and decisions" className="fw-page-break">
        <Wide label="Readings and decisions">
          <table className="w-full border-collapse text-sm" data-testid="report-readings">
            <thead>
              <tr>
                <th className={th}>Reading</th>
                <th className={th}>Station</th>
                <th className={th}>Time</th>
                <th className={th}>|B|</th>
                <th className={th}>Class</th>
                <th className={th}>Surveyor</th>
                <th className={th}>Instrument</th>
                <th className={th}>Decision</th>
              </tr>
            </thead>
            <tbody>
              {readingsSorted.map((r) => (
                <tr key={r.id} className="border-t border-border">
                  <td className={`${td} font-mono`}>{short(r.id)}</td>
                  <td className={td}>{stations.get(r.stationId)?.label ?? short(r.stationId)}</td>
                  <td className={td}>{time(r.measuredAt)}</td>
                  <td className={`${td} tabular-nums`}>
                    {fmtT(r.fieldT)}
                    {r.magnitudeT === null && ' (3-axis)'}
                  </td>
                  <td className={td}>{r.safetyClass?.label ?? '—'}</td>
                  <td className={td}>{name(r.surveyorUserId)}</td>
                  <td className={td}>{inst(r.instrumentId)}</td>
                  <td className={td}>
                    {r.decision ? `${VERDICT_LABELS[r.decision.verdict]} by ${name(r.decision.reviewerUserId)}${r.decision.note ? `: ${r.decision.note}` : ''}` : 'Undecided'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </Wide>
      </Section>

      {data.sweeps.length > 0 && (
        <Section id="report-sweeps" title="Spectrum sweeps">
          <Wide label="Spectrum sweeps">
            <table className="w-full border-collapse text-sm">
              <thead>
                <tr>
                  <th className={th}>Sweep</th>
                  <th className={th}>Station</th>
                  <th className={th}>Span · RBW</th>
                  <th className={th}>Peaks</th>
                  <th className={th}>Surveyor · analyser</th>
                  <th className={th}>Decision</th>
                </tr>
              </thead>
              <tbody>
                {data.sweeps.map((s) => (
                  <tr key={s.id} className="border-t border-border">
                    <td className={`${td} font-mono`}>{short(s.id)}</td>
                    <td className={td}>{stations.get(s.stationId)?.label ?? short(s.stationId)}</td>
                    <td className={td}>
                      {formatFrequency(s.startHz)} – {formatFrequency(s.stopHz)} · {formatFrequency(s.rbwHz)}
                    </td>
                    <td className={td}>{s.peaks.map((p) => `${formatFrequency(p.frequencyHz)} at ${p.levelDbm} dBm`).join('; ') || '—'}</td>
                    <td className={td}>
                      {name(s.surveyorUserId)} · {inst(s.analyserId)}
                    </td>
                    <td className={td}>{s.decision ? `${VERDICT_LABELS[s.decision.verdict]} by ${name(s.decision.reviewerUserId)}${s.decision.note ? `: ${s.decision.note}` : ''}` : 'Undecided'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Wide>
        </Section>
      )}

      <Section id="report-flags" title="Flags">
        {data.flags.length === 0 ? (
          <p>No flags were raised.</p>
        ) : (
          <Wide label="Flags">
            <table className="w-full border-collapse text-sm" data-testid="report-flags">
              <thead>
                <tr>
                  <th className={th}>Kind</th>
                  <th className={th}>Severity</th>
                  <th className={th}>State</th>
                  <th className={th}>Where</th>
                  <th className={th}>Note</th>
                </tr>
              </thead>
              <tbody>
                {data.flags.map((f) => (
                  <tr key={f.id} className="border-t border-border">
                    <td className={td}>
                      {f.kind.replace(/_/g, ' ')}
                      {f.species && ` · ${f.species} n = ${f.harmonic}`}
                    </td>
                    <td className={td}>{f.severity}</td>
                    <td className={td}>{f.state}</td>
                    <td className={td}>{f.roomId ? (rooms.get(f.roomId)?.name ?? short(f.roomId)) : f.stationId ? `station ${stations.get(f.stationId)?.label ?? short(f.stationId)}` : '—'}</td>
                    <td className={td}>{f.resolution ?? f.acknowledgementNote ?? '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Wide>
        )}
      </Section>

      <Section id="report-cautions" title="Cautions" className="fw-keep">
        <ul className="list-disc pl-5" data-testid="report-cautions">
          {data.cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
        <p className="font-bold">
          This report supports, and does not replace, the site’s MR safety officer, radiation-protection adviser and licensed practice. Follow local codes; people with
          implants or carrying ferromagnetic objects must be cleared before entering controlled zones.
        </p>
      </Section>

      <Section id="report-people" title="People">
        <ul className="list-disc pl-5">
          {data.people.map((p) => (
            <li key={p.userId}>
              {p.name} ({p.email})
            </li>
          ))}
        </ul>
      </Section>
    </article>
  );
}
