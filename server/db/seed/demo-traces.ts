/**
 * Demo trace files for two of the 2026 survey's sweeps (the etch laboratory and the ground-floor
 * corridor), made from the same model as their peak markers: an invented analyser noise floor
 * (displayed noise at the sweep's RBW from an invented DANL of −160 dBm/Hz, shared/physics/analyser.ts)
 * with seeded noise, and each marked peak drawn through a Gaussian RBW filter
 * (shared/emc/synthetic-trace.ts). The same sweep row always gives the same file, byte for byte, so
 * its SHA-256 — and the object key derived from it — never change between runs. EVERYTHING IS INVENTED.
 *
 * The database side (the sweep names the file's hash and key; the attachments row says it arrived) is
 * written with the rest of the seed; {@link seedDemoTraceFiles} puts the bytes into the object store
 * (idempotent, like the plan images).
 */
import { createHash } from 'node:crypto';
import { and, eq, inArray } from 'drizzle-orm';
import { synthesiseTrace } from '../../../shared/emc/synthetic-trace';
import { traceToCsv } from '../../../shared/emc/trace-csv';
import { displayedNoiseFloorDbm } from '../../../shared/physics/analyser';
import { attachmentObjectKey } from '../../../shared/sync/attachment-key';
import type { Storage } from '../../lib/storage';
import type { Db } from '../client';
import { attachments, sweeps, type PeakMarker } from '../schema';

/** Invented DANL of the demo analyser, dBm/Hz. */
const DEMO_DANL_DBM_PER_HZ = -160;
/** Invented spread of the displayed noise, dB. */
const DEMO_NOISE_SIGMA_DB = 1.5;
export const DEMO_TRACE_CONTENT_TYPE = 'text/csv';

/** Which demo sweeps carry a trace, with the number of points and the noise seed of each. */
export const DEMO_TRACES: Record<string, { points: number; seed: number }> = {
  etch: { points: 3001, seed: 2026_11_17_1 },
  corridor: { points: 5801, seed: 2026_11_17_3 },
};

export interface DemoTraceSweep {
  startHz: number;
  stopHz: number;
  rbwHz: number;
  peaks: readonly PeakMarker[];
}

/** The trace file of a demo sweep (CSV, MHz header) with its SHA-256. */
export function demoTraceFile(sweep: DemoTraceSweep, spec: { points: number; seed: number }): { csv: string; bytes: Buffer; sha256: string } {
  const trace = synthesiseTrace({
    startHz: sweep.startHz,
    stopHz: sweep.stopHz,
    points: spec.points,
    rbwHz: sweep.rbwHz,
    noiseFloorDbm: displayedNoiseFloorDbm(DEMO_DANL_DBM_PER_HZ, sweep.rbwHz),
    noiseSigmaDb: DEMO_NOISE_SIGMA_DB,
    signals: sweep.peaks,
    seed: spec.seed,
  });
  const csv = traceToCsv(trace, 'MHz');
  const bytes = Buffer.from(csv, 'utf8');
  return { csv, bytes, sha256: createHash('sha256').update(bytes).digest('hex') };
}

/** The columns a demo sweep gets for its trace, and the attachments row that says the file arrived. */
export function demoTraceRows(organisationId: string, sweepId: string, sweep: DemoTraceSweep, spec: { points: number; seed: number }, uploadedAt: Date, uploadedByUserId: string) {
  const file = demoTraceFile(sweep, spec);
  const objectKey = attachmentObjectKey(organisationId, 'trace', sweepId, file.sha256);
  return {
    sweepColumns: { traceObjectKey: objectKey, traceSha256: file.sha256 },
    attachment: {
      organisationId,
      objectKey,
      entity: 'sweeps',
      recordId: sweepId,
      kind: 'trace' as const,
      sha256: file.sha256,
      contentType: DEMO_TRACE_CONTENT_TYPE,
      bytes: file.bytes.length,
      uploadedByUserId,
      uploadedAt,
    },
  };
}

/**
 * Puts the demo traces into the object store when missing: each is made again from its sweep row and
 * must match the hash the row names (else it is skipped: the sweep was changed since the seed).
 * Returns the keys it uploaded.
 */
export async function seedDemoTraceFiles(db: Db, storage: Storage, sweepIds: Record<string, string>): Promise<string[]> {
  const byId = new Map(Object.entries(sweepIds).map(([key, id]) => [id, key]));
  if (byId.size === 0) return [];
  const rows = await db
    .select({ id: sweeps.id, startHz: sweeps.startHz, stopHz: sweeps.stopHz, rbwHz: sweeps.rbwHz, peaks: sweeps.peaks, objectKey: attachments.objectKey, sha256: attachments.sha256 })
    .from(sweeps)
    .innerJoin(attachments, and(eq(attachments.organisationId, sweeps.organisationId), eq(attachments.objectKey, sweeps.traceObjectKey)))
    .where(inArray(sweeps.id, [...byId.keys()]));
  const uploaded: string[] = [];
  for (const row of rows) {
    const spec = DEMO_TRACES[byId.get(row.id) ?? ''];
    if (!spec || (await storage.headObject(row.objectKey))) continue;
    const file = demoTraceFile(row, spec);
    if (file.sha256 !== row.sha256) continue;
    await storage.putObject(row.objectKey, file.bytes, DEMO_TRACE_CONTENT_TYPE);
    uploaded.push(row.objectKey);
  }
  return uploaded;
}
