/**
 * A seeded pseudo-random stream for the demo's measurement noise: the same seed gives the same numbers
 * on every machine and run. Each draw is the first 48 bits of SHA-256("<seed>:<counter>") from
 * node:crypto, scaled to [0, 1) — a counter-mode hash generator, slower than a dedicated PRNG but only a
 * few thousand draws are needed and nothing here is hand-rolled arithmetic. Normal draws use the
 * Box–Muller transform (Box & Muller, Ann. Math. Statist. 29 (1958) 610). Demo data only: not for
 * anything that needs real randomness.
 */
import { createHash } from 'node:crypto';

export interface Prng {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal (mean 0, standard deviation 1). */
  normal(): number;
}

const TWO_POW_48 = 2 ** 48;

export function createPrng(seed: string): Prng {
  let counter = 0;
  const uniform = () => createHash('sha256').update(`${seed}:${counter++}`).digest().readUIntBE(0, 6) / TWO_POW_48;
  return {
    uniform,
    normal() {
      let u = uniform();
      while (u === 0) u = uniform();
      const v = uniform();
      return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
  };
}
