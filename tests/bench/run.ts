/**
 * `npm run bench`: runs every tests/bench/*.bench.ts in its own process (so one file's garbage does not
 * slow the next), then prints one table of every figure: goal, measured value, ratio to its in-run
 * baseline, pass or short. `--strict` exits non-zero when any goal is missed.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { BENCH_ROWS_MARKER, printTable, type BenchRow } from './harness';

const here = path.dirname(fileURLToPath(import.meta.url));
const files = fs.readdirSync(here).filter((f) => f.endsWith('.bench.ts')).sort();
const tsx = path.resolve(here, '../../node_modules/tsx/dist/cli.mjs');
const all: BenchRow[] = [];
let broken = 0;

for (const file of files) {
  console.log(`\n▶ ${file}`);
  const run = spawnSync(process.execPath, [tsx, path.join(here, file), '--rows'], { encoding: 'utf8', maxBuffer: 64 << 20 });
  const lines = run.stdout.split('\n');
  for (const line of lines) if (!line.startsWith(BENCH_ROWS_MARKER)) console.log(line);
  const rowsLine = lines.find((l) => l.startsWith(BENCH_ROWS_MARKER));
  if (run.status !== 0 || !rowsLine) {
    broken += 1;
    console.error(`${file} failed (exit ${run.status}):\n${run.stderr}`);
    continue;
  }
  for (const row of JSON.parse(rowsLine.slice(BENCH_ROWS_MARKER.length)) as BenchRow[]) all.push({ ...row, figure: `${file.replace('.bench.ts', '')}: ${row.figure}` });
}

console.log('');
printTable(all, `Fringewalk benchmarks — node ${process.version}, ${os.cpus().length} cores`);
const short = all.filter((r) => !r.pass).length;
console.log(`${all.length - short} figures met their goal, ${short} short${broken ? `, ${broken} benchmark files failed` : ''}`);
if (broken || (process.argv.includes('--strict') && short)) process.exit(1);
