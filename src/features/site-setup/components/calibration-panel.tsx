import { useId, useState } from 'react';
import { CircleMarker, Polyline, Tooltip } from 'react-leaflet';
import { CalibrationError, metresPerPixel, normaliseAngleDeg } from '@shared/plans/calibration';
import type { Plan } from '@shared/schemas/plan';
import { formatLength, isPhysicsInputError, parseLengthM } from '@shared/units';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useSaveCalibration } from '../data/save-calibration';
import { angleFromPointsDeg, pixelToLatLng, type PixelPoint } from '../plan-geometry';
import { SETUP_NEEDS_NETWORK } from './form-errors';
import { PlanMap } from './plan-map';

type PickMode = 'a' | 'b' | 'origin' | 'north-from' | 'north-to' | null;

const PICK_PROMPTS: Record<Exclude<PickMode, null>, string> = {
  a: 'Click the first point of a known distance (e.g. one end of a wall of known length).',
  b: 'Click the second point.',
  origin: 'Click the point that becomes 0 m, 0 m (e.g. a building corner).',
  'north-from': 'Click the tail of the north arrow printed on the plan.',
  'north-to': 'Click its head (the end pointing north).',
};

const IDLE_PROMPT = 'Use the buttons under the plan to pick the two points, the origin or the north arrow.';

/** The one sentence the screen owes users about re-calibration (the server's "keep pixels" policy). */
export const RECALIBRATION_NOTE =
  'Re-calibrating keeps everything already drawn on this plan where it is on the drawing: rooms, magnets, emitters and the stations of open surveys get new metres from the new scale, while stations of submitted or signed-off surveys keep their metres.';

function parseDistance(text: string): { metres: number | null; error: string | null } {
  if (text.trim() === '') return { metres: null, error: null };
  try {
    return { metres: parseLengthM(text), error: null };
  } catch (error) {
    if (isPhysicsInputError(error)) return { metres: null, error: error.message };
    throw error;
  }
}

const dot = (color: string) => ({ color, fillColor: color, fillOpacity: 0.9, weight: 3 });

export function CalibrationPanel({ organisationId, siteId, plan, imageUrl, canEdit }: { organisationId: string; siteId: string; plan: Plan; imageUrl: string; canEdit: boolean }) {
  const saved = plan.calibration;
  const save = useSaveCalibration(organisationId, siteId, plan.id);
  const angleId = useId();
  const [mode, setMode] = useState<PickMode>(null);
  const [pointA, setPointA] = useState<PixelPoint | null>(null);
  const [pointB, setPointB] = useState<PixelPoint | null>(null);
  const [origin, setOrigin] = useState<PixelPoint | null>(saved ? { xPx: saved.originXPx, yPx: saved.originYPx } : null);
  const [northFrom, setNorthFrom] = useState<PixelPoint | null>(null);
  const [distanceText, setDistanceText] = useState('');
  const [northText, setNorthText] = useState(saved ? String(saved.northAngleDeg) : '0');
  const [submitted, setSubmitted] = useState(false);
  const [resultNote, setResultNote] = useState<string | null>(null);

  const distance = parseDistance(distanceText);
  let scale: number | null = null;
  let scaleError: string | null = null;
  if (pointA && pointB && distance.metres !== null) {
    try {
      scale = metresPerPixel(pointA, pointB, distance.metres);
    } catch (error) {
      if (!(error instanceof CalibrationError)) throw error;
      scaleError = error.message;
    }
  }
  const northNumber = Number(northText);
  const northError = northText.trim() === '' || !Number.isFinite(northNumber) ? 'Give the angle in degrees, clockwise from the top of the image.' : null;
  const northDeg = northError ? 0 : normaliseAngleDeg(northNumber);

  const onPlanClick = (point: PixelPoint) => {
    if (mode === 'a') {
      setPointA(point);
      setMode('b');
    } else if (mode === 'b') {
      setPointB(point);
      setMode(null);
    } else if (mode === 'origin') {
      setOrigin(point);
      setMode(null);
    } else if (mode === 'north-from') {
      setNorthFrom(point);
      setMode('north-to');
    } else if (mode === 'north-to' && northFrom) {
      const angle = angleFromPointsDeg(northFrom, point);
      if (angle !== null) setNorthText(angle.toFixed(1));
      setNorthFrom(null);
      setMode(null);
    }
  };

  const missing = [
    !pointA || !pointB ? 'click two points' : null,
    distance.metres === null ? 'type the distance between them' : null,
    !origin ? 'set the origin' : null,
  ].filter(Boolean);

  const onSave = () => {
    setSubmitted(true);
    if (!pointA || !pointB || !origin || scale === null || northError || distance.metres === null) return;
    save.mutate(
      { pointA, pointB, distanceM: distance.metres, origin, northAngleDeg: northDeg },
      {
        onSuccess: (result) => {
          setResultNote(result.reprojection.note);
          showToast({ tone: 'ok', message: 'Calibration saved.' });
        },
        onError: (error) =>
          showToast({ tone: 'danger', message: isApiRequestError(error) && error.isNetworkError ? SETUP_NEEDS_NETWORK : (error as Error).message }),
      },
    );
  };

  const shownScale = scale ?? saved?.metresPerPixel ?? null;
  const arrowStart = origin ?? { xPx: plan.widthPx / 2, yPx: plan.heightPx / 2 };
  const arrowLength = Math.min(plan.widthPx, plan.heightPx) / 6;
  const rad = (northDeg * Math.PI) / 180;
  const arrowEnd = { xPx: arrowStart.xPx + arrowLength * Math.sin(rad), yPx: arrowStart.yPx - arrowLength * Math.cos(rad) };

  return (
    <div className="flex flex-col gap-4">
      <p>{RECALIBRATION_NOTE}</p>
      <PlanMap
        imageUrl={imageUrl}
        widthPx={plan.widthPx}
        heightPx={plan.heightPx}
        label="Plan for calibration"
        onPlanClick={canEdit ? onPlanClick : undefined}
        picking={mode !== null}
        prompt={canEdit ? (mode ? <><span className="font-bold">Click on the plan: </span>{PICK_PROMPTS[mode]}</> : IDLE_PROMPT) : undefined}
        metresPerPixel={shownScale}
      >
        {pointA && pointB && <Polyline positions={[pixelToLatLng(pointA), pixelToLatLng(pointB)]} pathOptions={{ color: '#a15726', weight: 3, dashArray: '6 4' }} />}
        {pointA && (
          <CircleMarker center={pixelToLatLng(pointA)} radius={8} pathOptions={dot('#a15726')}>
            <Tooltip permanent direction="top">A</Tooltip>
          </CircleMarker>
        )}
        {pointB && (
          <CircleMarker center={pixelToLatLng(pointB)} radius={8} pathOptions={dot('#a15726')}>
            <Tooltip permanent direction="top">B</Tooltip>
          </CircleMarker>
        )}
        {origin && (
          <CircleMarker center={pixelToLatLng(origin)} radius={9} pathOptions={dot('#145955')}>
            <Tooltip permanent direction="right">0, 0</Tooltip>
          </CircleMarker>
        )}
        <Polyline positions={[pixelToLatLng(arrowStart), pixelToLatLng(arrowEnd)]} pathOptions={{ color: '#145955', weight: 4 }} />
        {/* Keyed by where the head is: Leaflet places a permanent tooltip once, and would leave the
            "N" behind when the origin or the angle moves the arrow. */}
        <CircleMarker key={`${arrowEnd.xPx},${arrowEnd.yPx}`} center={pixelToLatLng(arrowEnd)} radius={4} pathOptions={dot('#145955')}>
          <Tooltip permanent direction="top">N</Tooltip>
        </CircleMarker>
      </PlanMap>
      {canEdit && (
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
          <div className="flex flex-col gap-2">
            <p className="font-bold">1. Known distance</p>
            <Button variant="secondary" onClick={() => setMode('a')} aria-pressed={mode === 'a' || mode === 'b'}>
              {pointA && pointB ? 'Pick the two points again' : 'Pick two points on the plan'}
            </Button>
            <Field
              label="Distance between the two points"
              hint="With its unit: 12.5 m, 850 cm, 4200 mm"
              value={distanceText}
              onChange={(event) => setDistanceText(event.target.value)}
              error={distance.error ?? scaleError ?? (submitted && distance.metres === null ? 'Type the distance with its unit.' : undefined)}
              autoComplete="off"
            />
          </div>
          <div className="flex flex-col gap-2">
            <p className="font-bold">2. Origin and north</p>
            <Button variant="secondary" onClick={() => setMode('origin')} aria-pressed={mode === 'origin'}>
              {origin ? 'Move the origin' : 'Set the origin on the plan'}
            </Button>
            <Field
              id={angleId}
              label="North, degrees clockwise from the top of the image"
              type="number"
              step="any"
              inputMode="decimal"
              value={northText}
              onChange={(event) => setNorthText(event.target.value)}
              error={northError ?? undefined}
            />
            <Button variant="secondary" onClick={() => setMode('north-from')} aria-pressed={mode === 'north-from' || mode === 'north-to'}>
              Take north from two clicks
            </Button>
          </div>
        </div>
      )}
      <div className="rounded-xl border border-border bg-surface p-4" role="status" data-testid="calibration-summary">
        {scale !== null ? (
          <p>
            New scale: <span className="font-bold" data-testid="metres-per-pixel">{formatLength(scale, { significantDigits: 4 })}</span> per pixel (
            {(1 / scale).toPrecision(4)} pixels per metre). North at {northDeg.toFixed(1)}°.
          </p>
        ) : saved ? (
          <p>
            Saved scale: <span className="font-bold">{formatLength(saved.metresPerPixel, { significantDigits: 4 })}</span> per pixel, north at{' '}
            {saved.northAngleDeg.toFixed(1)}°.
          </p>
        ) : (
          <p>Not calibrated yet{canEdit && missing.length > 0 ? `: ${missing.join(', ')}.` : '.'}</p>
        )}
        {resultNote && <p className="mt-1 text-sm text-fg-muted">{resultNote}</p>}
      </div>
      {canEdit && (
        <div>
          <Button onClick={onSave} busy={save.isPending} busyLabel="Saving…" disabled={scale === null || !origin}>
            Save calibration
          </Button>
        </div>
      )}
    </div>
  );
}
