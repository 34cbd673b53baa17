/**
 * Survey-map results on synthetic dipole fields whose isogauss distances are known in closed form.
 *
 * An ideal point dipole of moment m has |B| = μ₀m/(4πr³)·√(1 + 3cos²θ), θ between the moment and the
 * offset (Jackson, Classical Electrodynamics, 3rd ed., §5.6; Griffiths, Introduction to
 * Electrodynamics, §5.4), so the line |B| = B_t lies at r(θ) = (μ₀m·√(1 + 3cos²θ)/(4πB_t))^(1/3).
 * Both are written out below from those texts, not taken from the code under test. μ₀ is the CODATA
 * 2018 value 1.256 637 062 12 × 10⁻⁶ N/A² (NIST). The stations lie in the plane of the moment (z = 0),
 * the moment along +y, so the 0.5 mT line reaches 2^(1/3) times further along the axis (bearing 0°)
 * than across it (bearing 90°).
 */
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../random/mulberry32';
import { computeDipoleLayers, computeLevelField, rayContourCrossing, type LevelStationInput } from './level-map';
import { physicsZoneSet, summariseRoom, zoneIndexOf } from './zones';

const MU0 = 1.25663706212e-6; // CODATA 2018 (NIST)

/** Closed-form |B| of a dipole m (A·m², along +y) at the origin, at (x, y, 0) (Jackson §5.6). */
function dipoleFieldT(momentAm2: number, x: number, y: number): number {
  const r = Math.hypot(x, y);
  const cosTheta = y / r;
  return ((MU0 * momentAm2) / (4 * Math.PI * r ** 3)) * Math.sqrt(1 + 3 * cosTheta * cosTheta);
}

/** Closed-form distance of the |B| = levelT line along a bearing (degrees clockwise from +y). */
function isogaussRadiusM(momentAm2: number, levelT: number, bearingDeg: number): number {
  const cosTheta = Math.cos((bearingDeg * Math.PI) / 180);
  return Math.cbrt((MU0 * momentAm2 * Math.sqrt(1 + 3 * cosTheta * cosTheta)) / (4 * Math.PI * levelT));
}

/** Jittered stations every `spacingM` over ±halfM, none within 1 m of the magnet. */
function dipoleStations(momentAm2: number, halfM: number, spacingM: number, seed: number): LevelStationInput[] {
  const rand = mulberry32(seed);
  const out: LevelStationInput[] = [];
  for (let x = -halfM; x <= halfM + 1e-9; x += spacingM)
    for (let y = -halfM; y <= halfM + 1e-9; y += spacingM) {
      const px = x + (rand() - 0.5) * 0.2 * spacingM;
      const py = y + (rand() - 0.5) * 0.2 * spacingM;
      if (Math.hypot(px, py) < 1) continue;
      out.push({ id: `st-${out.length}`, xM: px, yM: py, heightM: 0, fieldT: dipoleFieldT(momentAm2, px, py) });
    }
  return out;
}

const MOMENT = 5e5; // A·m², invented: puts the 0.5 mT line 4.6–5.8 m out
const ZONES = physicsZoneSet({
  id: 'test-zones',
  name: 'Test lines',
  edition: 'test edition',
  thresholds: [
    { name: 'Projectile line', fieldT: 3e-3, caution: 'Projectiles.' },
    { name: 'Implant line', fieldT: 0.5e-3, caution: 'Implants.' },
  ],
});

describe('contours of an ideal dipole field', () => {
  const stations = dipoleStations(MOMENT, 12, 0.4, 11);
  const result = computeLevelField(stations, [0.5e-3, 3e-3]);
  if (!result.ok) throw new Error(result.reason);
  const { field } = result;
  const cell = field.grid.cellSizeM;

  it.each([0, 30, 45, 90, 135, 180, 270])('puts the 0.5 mT line at the closed-form distance along bearing %i° (within one grid cell)', (bearing) => {
    const contour = field.contours.find((c) => c.levelT === 0.5e-3)!;
    const crossing = rayContourCrossing(contour, 0, 0, bearing, field.coverage, cell);
    expect(crossing).not.toBeNull();
    expect(crossing!.atSurveyEdge).toBe(false);
    // closed form (Jackson §5.6): about 5.85 m along the axis, 4.64 m across it
    expect(Math.abs(crossing!.distanceM - isogaussRadiusM(MOMENT, 0.5e-3, bearing))).toBeLessThanOrEqual(cell);
  });

  it('puts the 3 mT line at (0.5/3)^(1/3) of the 0.5 mT distance, as the 1/r³ fall-off requires', () => {
    const contour = field.contours.find((c) => c.levelT === 3e-3)!;
    const crossing = rayContourCrossing(contour, 0, 0, 90, field.coverage, cell)!;
    expect(Math.abs(crossing.distanceM - isogaussRadiusM(MOMENT, 0.5e-3, 90) * Math.cbrt(0.5 / 3))).toBeLessThanOrEqual(cell);
  });

  it('gives every ring a label point lying on that ring', () => {
    for (const c of field.contours) {
      expect(c.labelPoints.length).toBeGreaterThan(0);
      const rings = c.polygons.flat();
      for (const p of c.labelPoints) expect(rings.some((ring) => ring.some((q) => q[0] === p[0] && q[1] === p[1]))).toBe(true);
    }
  });

  it('marks a line that only closes along the edge of the surveyed area', () => {
    // 1 µT is below every station's field (the weakest, at the corners, is about 0.03 mT): the line is the hull.
    const low = computeLevelField(stations, [1e-6]);
    if (!low.ok) throw new Error(low.reason);
    const crossing = rayContourCrossing(low.field.contours[0]!, 0, 0, 90, low.field.coverage, low.field.grid.cellSizeM * 1.5);
    expect(crossing?.atSurveyEdge).toBe(true);
  });

  it('says why there is no map for fewer than three stations, or stations on one line', () => {
    expect(computeLevelField(stations.slice(0, 2), [0.5e-3]).ok).toBe(false);
    const line = [0, 1, 2, 3].map((i) => ({ id: `l${i}`, xM: i, yM: 0, heightM: 1, fieldT: 1e-3 }));
    const res = computeLevelField(line, [0.5e-3]);
    expect(res.ok).toBe(false);
    if (!res.ok) expect(res.reason).toMatch(/one line/);
  });

  it('moves the line by the closed-form distance when the moment grows (survey comparison)', () => {
    const stronger = computeLevelField(dipoleStations(2 * MOMENT, 12, 0.4, 12), [0.5e-3]);
    if (!stronger.ok) throw new Error(stronger.reason);
    const before = rayContourCrossing(field.contours[0]!, 0, 0, 90, field.coverage, cell)!;
    const after = rayContourCrossing(stronger.field.contours[0]!, 0, 0, 90, stronger.field.coverage, cell)!;
    // r ∝ m^(1/3): doubling the moment moves the line out by (2^(1/3) − 1)·r₀ ≈ 1.21 m
    const expectedMove = isogaussRadiusM(2 * MOMENT, 0.5e-3, 90) - isogaussRadiusM(MOMENT, 0.5e-3, 90);
    expect(Math.abs(after.distanceM - before.distanceM - expectedMove)).toBeLessThanOrEqual(2 * cell);
  });
});

describe('safety classes on an ideal dipole field', () => {
  it('classes each station as the closed-form distance says (inside the 0.5 mT line ⇔ r ≤ r(θ))', () => {
    const stations = dipoleStations(MOMENT, 8, 0.5, 5);
    let inside = 0;
    for (const s of stations) {
      const r = Math.hypot(s.xM, s.yM);
      const bearing = (Math.atan2(s.xM, s.yM) * 180) / Math.PI;
      const expected = r <= isogaussRadiusM(MOMENT, 3e-3, bearing) ? 1 : r <= isogaussRadiusM(MOMENT, 0.5e-3, bearing) ? 0 : -1;
      expect(zoneIndexOf(s.fieldT, ZONES)).toBe(expected);
      if (expected >= 0) inside++;
    }
    expect(inside).toBeGreaterThan(50);
  });

  it('gives a room the class of its highest field', () => {
    const near = dipoleFieldT(MOMENT, 0, 3); // 3 m along the axis: above 3 mT
    const far = dipoleFieldT(MOMENT, 9, 0); // 9 m across: below 0.5 mT
    expect(summariseRoom([far, near, null], ZONES)).toEqual({ stationCount: 3, minFieldT: far, maxFieldT: near, zoneIndex: 1 });
    expect(summariseRoom([far], ZONES).zoneIndex).toBe(-1);
    expect(summariseRoom([null], ZONES).zoneIndex).toBeNull();
  });

  it('sorts stored thresholds and falls back to IEC 60601-2-33 ed. 4 without a zone set', () => {
    expect(ZONES.thresholds.map((t) => t.thresholdTesla)).toEqual([0.5e-3, 3e-3]);
    expect(physicsZoneSet(null).thresholds[0]!.thresholdTesla).toBe(0.9e-3);
  });
});

describe('dipole-fit layer', () => {
  it('recovers the moment and draws the extrapolated 20 µT line at the closed-form distance', () => {
    const stations = dipoleStations(MOMENT, 8, 1, 7);
    const [fit] = computeDipoleLayers(stations, [{ id: 'magnet', xM: 0, yM: 0, zM: 0 }], [20e-6]);
    if (!fit || !fit.ok) throw new Error(fit?.ok === false ? fit.reason : 'no fit');
    expect(fit.layer.momentMagnitudeAm2).toBeCloseTo(MOMENT, -2);
    expect(fit.layer.rmsLogResidual).toBeLessThan(1e-6);
    expect(fit.layer.residuals.length).toBe(stations.filter((s) => Math.hypot(s.xM, s.yM) >= 1.5).length);
    const ring = fit.layer.contours[0]!.ring;
    // ring[0] is bearing 0° (along the moment), ring[18] bearing 90°; both beyond the ±8 m of stations
    const axial = Math.hypot(...ring[0]!);
    const across = Math.hypot(...ring[18]!);
    expect(axial).toBeGreaterThan(8);
    expect(axial).toBeCloseTo(isogaussRadiusM(MOMENT, 20e-6, 0), 3);
    expect(across).toBeCloseTo(isogaussRadiusM(MOMENT, 20e-6, 90), 3);
  });

  it('shows a poor fit through its residuals: a field falling as 1/r⁴ is no dipole', () => {
    const stations = dipoleStations(MOMENT, 8, 1, 8).map((s) => ({ ...s, fieldT: (s.fieldT as number) / Math.hypot(s.xM, s.yM) }));
    const [fit] = computeDipoleLayers(stations, [{ id: 'magnet', xM: 0, yM: 0, zM: 0 }], [0.5e-3]);
    if (!fit || !fit.ok) throw new Error('no fit');
    expect(fit.layer.rmsLogResidual).toBeGreaterThan(0.1);
  });

  it('refuses a magnet with too few stations, and says so', () => {
    const [fit] = computeDipoleLayers(dipoleStations(MOMENT, 1, 1, 9), [{ id: 'magnet', xM: 0, yM: 0, zM: 0 }], [0.5e-3]);
    expect(fit?.ok).toBe(false);
  });
});
