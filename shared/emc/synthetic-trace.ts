/**
 * Invented analyser traces for demo data and tests: a noise floor with seeded normal noise (in dB) and
 * signals drawn through a Gaussian resolution filter whose −3 dB width is the RBW. A Gaussian of full
 * width at half maximum W has power exp(−4·ln2·(Δf/W)²), i.e. −12.04·(Δf/W)² dB off its centre
 * (closed form). Powers of noise and signals add in milliwatts. Invented data only.
 */
import { mulberry32 } from '../random/mulberry32';
import type { Trace } from './trace-csv';

export interface SyntheticSignal {
  readonly frequencyHz: number;
  readonly levelDbm: number;
}

export interface SyntheticTraceInput {
  readonly startHz: number;
  readonly stopHz: number;
  readonly points: number;
  readonly rbwHz: number;
  readonly noiseFloorDbm: number;
  /** Standard deviation of the displayed noise, dB. */
  readonly noiseSigmaDb: number;
  readonly signals: readonly SyntheticSignal[];
  readonly seed: number;
}

const FOUR_LN2 = 4 * Math.LN2;

export function synthesiseTrace(input: SyntheticTraceInput): Trace {
  const random = mulberry32(input.seed);
  // Box–Muller (Box & Muller, Ann. Math. Statist. 29 (1958) 610).
  const normal = () => {
    let u = random();
    while (u === 0) u = random();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
  };
  const frequencyHz = new Float64Array(input.points);
  const levelDbm = new Float64Array(input.points);
  const step = (input.stopHz - input.startHz) / (input.points - 1);
  for (let i = 0; i < input.points; i++) {
    const f = i === input.points - 1 ? input.stopHz : input.startHz + i * step;
    let milliwatts = 10 ** ((input.noiseFloorDbm + input.noiseSigmaDb * normal()) / 10);
    for (const s of input.signals) {
      const x = (f - s.frequencyHz) / input.rbwHz;
      if (Math.abs(x) < 6) milliwatts += 10 ** (s.levelDbm / 10) * Math.exp(-FOUR_LN2 * x * x);
    }
    frequencyHz[i] = f;
    levelDbm[i] = 10 * Math.log10(milliwatts);
  }
  return { frequencyHz, levelDbm };
}
