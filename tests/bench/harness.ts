/**
 * Small timing harness for Fringewalk benchmarks: median of repeated runs, a plain-loop baseline
 * measured in the same process, their ratio, and a printed table. Compare numbers only within one run
 * (STACK.md): the machine is shared and small.
 */

/** Prefix of the line a benchmark file prints with `--rows`, read by tests/bench/run.ts. */
export const BENCH_ROWS_MARKER = 'BENCH_ROWS ';

/** One benchmark row. Times in milliseconds. */
export interface BenchRow {
  /** What was measured, e.g. "lines: 100k stations × 6 species × 5 harmonics vs 50 bands". */
  figure: string;
  /** Goal for `measured`, ms (pass when measured ≤ goal). */
  goal: number;
  /** Median time of the figure, ms. */
  measured: number;
  /** Median time of the plain pass over the same arrays, ms. */
  baseline: number;
  /** measured / baseline. */
  ratio: number;
  pass: boolean;
}

/** A figure to measure: the work, its plain-loop baseline, and the goal. */
export interface BenchCase {
  figure: string;
  goalMs: number;
  run: () => unknown;
  baseline: () => unknown;
  /** Timed repetitions (median taken); default 7. */
  runs?: number;
  /** Untimed warm-up repetitions (JIT); default 2. */
  warmup?: number;
}

/** Results are folded in here so the engine cannot drop the work as dead code. */
let sink = 0;
function consume(value: unknown): void {
  if (typeof value === 'number') sink += value;
  else if (value && typeof value === 'object' && 'length' in value) sink += Number((value as { length: number }).length);
  else sink += value ? 1 : 0;
}

/** Median wall time of `fn` in ms over `runs` runs after `warmup` untimed runs. */
export function medianTimeMs(fn: () => unknown, runs = 7, warmup = 2): number {
  for (let i = 0; i < warmup; i++) consume(fn());
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    consume(fn());
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const mid = times.length >> 1;
  return times.length % 2 ? (times[mid] as number) : ((times[mid - 1] as number) + (times[mid] as number)) / 2;
}

/** Measures each case (figure, then its baseline, in the same process) and returns the rows. */
export function runBenchmarks(cases: readonly BenchCase[]): BenchRow[] {
  return cases.map((c) => {
    const measured = medianTimeMs(c.run, c.runs ?? 7, c.warmup ?? 2);
    const baseline = medianTimeMs(c.baseline, c.runs ?? 7, c.warmup ?? 2);
    return {
      figure: c.figure,
      goal: c.goalMs,
      measured,
      baseline,
      ratio: baseline > 0 ? measured / baseline : Infinity,
      pass: measured <= c.goalMs,
    };
  });
}

/** Prints rows as an aligned table (plus a machine line) and returns the text. */
export function printTable(rows: readonly BenchRow[], title: string): string {
  const head = ['figure', 'goal', 'measured', 'baseline', 'ratio', 'pass'];
  const body = rows.map((r) => [
    r.figure,
    `≤ ${r.goal} ms`,
    `${r.measured.toFixed(1)} ms`,
    `${r.baseline.toFixed(2)} ms`,
    `${r.ratio.toFixed(1)}×`,
    r.pass ? 'pass' : 'short',
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((row) => (row[i] as string).length)));
  const line = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i] as number) : c.padStart(widths[i] as number))).join('  ');
  const text = [
    title,
    line(head),
    widths.map((w) => '-'.repeat(w)).join('  '),
    ...body.map(line),
    `(medians; baseline = the plain counterpart of each figure, measured in the same run — see each benchmark file; sink ${sink === 0 ? 0 : 'ok'})`,
  ].join('\n');
  console.log(text);
  return text;
}

/** Deterministic PRNG for invented benchmark data: same seed, same data. */
export { mulberry32 } from '../../shared/random/mulberry32';
