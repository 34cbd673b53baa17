/**
 * `npm test`: every Vitest project (unit, server, client, e2e) in one run, then one plain closing line
 * "N passed, N failed" that CI reads. Exits non-zero on any failure or when no test ran.
 * Extra arguments go to Vitest (e.g. `npm test -- --project unit`).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

const reportDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-vitest-'));
const reportFile = path.join(reportDir, 'report.json');
const vitest = path.resolve('node_modules', 'vitest', 'vitest.mjs');

const run = spawnSync(
  process.execPath,
  [vitest, 'run', '--allowOnly=false', '--reporter=default', '--reporter=json', `--outputFile.json=${reportFile}`, ...process.argv.slice(2)],
  { stdio: 'inherit', env: { ...process.env, FORCE_COLOR: process.env.FORCE_COLOR ?? '1' } },
);

interface JsonReport {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests: number;
  numFailedTestSuites: number;
}

let report: JsonReport | null = null;
try {
  report = JSON.parse(fs.readFileSync(reportFile, 'utf8')) as JsonReport;
} catch {
  report = null;
}
fs.rmSync(reportDir, { recursive: true, force: true });

if (!report) {
  console.log('0 passed, 1 failed');
  console.error('Vitest wrote no report: see its output above.');
  process.exit(run.status || 1);
}

const failed = report.numFailedTests + (report.numFailedTestSuites > 0 && report.numFailedTests === 0 ? report.numFailedTestSuites : 0);
const skipped = report.numPendingTests + report.numTodoTests;
console.log(`${report.numPassedTests} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
if (failed > 0 || run.status !== 0 || report.numPassedTests === 0) process.exit(run.status || 1);
