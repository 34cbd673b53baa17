/**
 * Fringewalk physics benchmark (`npm run bench:physics`). Invented but physically plausible data: the
 * fringe field of an invented magnet (a horizontal dipole of 1.8e6 A·m², roughly a 1.5 T unshielded
 * scanner) plus the Earth's field, at stations scattered over a 60 m × 40 m floor, from a seeded PRNG.
 *
 * Figures and goals (issue 3): lines for 100,000 stations × 6 species × 5 harmonics against 50 watch
 * bands ≤ 100 ms; interpolation of 10,000 stations onto 512 × 512 plus contours at 5 levels ≤ 250 ms;
 * a dipole fit on 1,000 stations ≤ 50 ms. Each is printed beside a plain pass over the same arrays.
 * Pass `--strict` to exit non-zero when a goal is missed.
 */
import os from 'node:os';
import {
  cyclotronHzPerTesla,
  dipoleFieldMagnitudeTesla,
  findStationBandHits,
  fitDipole,
  gridForStations,
  interpolateLogFieldGrid,
  isogaussContours,
  type DipoleModel,
  type LineSpeciesInput,
  type WatchBand,
} from '../../shared/physics/index';
import { BENCH_ROWS_MARKER, mulberry32, printTable, runBenchmarks, type BenchCase } from './harness';

const MAGNET: DipoleModel = { sourceM: [0, 0, 1.2], momentAm2: [1.8e6, 0, 0] };
const EARTH_T = [19e-6, 0.4e-6, 45e-6] as const; // north, east, down: a mid-latitude site (invented)
const K = 1e-7; // μ₀/4π to the digits that matter for invented data

/**
 * Stations on the floor around the magnet, ≥ 2.5 m from it; |B_dipole + B_earth| with ±1 % noise.
 * For the fit: stations 3–15 m out with the background already subtracted (where the dipole dominates).
 */
function makeStations(count: number, seed: number, fit = false) {
  const rand = mulberry32(seed);
  const xM = new Float64Array(count);
  const yM = new Float64Array(count);
  const zM = new Float64Array(count);
  const fieldsTesla = new Float64Array(count);
  const [mx, my, mz] = MAGNET.momentAm2;
  for (let i = 0; i < count; i++) {
    let x: number;
    let y: number;
    do {
      x = (rand() * 2 - 1) * 30;
      y = (rand() * 2 - 1) * 20;
    } while (fit ? Math.hypot(x, y) < 3 || Math.hypot(x, y) > 15 : Math.hypot(x, y) < 2.5);
    const z = 0.3 + rand() * 1.5;
    const dx = x - MAGNET.sourceM[0];
    const dy = y - MAGNET.sourceM[1];
    const dz = z - MAGNET.sourceM[2];
    const r = Math.hypot(dx, dy, dz);
    const mDotR = (mx * dx + my * dy + mz * dz) / r;
    const s = K / r ** 3;
    const earth = fit ? 0 : 1;
    const bx = s * ((3 * mDotR * dx) / r - mx) + earth * EARTH_T[0];
    const by = s * ((3 * mDotR * dy) / r - my) + earth * EARTH_T[1];
    const bz = s * ((3 * mDotR * dz) / r - mz) + earth * EARTH_T[2];
    xM[i] = x;
    yM[i] = y;
    zM[i] = z;
    fieldsTesla[i] = Math.hypot(bx, by, bz) * (1 + 0.01 * (rand() * 2 - 1));
  }
  return { xM, yM, zM, fieldsTesla };
}

/** 50 watch bands: the ITU/GNSS/ISM/aviation/medical bands of REFERENCES.md, padded with invented ones. */
function makeWatchBands(): WatchBand[] {
  const mhz: Array<[string, number, number]> = [
    ['RA 1400–1427 (RR 5.340)', 1400, 1427],
    ['RA 2690–2700', 2690, 2700],
    ['RA 10.68–10.7 GHz', 10680, 10700],
    ['RA 15.35–15.4 GHz', 15350, 15400],
    ['RA 23.6–24 GHz', 23600, 24000],
    ['RA 31.3–31.5 GHz', 31300, 31500],
    ['RA 1330–1400 (RR 5.149)', 1330, 1400],
    ['RA 1610.6–1613.8', 1610.6, 1613.8],
    ['RA 1660–1670', 1660, 1670],
    ['RA 1718.8–1722.2', 1718.8, 1722.2],
    ['RA 4990–5000', 4990, 5000],
    ['RA 10.6–10.68 GHz', 10600, 10680],
    ['RA 22.21–22.5 GHz', 22210, 22500],
    ['ISM 13.56', 13.553, 13.567],
    ['ISM 27.12', 26.957, 27.283],
    ['ISM 40.68', 40.66, 40.7],
    ['ISM 915 (Region 2)', 902, 928],
    ['ISM 2450', 2400, 2500],
    ['ISM 5800', 5725, 5875],
    ['ISM 24.125 GHz', 24000, 24250],
    ['GPS L1', 1574.397, 1576.443],
    ['GPS L2', 1226.577, 1228.623],
    ['GPS L5', 1166.22, 1186.68],
    ['Galileo E5b', 1196.91, 1217.37],
    ['Galileo E6', 1268.52, 1288.98],
    ['GLONASS L1', 1598.0625, 1605.375],
    ['Aviation radionavigation', 108, 117.975],
    ['Aviation VHF comms', 117.975, 137],
    ['MICS', 402, 405],
    ['WMTS 608–614', 608, 614],
    ['WMTS 1395–1400', 1395, 1400],
    ['WMTS 1427–1432', 1427, 1432],
  ];
  const bands: WatchBand[] = mhz.map(([name, lo, hi], i) => ({ id: `w${i}`, name, lowHz: lo * 1e6, highHz: hi * 1e6 }));
  const rand = mulberry32(50);
  while (bands.length < 50) {
    const centre = 10 ** (6 + rand() * 4); // 1 MHz .. 10 GHz, invented site bands
    const width = centre * (0.001 + 0.01 * rand());
    bands.push({ id: `w${bands.length}`, name: 'invented site band', lowHz: centre - width / 2, highHz: centre + width / 2 });
  }
  return bands;
}

const SPECIES: LineSpeciesInput[] = [
  { species: 'electron', kineticEnergyJ: 2 * 1.602176634e-19 }, // a lamp's few-eV electrons
  'proton',
  'deuteron',
  'alpha',
  'helion',
  'h2-plus',
];
const HARMONICS = 5;
const UNCERTAINTY = 0.03;

const lineStations = makeStations(100_000, 1);
const watchBands = makeWatchBands();
const gridStations = makeStations(10_000, 2);
const gridSpec = gridForStations(gridStations.xM, gridStations.yM, 512, 512);
const fitStations = makeStations(1_000, 3, true);
const LEVELS_T = [0.1e-3, 0.5e-3, 0.9e-3, 3e-3, 10e-3];

const hzPerTesla = Float64Array.from(
  SPECIES.map((s) => (typeof s === 'object' && 'species' in s ? cyclotronHzPerTesla(s.species, s.kineticEnergyJ ?? 0) : cyclotronHzPerTesla(s))),
);

const cases: BenchCase[] = [
  {
    figure: 'lines: 100k stations × 6 species × 5 harmonics vs 50 bands',
    goalMs: 100,
    run: () =>
      findStationBandHits({
        fieldsTesla: lineStations.fieldsTesla,
        relativeUncertainty: UNCERTAINTY,
        species: SPECIES,
        harmonicCount: HARMONICS,
        watchBands,
      }).count,
    // plain pass: every line's two edges computed and summed, no band search
    baseline: () => {
      const b = lineStations.fieldsTesla;
      let sum = 0;
      for (let i = 0; i < b.length; i++) {
        const field = b[i] as number;
        for (let s = 0; s < hzPerTesla.length; s++) {
          const f = (hzPerTesla[s] as number) * field;
          for (let n = 1; n <= HARMONICS; n++) sum += n * f * (1 - UNCERTAINTY) + n * f * (1 + UNCERTAINTY);
        }
      }
      return sum;
    },
  },
  {
    figure: 'map: 10k stations → 512² log|B| grid + 5 isogauss levels',
    goalMs: 250,
    run: () => {
      const grid = interpolateLogFieldGrid(gridStations, gridSpec);
      return isogaussContours(grid, LEVELS_T).length + grid.coveredCount;
    },
    // plain pass: read every station once and write every grid cell once
    baseline: () => {
      const out = new Float64Array(gridSpec.width * gridSpec.height);
      let mean = 0;
      for (let i = 0; i < gridStations.fieldsTesla.length; i++) mean += Math.log10(gridStations.fieldsTesla[i] as number);
      mean /= gridStations.fieldsTesla.length;
      for (let k = 0; k < out.length; k++) out[k] = mean;
      return out.length;
    },
  },
  {
    figure: 'dipole fit: 1,000 stations (moment + position, 3 starts)',
    goalMs: 50,
    run: () => fitDipole(fitStations).rmsLogResidual,
    // plain pass: the model evaluated once at every station
    baseline: () => {
      let sum = 0;
      for (let i = 0; i < fitStations.fieldsTesla.length; i++) {
        sum += dipoleFieldMagnitudeTesla(MAGNET, [fitStations.xM[i] as number, fitStations.yM[i] as number, fitStations.zM[i] as number]);
      }
      return sum;
    },
  },
];

const hits = findStationBandHits({ fieldsTesla: lineStations.fieldsTesla, relativeUncertainty: UNCERTAINTY, species: SPECIES, harmonicCount: HARMONICS, watchBands });
const fit = fitDipole(fitStations);
const rows = runBenchmarks(cases);
printTable(rows, `Fringewalk physics benchmark — node ${process.version}, ${os.cpus().length} cores, ${os.cpus()[0]?.model ?? 'unknown cpu'}`);
console.log(
  `(lines examined ${hits.linesExamined.toLocaleString('en')}, hits ${hits.count.toLocaleString('en')}; ` +
    `fit |m| ${Math.hypot(...fit.model.momentAm2).toExponential(3)} A·m² vs invented 1.800e6, source ` +
    `(${fit.model.sourceM.map((v) => v.toFixed(2)).join(', ')}) m vs (0, 0, 1.2), rms log residual ${fit.rmsLogResidual.toFixed(4)}, ` +
    `${fit.iterations} LM iterations)`,
);
if (process.argv.includes('--rows')) console.log(`${BENCH_ROWS_MARKER}${JSON.stringify(rows)}`);
if (process.argv.includes('--strict') && rows.some((r) => !r.pass)) process.exit(1);
