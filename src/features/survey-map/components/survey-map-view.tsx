/**
 * The survey map screen (issue 7 §1–2): one level at a time over its calibrated plan, with the layers
 * a reviewer switches (stations by |B|, labelled isogauss lines, shaded zones, rooms by highest class,
 * repeat groups with their spread, the dipole fit with its residuals), a legend in the chosen unit, the
 * safety cautions, extra lines, the GeoJSON export, and the comparison with an earlier signed-off
 * survey of the same site. Grids and contours come from the server; nothing heavy runs here.
 *
 * `printable` drops the controls and shows every level, for the survey report.
 */
import { useMemo, useState, type FormEvent } from 'react';
import { parseFluxDensityTesla } from '@shared/units';
import { DEFAULT_COMPARE_BEARINGS_DEG, MAX_EXTRA_LEVELS, type LevelMap, type SurveyMap } from '@shared/schemas/survey-map';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { useTheme } from '@/lib/theme';
import { useCompareCandidates } from '../data/get-compare-candidates';
import { useSurveyCompare } from '../data/get-survey-compare';
import { useSurveyMap } from '../data/get-survey-map';
import { fieldDomainFor } from '@/lib/colour-scale';
import { fieldLabel, loadMapUnit, MAP_FIELD_UNITS, saveMapUnit, type MapFieldUnit } from '../lib/units';
import { CompareTable } from './compare-table';
import { DEFAULT_LAYERS, MapCanvas, type MapLayers } from './map-canvas';
import { MapLegend } from './map-legend';
import { EmptyState } from '@/components/empty-state';

export interface SurveyMapViewProps {
  organisationId: string;
  surveyId: string;
  printable?: boolean;
}

const LAYER_LABELS: { key: keyof MapLayers; label: string }[] = [
  { key: 'stations', label: 'Stations by |B|' },
  { key: 'contours', label: 'Isogauss lines' },
  { key: 'zones', label: 'Zone shading' },
  { key: 'rooms', label: 'Rooms by highest class' },
  { key: 'repeats', label: 'Repeat groups' },
  { key: 'dipole', label: 'Dipole fit (extrapolated)' },
];

const planImageUrl = (level: LevelMap) => level.plan?.imageUrl ?? null;

function errorText(error: unknown): string {
  return isApiRequestError(error) ? error.message : 'Try again.';
}

function Cautions({ cautions }: { cautions: readonly string[] }) {
  return (
    <Alert tone="warning" title="Before anyone acts on these lines" className="print:break-inside-avoid">
      <ul className="list-disc pl-5" data-testid="map-cautions">
        {cautions.map((c) => (
          <li key={c}>{c}</li>
        ))}
        <li>Lines are interpolated between stations and stop at the edge of the surveyed area; a dipole fit beyond it is an estimate, not a measurement.</li>
      </ul>
    </Alert>
  );
}

function ExtraLevelsForm({ levels, unit, onChange }: { levels: readonly number[]; unit: MapFieldUnit; onChange: (levels: number[]) => void }) {
  const [text, setText] = useState('');
  const [error, setError] = useState<string | null>(null);
  function add(event: FormEvent) {
    event.preventDefault();
    let tesla: number;
    try {
      // A bare number is in the unit shown; "5 G" or "0.2 mT" say their own.
      tesla = parseFluxDensityTesla(/^[\d.,eE+-]+$/.test(text.trim()) ? `${text.trim()} ${unit}` : text);
    } catch {
      setError(`Type a field, e.g. 0.2 ${unit}.`);
      return;
    }
    if (!(tesla > 0) || tesla > 100) return setError('Lines go between 0 and 100 T.');
    if (levels.length >= MAX_EXTRA_LEVELS) return setError(`At most ${MAX_EXTRA_LEVELS} added lines.`);
    setError(null);
    setText('');
    onChange([...new Set([...levels, tesla])].sort((a, b) => a - b));
  }
  return (
    <form onSubmit={add} className="flex flex-col gap-2" noValidate>
      <label htmlFor="extra-level" className="font-bold">
        Add a line at
      </label>
      <div className="flex flex-wrap gap-2">
        <input
          id="extra-level"
          className="min-h-touch w-40 rounded-lg border-2 border-field-border bg-bg px-3"
          value={text}
          onChange={(e) => setText(e.target.value)}
          placeholder={`e.g. 0.2 ${unit}`}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? 'extra-level-error' : undefined}
        />
        <Button type="submit" variant="secondary">
          Add line
        </Button>
      </div>
      {error && (
        <p id="extra-level-error" className="text-danger">
          {error}
        </p>
      )}
      {levels.length > 0 && (
        <ul className="flex flex-wrap gap-2">
          {levels.map((l) => (
            <li key={l}>
              <Button variant="quiet" onClick={() => onChange(levels.filter((x) => x !== l))} aria-label={`Remove the line at ${fieldLabel(l, unit)}`}>
                {fieldLabel(l, unit)} ✕
              </Button>
            </li>
          ))}
        </ul>
      )}
    </form>
  );
}

function StationDetail({ level, stationId, map, unit }: { level: LevelMap; stationId: string; map: SurveyMap; unit: MapFieldUnit }) {
  const s = level.stations.find((x) => x.id === stationId);
  if (!s) return null;
  const zone = s.zoneIndex === null ? null : s.zoneIndex < 0 ? map.zoneSet.belowLabel : map.zoneSet.thresholds[s.zoneIndex]?.name;
  const room = level.rooms.find((r) => r.id === s.roomId);
  const residuals = level.dipoles.flatMap((d) => d.residuals.filter((r) => r.stationId === s.id).map((r) => ({ name: d.sourceName, r: r.relativeResidual })));
  return (
    <section aria-label="Selected station" className="rounded-lg border border-border bg-surface p-3" data-testid="station-detail">
      <p className="font-bold">Station {s.label ?? s.id.slice(0, 8)}</p>
      <p>{s.fieldT === null ? 'No reading taking part.' : `Latest |B| ${fieldLabel(s.fieldT, unit)} · ${zone ?? ''}`}</p>
      <p className="text-fg-muted">
        {room ? `${room.name} · ` : ''}
        {s.readingCount} {s.readingCount === 1 ? 'reading' : 'readings'}
        {s.remeasure ? ' · re-measure requested' : ''}
      </p>
      {residuals.map((x) => (
        <p key={x.name} className="text-fg-muted">
          Dipole fit of {x.name}: measured {x.r >= 0 ? '+' : ''}
          {(x.r * 100).toFixed(1)} %
        </p>
      ))}
    </section>
  );
}

function DipolePanel({ level, unit }: { level: LevelMap; unit: MapFieldUnit }) {
  if (level.dipoles.length === 0) return <p className="text-fg-muted">No magnet is placed on this level: there is nothing to fit.</p>;
  return (
    <table className="w-full border-collapse text-left text-sm" data-testid="dipole-table">
      <caption className="text-left font-bold">Dipole fits (far-field model; Jackson §5.6)</caption>
      <thead>
        <tr>
          <th scope="col" className="border-b-2 border-border p-1">
            Magnet
          </th>
          <th scope="col" className="border-b-2 border-border p-1 text-right">
            Moment
          </th>
          <th scope="col" className="border-b-2 border-border p-1 text-right">
            RMS residual
          </th>
          <th scope="col" className="border-b-2 border-border p-1 text-right">
            Largest residual
          </th>
          <th scope="col" className="border-b-2 border-border p-1 text-right">
            Stations
          </th>
        </tr>
      </thead>
      <tbody>
        {level.dipoles.map((d) => {
          const worst = d.residuals.reduce((m, r) => Math.max(m, Math.abs(r.relativeResidual)), 0);
          return (
            <tr key={d.sourceId} className="border-b border-border">
              <td className="p-1">{d.sourceName}</td>
              {d.ok ? (
                <>
                  <td className="p-1 text-right">{d.momentMagnitudeAm2?.toExponential(2)} A·m²</td>
                  {/* ln-residual RMS r ≈ relative scatter for small r */}
                  <td className="p-1 text-right">{((Math.exp(d.rmsLogResidual ?? 0) - 1) * 100).toFixed(1)} %</td>
                  <td className="p-1 text-right">{(worst * 100).toFixed(1)} %</td>
                  <td className="p-1 text-right">{d.residuals.length}</td>
                </>
              ) : (
                <td className="p-1 text-fg-muted" colSpan={4}>
                  {d.reason}
                </td>
              )}
            </tr>
          );
        })}
      </tbody>
      <tfoot>
        <tr>
          <td colSpan={5} className="p-1 text-fg-muted">
            The fit uses each magnet’s nearest stations beyond 1.5 m; its lines ({fieldLabel(level.contours[0]?.levelT ?? 1e-3, unit)} and up) reach past the stations. A large
            residual means the field there is no dipole (shielding, steel, another magnet): trust the measured lines.
          </td>
        </tr>
      </tfoot>
    </table>
  );
}

function RepeatList({ level, unit }: { level: LevelMap; unit: MapFieldUnit }) {
  if (level.repeatGroups.length === 0) return <p className="text-fg-muted">No repeat readings on this level.</p>;
  const groups = [...level.repeatGroups].sort((a, b) => Number(b.disagree) - Number(a.disagree) || (b.maxEn ?? 0) - (a.maxEn ?? 0));
  return (
    <ul className="flex flex-col gap-1 text-sm" data-testid="repeat-list">
      {groups.map((g, i) => (
        <li key={`${g.stationIds.join(',')}-${i}`} className={g.disagree ? 'font-bold text-warning' : ''}>
          {g.count} readings · mean {fieldLabel(g.meanT, unit)} · spread {fieldLabel(g.spreadT, unit)} · range {fieldLabel(g.minT, unit)}–{fieldLabel(g.maxT, unit)}
          {g.maxEn !== null ? ` · Eₙ ${g.maxEn.toFixed(2)}` : ''}
          {g.disagree ? ' · disagree' : ''}
        </li>
      ))}
    </ul>
  );
}

function ComparePanel({ organisationId, map, extraLevels, unit, withId, onWith, bearings, onBearings, levelId }: {
  organisationId: string;
  map: SurveyMap;
  extraLevels: readonly number[];
  unit: MapFieldUnit;
  withId: string;
  onWith: (id: string) => void;
  bearings: readonly number[];
  onBearings: (b: number[]) => void;
  levelId: string;
}) {
  const candidates = useCompareCandidates(organisationId);
  const compare = useSurveyCompare(organisationId, map.survey.id, withId, extraLevels, bearings);
  const [bearingText, setBearingText] = useState(bearings.join(', '));
  const [bearingError, setBearingError] = useState<string | null>(null);
  const options = (candidates.data?.surveys ?? []).filter((s) => s.siteId === map.survey.siteId && s.state === 'signed_off' && s.id !== map.survey.id);
  const level = compare.data?.levels.find((l) => l.levelId === levelId);

  function applyBearings(event: FormEvent) {
    event.preventDefault();
    const values = bearingText.split(/[,\s]+/).filter(Boolean).map(Number);
    if (values.length === 0 || values.some((v) => !Number.isFinite(v) || v < 0 || v >= 360)) return setBearingError('Give directions from 0 to 359 degrees, separated by commas.');
    if (values.length > 24) return setBearingError('At most 24 directions.');
    setBearingError(null);
    onBearings([...new Set(values)].sort((a, b) => a - b));
  }

  return (
    <section aria-labelledby="compare-title" className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4 print:hidden">
      <h2 id="compare-title" className="text-xl font-bold">
        Compare with an earlier survey
      </h2>
      {candidates.isPending ? (
        <p role="status">Finding earlier surveys…</p>
      ) : options.length === 0 ? (
        <p className="text-fg-muted">No signed-off survey of this site to compare with yet.</p>
      ) : (
        <div className="flex flex-wrap items-end gap-4">
          <label className="flex min-w-0 max-w-full flex-col gap-1">
            <span className="font-bold">Earlier survey</span>
            <select className="min-h-touch max-w-full rounded-lg border-2 border-field-border bg-bg px-3" value={withId} onChange={(e) => onWith(e.target.value)} data-testid="compare-select">
              <option value="">Not comparing</option>
              {options.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </label>
          <form onSubmit={applyBearings} className="flex flex-col gap-1" noValidate>
            <label htmlFor="compare-bearings" className="font-bold">
              Directions (° clockwise from up the plan)
            </label>
            <div className="flex gap-2">
              <input
                id="compare-bearings"
                className="min-h-touch w-64 rounded-lg border-2 border-field-border bg-bg px-3"
                value={bearingText}
                onChange={(e) => setBearingText(e.target.value)}
                aria-invalid={bearingError ? true : undefined}
                aria-describedby={bearingError ? 'compare-bearings-error' : undefined}
              />
              <Button type="submit" variant="secondary">
                Use
              </Button>
            </div>
            {bearingError && (
              <p id="compare-bearings-error" className="text-danger">
                {bearingError}
              </p>
            )}
          </form>
        </div>
      )}
      {withId !== '' && compare.isPending && <p role="status">Comparing the lines…</p>}
      {compare.error && (
        <Alert tone="danger" title="Could not compare">
          {errorText(compare.error)}
        </Alert>
      )}
      {compare.data && level && (
        <>
          <p>
            Lines of <strong>{compare.data.current.name}</strong> (solid) against <strong>{compare.data.earlier.name}</strong> (dashed, drawn at this survey’s lines), on{' '}
            {level.levelName}.
          </p>
          <CompareTable level={level} unit={unit} earlierName={compare.data.earlier.name} />
        </>
      )}
    </section>
  );
}

export function SurveyMapView({ organisationId, surveyId, printable = false }: SurveyMapViewProps) {
  const [extraLevels, setExtraLevels] = useState<number[]>([]);
  const query = useSurveyMap(organisationId, surveyId, extraLevels);
  const { theme } = useTheme();
  const [unit, setUnitState] = useState<MapFieldUnit>(() => loadMapUnit());
  const [layers, setLayers] = useState<MapLayers>(DEFAULT_LAYERS);
  const [levelChoice, setLevelChoice] = useState<string | null>(null);
  const [selectedStationId, setSelectedStationId] = useState<string | null>(null);
  const [compareWith, setCompareWith] = useState('');
  const [bearings, setBearings] = useState<number[]>([...DEFAULT_COMPARE_BEARINGS_DEG]);
  const compare = useSurveyCompare(organisationId, surveyId, compareWith, extraLevels, bearings);
  const map = query.data;

  const domain = useMemo(() => fieldDomainFor([...(map?.levels.flatMap((l) => l.stations.map((s) => s.fieldT)) ?? []), ...(map?.zoneSet.thresholds.map((t) => t.fieldT) ?? [])]), [map]);

  if (query.isPending) return <p role="status">Computing the survey map…</p>;
  if (query.error && !map) {
    const status = isApiRequestError(query.error) ? query.error.status : 0;
    return (
      <Alert tone="danger" title={status === 404 ? 'Survey not found' : status === 403 ? 'This map is not open to you' : 'Could not load the survey map'}>
        {errorText(query.error)}
      </Alert>
    );
  }
  if (!map) return null;
  if (map.levels.length === 0) {
    return (
      <EmptyState title="Nothing to map yet">
        This survey has no stations and no levels chosen. An admin or reviewer chooses the levels in the survey’s setup; surveyors then mark stations and log readings from capture.
      </EmptyState>
    );
  }

  const setUnit = (u: MapFieldUnit) => {
    setUnitState(u);
    saveMapUnit(u);
  };
  // At first, the level with the most stations: where the survey's lines are.
  const busiest = map.levels.reduce((best, l) => (l.stations.length > best.stations.length ? l : best), map.levels[0]!);
  const level = map.levels.find((l) => l.level.id === levelChoice) ?? busiest;
  const thresholdsT = map.zoneSet.thresholds.map((t) => t.fieldT);
  const earlierContours = compareWith ? (compare.data?.levels.find((l) => l.levelId === level.level.id)?.earlierContours ?? null) : null;
  const comparingName = compareWith && compare.data ? compare.data.earlier.name : null;
  const canvas = (l: LevelMap) => (
    <MapCanvas
      orgImageUrl={planImageUrl(l)}
      level={l}
      thresholdsT={thresholdsT}
      domain={domain}
      unit={unit}
      layers={layers}
      earlierContours={earlierContours}
      selectedStationId={selectedStationId}
      onSelectStation={setSelectedStationId}
      theme={theme}
      printable={printable}
    />
  );

  if (printable) {
    return (
      <div className="flex flex-col gap-6" data-testid="survey-map-printable">
        {map.levels
          .filter((l) => l.stations.length > 0)
          .map((l) => (
            <section key={l.level.id} className="flex flex-col gap-2 print:break-inside-avoid" aria-label={`Map of ${l.level.name}`}>
              <h3 className="text-lg font-bold">{l.level.name}</h3>
              {l.gridNote && <p className="text-fg-muted">{l.gridNote}</p>}
              {canvas(l)}
            </section>
          ))}
        <MapLegend map={map} domain={domain} unit={unit} comparing={null} />
        <Cautions cautions={map.cautions} />
      </div>
    );
  }

  const exportUrl = `/api/orgs/${encodeURIComponent(organisationId)}/surveys/${encodeURIComponent(surveyId)}/exports/survey.geojson`;
  return (
    <div className="flex flex-col gap-6">
      <section aria-labelledby="map-title" className="flex flex-col gap-1">
        <p className="text-fg-muted">{map.survey.siteName}</p>
        <h1 id="map-title" className="text-3xl font-bold">
          Map of {map.survey.name}
        </h1>
        <p className="text-fg-muted">
          Zone set: {map.zoneSet.name} · computed {new Date(map.computedAt).toLocaleString()} from data version {map.dataVersion}
          {query.isFetching ? ' · refreshing…' : ''}
        </p>
        {map.zoneSet.fallback && (
          <Alert tone="warning" title="This survey has no zone set">
            Stations are classed against IEC 60601-2-33 edition 4 until a reviewer chooses the lines this site follows.
          </Alert>
        )}
      </section>

      <div className="flex flex-wrap items-end gap-4">
        {map.levels.length > 1 && (
          <label className="flex min-w-0 max-w-full flex-col gap-1">
            <span className="font-bold">Level</span>
            <select
              className="min-h-touch max-w-full rounded-lg border-2 border-field-border bg-bg px-3"
              value={level.level.id}
              onChange={(e) => {
                setLevelChoice(e.target.value);
                setSelectedStationId(null);
              }}
              data-testid="level-select"
            >
              {map.levels.map((l) => (
                <option key={l.level.id} value={l.level.id}>
                  {l.level.name} ({l.stations.length} stations)
                </option>
              ))}
            </select>
          </label>
        )}
        <label className="flex min-w-0 max-w-full flex-col gap-1">
          <span className="font-bold">Unit</span>
          <select className="min-h-touch max-w-full rounded-lg border-2 border-field-border bg-bg px-3" value={unit} onChange={(e) => setUnit(e.target.value as MapFieldUnit)} data-testid="unit-select">
            {MAP_FIELD_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </select>
        </label>
        <a href={exportUrl} download className="inline-flex min-h-touch items-center font-bold" data-testid="geojson-export">
          Download GeoJSON (plan metres)
        </a>
      </div>

      <fieldset className="flex flex-wrap gap-x-6 gap-y-2">
        <legend className="mb-1 font-bold">Layers</legend>
        {LAYER_LABELS.map(({ key, label }) => (
          <label key={key} className="flex min-h-touch items-center gap-2">
            <input type="checkbox" className="h-6 w-6 accent-accent" checked={layers[key]} onChange={(e) => setLayers((l) => ({ ...l, [key]: e.target.checked }))} data-testid={`layer-${key}`} />
            {label}
          </label>
        ))}
      </fieldset>

      {level.gridNote && <Alert title="No lines on this level">{level.gridNote}</Alert>}
      {level.stations.every((st) => st.fieldT === null) && (
        <EmptyState title={`No field readings on ${level.level.name} yet`} action={{ to: `/surveys/${surveyId}/capture`, label: 'Go to capture' }}>
          The map draws its safety lines from field readings. Surveyors mark stations on this level and log readings from capture; they show here once synced.
        </EmptyState>
      )}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_22rem]">
        {canvas(level)}
        <div className="flex flex-col gap-4">
          <MapLegend map={map} domain={domain} unit={unit} comparing={comparingName} />
          {selectedStationId && <StationDetail level={level} stationId={selectedStationId} map={map} unit={unit} />}
          <ExtraLevelsForm levels={extraLevels} unit={unit} onChange={setExtraLevels} />
        </div>
      </div>

      <Cautions cautions={map.cautions} />

      {layers.repeats && (
        <section aria-labelledby="repeats-title" className="flex flex-col gap-2">
          <h2 id="repeats-title" className="text-xl font-bold">
            Repeat readings on {level.level.name}
          </h2>
          <RepeatList level={level} unit={unit} />
        </section>
      )}
      {layers.dipole && (
        <section aria-labelledby="dipole-title" className="flex flex-col gap-2">
          <h2 id="dipole-title" className="text-xl font-bold">
            Dipole fit on {level.level.name}
          </h2>
          <DipolePanel level={level} unit={unit} />
        </section>
      )}

      <ComparePanel
        organisationId={organisationId}
        map={map}
        extraLevels={extraLevels}
        unit={unit}
        withId={compareWith}
        onWith={setCompareWith}
        bearings={bearings}
        onBearings={setBearings}
        levelId={level.level.id}
      />
    </div>
  );
}
